// Local rotations and root positions (internal frame, metres) to BVH channel values in the take's units,
// up axis and per-joint Euler orders, with each channel kept continuous from frame to frame.
import { JOINT_KEYS } from './naming.js';
import { matrixToEuler, mul3o } from './rot3.js';
import { type BuiltSkeleton, UNIT_METRES, type LengthUnit, type UpAxis, axisMap } from './skeleton.js';

const RAD = 180 / Math.PI;

/** Reusable state of the encoder: axis map, scale and the previous frame's angles. */
export interface Encoder {
  skel: BuiltSkeleton;
  M: Float64Array;
  scale: number;
  prev: Float64Array;
  hasPrev: boolean;
  tmp: Float64Array;
  cand: Float64Array;
}

/** Returns an encoder for a built skeleton. */
export function makeEncoder(skel: BuiltSkeleton, units: LengthUnit, up: UpAxis): Encoder {
  return {
    skel,
    M: axisMap(up),
    scale: 1 / UNIT_METRES[units],
    prev: new Float64Array(JOINT_KEYS.length * 3),
    hasPrev: false,
    tmp: new Float64Array(18),
    cand: new Float64Array(6),
  };
}

/** Writes one frame's channel values (degrees, file units) into `values` at `base` from locals and root. */
export function encodeFrame(enc: Encoder, locals: Float64Array, root: Float64Array, values: Float64Array, base: number): void {
  const { skel, M, tmp, cand, prev } = enc;
  const rp = skel.rootPositionChannel;
  for (let a = 0; a < 3; a++) values[base + rp + a] = (M[a * 3]! * root[0]! + M[a * 3 + 1]! * root[1]! + M[a * 3 + 2]! * root[2]!) * enc.scale;
  const K = JOINT_KEYS.length;
  for (let k = 0; k < K; k++) {
    // The axis map is its own inverse (identity, or the Z-up map), so the output rotation is M · L · M.
    mul3o(M, 0, locals, k * 9, tmp, 0);
    mul3o(tmp, 0, M, 0, tmp, 9);
    const i = skel.rotationAxes[k * 3]!, j = skel.rotationAxes[k * 3 + 1]!, l = skel.rotationAxes[k * 3 + 2]!;
    matrixToEuler(tmp, 9, i, j, l, cand, 0);
    // The other solution of the same rotation: (a + π, π − b, c + π).
    cand[3] = cand[0]! + Math.PI; cand[4] = Math.PI - cand[1]!; cand[5] = cand[2]! + Math.PI;
    let pick = 0;
    if (enc.hasPrev) {
      let d0 = 0, d1 = 0;
      for (let a = 0; a < 3; a++) {
        const p = prev[k * 3 + a]!;
        cand[a] = nearest(cand[a]!, p);
        cand[3 + a] = nearest(cand[3 + a]!, p);
        d0 += Math.abs(cand[a]! - p);
        d1 += Math.abs(cand[3 + a]! - p);
      }
      if (d1 < d0 - 1e-9) pick = 3;
    }
    const c = skel.rotationChannel[k]!;
    for (let a = 0; a < 3; a++) {
      const v = cand[pick + a]!;
      prev[k * 3 + a] = v;
      values[base + c + a] = v * RAD;
    }
  }
  enc.hasPrev = true;
  // Position channels of non-root joints carry their offsets.
  for (const joint of skel.joints) {
    if (joint.parent < 0 || joint.endSite || joint.channels[0] !== 'Xposition') continue;
    for (let a = 0; a < 3; a++) values[base + joint.channelStart + a] = joint.offset[a]!;
  }
}

/** Returns angle `a` shifted by whole turns to lie nearest to `ref` (radians). */
function nearest(a: number, ref: number): number {
  return a + 2 * Math.PI * Math.round((ref - a) / (2 * Math.PI));
}

/** Rounds every value in place to `decimals` fixed decimals exactly as the writer prints them (no -0). */
export function roundValues(values: Float64Array, decimals: number): void {
  for (let n = 0; n < values.length; n++) values[n] = Number(values[n]!.toFixed(decimals)) + 0;
}
