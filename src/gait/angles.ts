// Joint angles per frame, in degrees, from the segment frames (see segments.ts for the axes), zero at the
// rest pose (the neutral standing pose: each angle of the rest pose is subtracted).
//
// Signs (flexion positive; per-side angles read the same way on both sides):
//   hip_flexion         thigh long axis in the pelvis frame, rotation about the pelvis's Y (its left):
//                       atan2(−t·X_p, t·Z_p) with t the thigh's Z; knee forward = flexion (+).
//   hip_abduction       the thigh's angle out of the pelvis's sagittal plane (the floating axis of the JCS):
//                       asin(−t·Y_p) on the left, asin(t·Y_p) on the right; knee away from the midline (+).
//   knee_flexion        shank long axis in the thigh frame about the shared hinge axis: atan2(s·X_t, s·Z_t)
//                       with s the shank's Z; ankle behind the thigh line = flexion (+), hyperextension (−).
//   ankle_dorsiflexion  foot long axis (heel → toe) in the shank frame: atan2(x·Z_s, x·X_s);
//                       toes towards the shin (+), plantarflexion (−).
//   foot_progression    foot heading on the floor (its lateral axis turned a quarter right) against the
//                       walking direction; toe-out (+), toe-in (−).
//   pelvis_tilt, pelvis_obliquity, pelvis_rotation
//                       the pelvis against the progression frame (X = walking direction, Z = up, Y = Z × X),
//                       as rotation about Z, then obliquity about the turned X, then tilt about the pelvis's Y
//                       (the rotation-first order of Baker 2001, recalled from memory), so tilt and obliquity do
//                       not depend on the walking direction. Anterior tilt (+); left hip up (+);
//                       rotation towards the subject's left, i.e. right hip forward (+).
import { InputError } from '../errors/index.js';
import type { GaitInput } from './input.js';
import { FRAME_STRIDE, type PelvisUpSource, type SegmentFrames, restSegmentFrames, segmentFrames } from './segments.js';

/** Names of the per-side angles. */
export const SIDE_ANGLE_NAMES = ['hip_flexion', 'knee_flexion', 'ankle_dorsiflexion', 'hip_abduction', 'foot_progression'] as const;
export type SideAngleName = (typeof SIDE_ANGLE_NAMES)[number];

/** Names of the pelvis angles. */
export const PELVIS_ANGLE_NAMES = ['pelvis_tilt', 'pelvis_obliquity', 'pelvis_rotation'] as const;
export type PelvisAngleName = (typeof PELVIS_ANGLE_NAMES)[number];

/** One side's angles: degrees per frame. */
export type SideAngles = Record<SideAngleName, Float64Array>;

/** Every angle of a take, degrees per frame; NaN where an angle cannot be had (no walking direction). */
export interface AngleSeries {
  frames: number;
  fps: number;
  left: SideAngles;
  right: SideAngles;
  pelvis_tilt: Float64Array;
  pelvis_obliquity: Float64Array;
  pelvis_rotation: Float64Array;
  /** The rest pose's own angles (degrees), subtracted from every frame. */
  restOffsets: { left: Record<SideAngleName, number>; right: Record<SideAngleName, number> } & Record<PelvisAngleName, number>;
  /** What the pelvis's up axis was built from ('up axis': no tilt can be measured; pelvis_tilt is then 0). */
  pelvisUpSource: PelvisUpSource;
  /** Where the walking direction came from. */
  directionSource: 'given' | 'pelvis mean';
  warnings: string[];
}

/** Slots of the per-frame angle vector. */
const N_ANGLES = 13;
const SLOT = { pelvis_tilt: 10, pelvis_obliquity: 11, pelvis_rotation: 12 } as const;
const sideSlot = (s: number, k: number) => s * 5 + k;

const DEG = 180 / Math.PI;

/** Returns the angles of every frame (see the sign list above); `direction` is frames × 3, unit and horizontal. */
export function jointAngles(input: GaitInput, direction?: Float64Array | null, segments?: SegmentFrames): AngleSeries {
  const F = input.frames;
  if (direction && direction.length !== F * 3)
    throw new InputError(`${input.path}: the walking direction has ${direction.length / 3} frames but the take has ${F}.`);
  const seg = segments ?? segmentFrames(input);
  const rest = restSegmentFrames(input);
  const warnings: string[] = [];
  if (seg.upSource === 'up axis')
    warnings.push(`${input.path}: no spine or thorax joint above the hips; the pelvis's up is the vertical, so pelvis tilt is not measured (reads 0).`);
  else if (seg.upSource === 'thorax')
    warnings.push(`${input.path}: no spine joint; the pelvis's up comes from the thorax, so trunk motion enters pelvis tilt and obliquity.`);

  // The rest pose's angles, against its own pelvis forward.
  const restA = new Float64Array(N_ANGLES);
  const rp = rest.pelvis;
  const rdx = rp[3]!, rdy = rp[4]!, rn = Math.hypot(rdx, rdy);
  anglesAt(rest, 0, rdx / rn, rdy / rn, restA);

  // Fallback direction: the pelvis's forward averaged over the take.
  let mx = 0, my = 0;
  if (!direction) {
    for (let f = 0; f < F; f++) { mx += seg.pelvis[f * FRAME_STRIDE + 3]!; my += seg.pelvis[f * FRAME_STRIDE + 4]!; }
    const n = Math.hypot(mx, my);
    if (!(n > 0)) throw new InputError(`${input.path}: the pelvis has no mean forward direction; give the walking direction.`);
    mx /= n; my /= n;
  }

  const mk = () => new Float64Array(F);
  const sideOut = (): SideAngles => ({ hip_flexion: mk(), knee_flexion: mk(), ankle_dorsiflexion: mk(), hip_abduction: mk(), foot_progression: mk() });
  const left = sideOut(), right = sideOut();
  const tilt = mk(), obl = mk(), rot = mk();
  const cols: Float64Array[] = [];
  for (const side of [left, right]) for (const name of SIDE_ANGLE_NAMES) cols.push(side[name]);
  cols.push(tilt, obl, rot);
  const a = new Float64Array(N_ANGLES);
  let missing = 0;
  for (let f = 0; f < F; f++) {
    let dx = mx, dy = my;
    if (direction) {
      dx = direction[f * 3]!; dy = direction[f * 3 + 1]!;
      const n = Math.hypot(dx, dy);
      if (n > 1e-9) { dx /= n; dy /= n; } else { dx = NaN; dy = NaN; missing++; }
    }
    anglesAt(seg, f, dx, dy, a);
    for (let k = 0; k < N_ANGLES; k++) cols[k]![f] = wrapDeg(a[k]! - restA[k]!);
  }
  if (missing > 0)
    warnings.push(`${input.path}: ${missing} frames have no walking direction; pelvis rotation and foot progression are NaN there.`);
  const restSide = (s: number) => Object.fromEntries(SIDE_ANGLE_NAMES.map((n, k) => [n, restA[sideSlot(s, k)]!])) as Record<SideAngleName, number>;
  return {
    frames: F, fps: input.fps, left, right, pelvis_tilt: tilt, pelvis_obliquity: obl, pelvis_rotation: rot,
    restOffsets: { left: restSide(0), right: restSide(1), pelvis_tilt: restA[SLOT.pelvis_tilt]!, pelvis_obliquity: restA[SLOT.pelvis_obliquity]!, pelvis_rotation: restA[SLOT.pelvis_rotation]! },
    pelvisUpSource: seg.upSource,
    directionSource: direction ? 'given' : 'pelvis mean',
    warnings,
  };
}

/**
 * Writes the 13 raw angles (degrees, before the rest pose is subtracted) of slot `o` of the segment frames,
 * for the unit horizontal walking direction (dx, dy), into `out`: per side (left, right) hip flexion, knee
 * flexion, ankle dorsiflexion, hip abduction, foot progression, then pelvis tilt, obliquity, rotation.
 */
export function anglesAt(seg: SegmentFrames, o: number, dx: number, dy: number, out: Float64Array): void {
  const q = o * FRAME_STRIDE;
  const P = seg.pelvis;
  const pxx = P[q + 3]!, pxy = P[q + 4]!, pxz = P[q + 5]!;
  const pyx = P[q + 6]!, pyy = P[q + 7]!, pyz = P[q + 8]!;
  const pzx = P[q + 9]!, pzy = P[q + 10]!, pzz = P[q + 11]!;
  for (let s = 0; s < 2; s++) {
    const T = seg.thigh[s]!, S = seg.shank[s]!, Ft = seg.foot[s]!;
    const tx = T[q + 9]!, ty = T[q + 10]!, tz = T[q + 11]!;
    const hipFlex = Math.atan2(-(tx * pxx + ty * pxy + tz * pxz), tx * pzx + ty * pzy + tz * pzz);
    const ty_p = tx * pyx + ty * pyy + tz * pyz;
    const hipAbd = Math.asin(clamp1(s === 0 ? -ty_p : ty_p));
    const sx = S[q + 9]!, sy = S[q + 10]!, sz = S[q + 11]!;
    const knee = Math.atan2(sx * T[q + 3]! + sy * T[q + 4]! + sz * T[q + 5]!, sx * tx + sy * ty + sz * tz);
    const fx = Ft[q + 3]!, fy = Ft[q + 4]!, fz = Ft[q + 5]!;
    const ankle = Math.atan2(fx * sx + fy * sy + fz * sz, fx * S[q + 3]! + fy * S[q + 4]! + fz * S[q + 5]!);
    // Foot on the floor against the direction: positive when the toe points to the subject's left of travel.
    // The foot's heading is read from its lateral axis turned a quarter right, (Y_y, −Y_x): pitch turns the
    // foot about that axis, so a steep foot near toe-off keeps its heading, where the projection of the
    // heel-to-toe axis would shrink and flip. For a flat foot both agree.
    const hx = Ft[q + 7]!, hy = -Ft[q + 6]!;
    const toLeft = Math.atan2(dx * hy - dy * hx, dx * hx + dy * hy);
    const b = s * 5;
    out[b] = hipFlex * DEG;
    out[b + 1] = knee * DEG;
    out[b + 2] = ankle * DEG;
    out[b + 3] = hipAbd * DEG;
    out[b + 4] = (s === 0 ? toLeft : -toLeft) * DEG;
  }
  out[SLOT.pelvis_tilt] = Math.atan2(-pxz, pzz) * DEG;
  out[SLOT.pelvis_obliquity] = Math.asin(clamp1(pyz)) * DEG;
  // Progression frame: X_g = (dx, dy, 0), Y_g = (−dy, dx, 0).
  out[SLOT.pelvis_rotation] = Math.atan2(-(pyx * dx + pyy * dy), pyx * -dy + pyy * dx) * DEG;
}

function clamp1(x: number): number {
  return x > 1 ? 1 : x < -1 ? -1 : x;
}

/** Returns an angle in degrees wrapped to (−180, 180]; NaN stays NaN. */
export function wrapDeg(a: number): number {
  if (a > -180 && a <= 180) return a;
  const w = a - 360 * Math.floor((a + 180) / 360);
  return w === -180 ? 180 : w;
}
