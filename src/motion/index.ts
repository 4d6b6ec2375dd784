// Public face of the motion layer: tracks, windows, mirror augmentation and normalisation for the
// coupling model.
export { MOTION_NODES, NODE_COUNT, NODE_MIRROR, DEFAULT_PAIRS, allPairs, pairIndex, nodeIndex, mirrorMapOf, nodeSources, type MotionNode, type PairSet, type NodeSources } from './roles.js';
export { resamplePlan, resampleLinear, resampledLength, lastSourceFrame, blendInto, type ResamplePlan } from './resample.js';
export { trackFromImported, restLegLength, DEFAULT_MODEL_RATE, type Track, type TrackOptions } from './track.js';
export { STATE_SIZE } from './reflect.js';
export { frameAt, frameNodes, frameToWorld, worldToFrame, identityFrame, type WindowFrame, type HeadingSource, type FrameNodes } from './frame.js';
export {
  makeWindow, fillWindow, allocateWindow, windowsOf, windowEnds, firstWindowEnd, resolveWindowOptions,
  type Window, type WindowOptions, type ResolvedWindowOptions, type WindowsOfOptions,
} from './window.js';
export { mirrorWindow, mirrorState, mirrorPairValues } from './mirror.js';
export {
  createAccumulator, accumulate, finishStats, statsOfWindows, normalise, denormalise, statsToJson, statsFromJson,
  STATS_FORMAT, STATS_VERSION, type MotionStats, type MotionStatsJson, type StatsAccumulator, type StatsOptions,
} from './normalise.js';
