// Public face of the parametric walker: synthesize a take and its ground truth.
export { synthesizeTake, CONTACT_TOLERANCE_M, type SynthResult } from './synthesize.js';
export {
  defaultSynthOptions, resolveSynthOptions, stanceFromSpeed,
  type SynthOptions, type SideImpairment, type PathSpec, type StumbleSpec, type Side,
} from './options.js';
export type { SynthTruth, TruthSideEvents, TruthStumble } from './truth.js';
export { JOINT_KEYS, NAMING_STYLES, jointName, jointNames, type JointKey, type NamingStyle } from './naming.js';
export { UNIT_METRES, type LengthUnit, type UpAxis } from './skeleton.js';
export { segmentLengths, type SegmentLengths } from './anthropometry.js';
export { synthOptionsFromFlags, parseImpairment, SYNTH_FLAGS } from './flags.js';
