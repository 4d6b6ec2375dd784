// The walker's state: resolved options, body, path, schedule, per-side parameters and reusable scratch buffers.
import { type SegmentLengths, restRootHeight, segmentLengths } from './anthropometry.js';
import type { SynthOptions } from './options.js';
import { type DistanceTable, type WalkPath, buildPath, distanceAt, distanceTable } from './path.js';
import { type Schedule, buildSchedule } from './schedule.js';
import { type SideParams, sideParams } from './sides.js';

/** Everything the per-frame functions read, plus scratch space they write (one model per synthesis). */
export interface WalkerModel {
  o: SynthOptions;
  seg: SegmentLengths;
  sides: [SideParams, SideParams];
  path: WalkPath;
  dist: DistanceTable;
  sc: Schedule;
  rootHeight: number;
  legLength: number;
  /** Rest vectors of the foot, metres, foot frame: ankle→heel, ankle→toe joint, toe joint→tip. */
  heelVec: Float64Array;
  mtpVec: Float64Array;
  tipVec: Float64Array;
  /** Hip joint offsets from the root (left, right), 2 x 3. */
  hipOffset: Float64Array;
  /** Blend corrections (actual stance angles minus nominal) at each stride's toe-off and contact: [side*count+k]*8. */
  deltaTo: Float64Array;
  deltaIc: Float64Array;
  /** Rate mismatch (actual minus nominal, radians/s) at each stride's toe-off, same layout. */
  deltaToRate: Float64Array;
  /** General scratch. */
  scratch: Float64Array;
}

/** Returns the walker model for resolved options covering times [0, duration]. */
export function buildModel(o: SynthOptions): WalkerModel {
  const seg = segmentLengths(o.height);
  const sides = sideParams(o);
  const legLength = seg.thigh + seg.shank + seg.ankleHeight;
  const T0 = 120 / o.cadence;
  const tFrom = -3 * T0, tTo = o.duration + 3 * T0;
  const dist = distanceTable(o.path, o.speed, legLength, tFrom - 3 * T0, tTo + 3 * T0);
  const sFrom = distanceAt(dist, tFrom - 3 * T0) - 5, sTo = distanceAt(dist, tTo + 3 * T0) + 5;
  const path = buildPath(o.path, sFrom, sTo, (o.initialHeadingDeg * Math.PI) / 180);
  const sc = buildSchedule(o, sides, path, dist, tFrom, tTo);
  const n = 2 * sc.count * 8;
  return {
    o, seg, sides, path, dist, sc,
    rootHeight: restRootHeight(seg),
    legLength,
    heelVec: new Float64Array([0, -seg.ankleHeight, -seg.heelBehindAnkle]),
    mtpVec: new Float64Array([0, -seg.ankleHeight, seg.ankleToToeJoint]),
    tipVec: new Float64Array([0, 0, seg.toe]),
    hipOffset: new Float64Array([seg.hipHalfWidth, -seg.hipBelowRoot, 0, -seg.hipHalfWidth, -seg.hipBelowRoot, 0]),
    deltaTo: new Float64Array(n).fill(NaN),
    deltaIc: new Float64Array(n).fill(NaN),
    deltaToRate: new Float64Array(n).fill(NaN),
    scratch: new Float64Array(256),
  };
}
