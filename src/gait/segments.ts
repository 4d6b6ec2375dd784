// Segment coordinate frames of the lower body (pelvis, thighs, shanks, feet) from joint centres, per frame.
//
// Every segment frame is right-handed with the same anatomical meaning of its axes, on both sides:
//   X forward (anterior), Y to the subject's left, Z up (distal to proximal along the long axis).
// This is the ISB joint coordinate system's idea (Wu et al. 2002: anatomical frames per segment, angles
// as rotations of the distal frame about axes fixed in the proximal one) with ISB's axes renamed:
// ISB (X anterior, Y superior, Z right) = ours (X, Z, −Y). One naming for both sides keeps flexion on +Y.
//
//   pelvis  origin: midpoint of the hip joint centres.
//           Y = unit(l_hip − r_hip).
//           Z = the pelvis-up reference (spine joint − origin; the thorax when there is no spine joint)
//               made perpendicular to Y; with neither, the canonical up axis (Z) made perpendicular to Y,
//               so the pelvis then has no tilt of its own (see `upSource`).
//           X = Y × Z.
//   thigh   origin: hip. Z = unit(hip − knee).
//           Y = the knee hinge axis: the normal of the hip-knee-ankle plane, (ankle − knee) × (hip − knee),
//               turned to point to the pelvis's left, plus HINGE_BLEND × the pelvis Y made perpendicular to Z
//               (which decides the axis where the knee is nearly straight and the plane is undefined), then
//               normalised. The blend tilts the axis only when the hip is rotated about the thigh; a tilt δ
//               reads a knee angle k as atan(tan k · cos δ) (e.g. 7.92° for 8° with the hip rotated 20°).
//           X = Y × Z.
//   shank   origin: knee. Z = unit(knee − ankle); Y = the same hinge axis made perpendicular to Z; X = Y × Z.
//   foot    origin: ankle. X = unit(toe − heel) (heel: the virtual heel point, toe: the toe joint);
//           Y = the shank's Y made perpendicular to X; Z = X × Y.
// The knee is a hinge in this model: thigh and shank share their Y, and a hyperextended knee keeps it
// (the plane normal is turned to the pelvis's left before use), so its flexion reads negative.
import type { GaitInput } from './input.js';

/** Floats per segment frame per frame: origin xyz, X axis, Y axis, Z axis. */
export const FRAME_STRIDE = 12;

/** Weight of the pelvis's left axis added to the knee-plane normal (|normal| = sin of the knee angle). */
export const HINGE_BLEND = 0.1;

/** Least distance (m) of the pelvis-up joint from the hip line for it to define the pelvis's up. */
export const MIN_PELVIS_UP_M = 0.02;

/** Where the pelvis's up axis came from. */
export type PelvisUpSource = 'spine' | 'thorax' | 'up axis';

/** Segment frames of a take: frames × FRAME_STRIDE floats each (origin, X, Y, Z), left then right per pair. */
export interface SegmentFrames {
  frames: number;
  pelvis: Float64Array;
  thigh: [Float64Array, Float64Array];
  shank: [Float64Array, Float64Array];
  foot: [Float64Array, Float64Array];
  upSource: PelvisUpSource;
  /** Joint index used for the pelvis's up, or -1 with the up axis. */
  upJoint: number;
}

/** Joint indices a frame needs: pelvis up joint (or -1), hips, knees, ankles, toes (left, right). */
export interface SegmentJoints {
  up: number;
  hip: [number, number];
  knee: [number, number];
  ankle: [number, number];
  toe: [number, number];
}

/** Returns the pelvis-up joint choice: the spine joint, else the thorax, else the up axis (joint -1). */
export function choosePelvisUp(input: GaitInput): { source: PelvisUpSource; joint: number } {
  const { rest, role } = input;
  const lh = role.l_hip * 3, rh = role.r_hip * 3;
  for (const source of ['spine', 'thorax'] as const) {
    const j = role[source];
    if (j < 0) continue;
    // Distance of the joint from the rest pose's hip line.
    const ax = rest[lh]! - rest[rh]!, ay = rest[lh + 1]! - rest[rh + 1]!, az = rest[lh + 2]! - rest[rh + 2]!;
    const px = rest[j * 3]! - rest[rh]!, py = rest[j * 3 + 1]! - rest[rh + 1]!, pz = rest[j * 3 + 2]! - rest[rh + 2]!;
    const cx = ay * pz - az * py, cy = az * px - ax * pz, cz = ax * py - ay * px;
    const dist = Math.hypot(cx, cy, cz) / Math.max(1e-12, Math.hypot(ax, ay, az));
    if (dist >= MIN_PELVIS_UP_M) return { source, joint: j };
  }
  return { source: 'up axis', joint: -1 };
}

/** Returns the joint indices segment frames are built from. */
export function segmentJoints(input: GaitInput, upJoint: number): SegmentJoints {
  const r = input.role;
  return { up: upJoint, hip: [r.l_hip, r.r_hip], knee: [r.l_knee, r.r_knee], ankle: [r.l_ankle, r.r_ankle], toe: [r.l_toe, r.r_toe] };
}

/** Returns empty segment frame arrays for `frames` frames. */
export function allocSegments(frames: number, upSource: PelvisUpSource, upJoint: number): SegmentFrames {
  const a = () => new Float64Array(frames * FRAME_STRIDE);
  return { frames, pelvis: a(), thigh: [a(), a()], shank: [a(), a()], foot: [a(), a()], upSource, upJoint };
}

/** Returns the segment frames of every frame of the input (allocation-free per frame). */
export function segmentFrames(input: GaitInput, out?: SegmentFrames): SegmentFrames {
  const up = choosePelvisUp(input);
  const seg = out ?? allocSegments(input.frames, up.source, up.joint);
  seg.upSource = up.source;
  seg.upJoint = up.joint;
  const jt = segmentJoints(input, up.joint);
  for (let f = 0; f < input.frames; f++)
    segmentFrameAt(input.positions, input.heels, f, input.jointCount, jt, seg, f);
  return seg;
}

/** Returns the segment frames of the input's rest pose (one frame). */
export function restSegmentFrames(input: GaitInput): SegmentFrames {
  const up = choosePelvisUp(input);
  const seg = allocSegments(1, up.source, up.joint);
  segmentFrameAt(input.rest, input.restHeels, 0, input.jointCount, segmentJoints(input, up.joint), seg, 0);
  return seg;
}

// Scratch for one frame (module level: no allocation per frame).
const hinge = new Float64Array(3);
const tmp = new Float64Array(3);

/**
 * Writes the segment frames of frame `f` of `positions` (frames × joints × 3) and `heels` (frames × 2 × 3)
 * into slot `o` of `out`; returns nothing.
 */
export function segmentFrameAt(positions: Float64Array, heels: Float64Array, f: number, J: number, jt: SegmentJoints, out: SegmentFrames, o: number): void {
  const base = f * J * 3;
  const P = out.pelvis, po = o * FRAME_STRIDE;
  const lh = base + jt.hip[0] * 3, rh = base + jt.hip[1] * 3;
  // Pelvis origin and Y.
  P[po] = 0.5 * (positions[lh]! + positions[rh]!);
  P[po + 1] = 0.5 * (positions[lh + 1]! + positions[rh + 1]!);
  P[po + 2] = 0.5 * (positions[lh + 2]! + positions[rh + 2]!);
  P[po + 6] = positions[lh]! - positions[rh]!;
  P[po + 7] = positions[lh + 1]! - positions[rh + 1]!;
  P[po + 8] = positions[lh + 2]! - positions[rh + 2]!;
  normalise(P, po + 6);
  // Pelvis up reference.
  if (jt.up >= 0) {
    const u = base + jt.up * 3;
    P[po + 9] = positions[u]! - P[po]!;
    P[po + 10] = positions[u + 1]! - P[po + 1]!;
    P[po + 11] = positions[u + 2]! - P[po + 2]!;
  } else {
    P[po + 9] = 0; P[po + 10] = 0; P[po + 11] = 1;
  }
  orthogonalise(P, po + 9, P, po + 6);
  cross(P, po + 6, P, po + 9, P, po + 3); // X = Y × Z
  for (let s = 0; s < 2; s++) {
    const T = out.thigh[s]!, S = out.shank[s]!, Ft = out.foot[s]!;
    const h = base + jt.hip[s]! * 3, k = base + jt.knee[s]! * 3, a = base + jt.ankle[s]! * 3, t = base + jt.toe[s]! * 3;
    // Thigh Z and shank Z.
    T[po] = positions[h]!; T[po + 1] = positions[h + 1]!; T[po + 2] = positions[h + 2]!;
    T[po + 9] = positions[h]! - positions[k]!; T[po + 10] = positions[h + 1]! - positions[k + 1]!; T[po + 11] = positions[h + 2]! - positions[k + 2]!;
    normalise(T, po + 9);
    S[po] = positions[k]!; S[po + 1] = positions[k + 1]!; S[po + 2] = positions[k + 2]!;
    S[po + 9] = positions[k]! - positions[a]!; S[po + 10] = positions[k + 1]! - positions[a + 1]!; S[po + 11] = positions[k + 2]! - positions[a + 2]!;
    normalise(S, po + 9);
    // Hinge: (ankle − knee) × (hip − knee) over unit vectors = (−S_z) × T_z = T_z × S_z, turned to the pelvis's left.
    cross(T, po + 9, S, po + 9, hinge, 0);
    const side = hinge[0]! * P[po + 6]! + hinge[1]! * P[po + 7]! + hinge[2]! * P[po + 8]!;
    const sg = side < 0 ? -1 : 1;
    // The pelvis's left made perpendicular to the thigh (so that with no hip rotation it is the thigh's own Y).
    const pt = P[po + 6]! * T[po + 9]! + P[po + 7]! * T[po + 10]! + P[po + 8]! * T[po + 11]!;
    hinge[0] = sg * hinge[0]! + HINGE_BLEND * (P[po + 6]! - pt * T[po + 9]!);
    hinge[1] = sg * hinge[1]! + HINGE_BLEND * (P[po + 7]! - pt * T[po + 10]!);
    hinge[2] = sg * hinge[2]! + HINGE_BLEND * (P[po + 8]! - pt * T[po + 11]!);
    T[po + 6] = hinge[0]!; T[po + 7] = hinge[1]!; T[po + 8] = hinge[2]!;
    orthogonalise(T, po + 6, T, po + 9);
    cross(T, po + 6, T, po + 9, T, po + 3);
    S[po + 6] = hinge[0]!; S[po + 7] = hinge[1]!; S[po + 8] = hinge[2]!;
    orthogonalise(S, po + 6, S, po + 9);
    cross(S, po + 6, S, po + 9, S, po + 3);
    // Foot: X heel → toe, Y from the shank.
    const e = f * 6 + s * 3;
    Ft[po] = positions[a]!; Ft[po + 1] = positions[a + 1]!; Ft[po + 2] = positions[a + 2]!;
    Ft[po + 3] = positions[t]! - heels[e]!; Ft[po + 4] = positions[t + 1]! - heels[e + 1]!; Ft[po + 5] = positions[t + 2]! - heels[e + 2]!;
    normalise(Ft, po + 3);
    Ft[po + 6] = S[po + 6]!; Ft[po + 7] = S[po + 7]!; Ft[po + 8] = S[po + 8]!;
    orthogonalise(Ft, po + 6, Ft, po + 3);
    cross(Ft, po + 3, Ft, po + 6, Ft, po + 9); // Z = X × Y
  }
}

/** Scales the 3-vector at v[o] to unit length (left as is when zero). */
function normalise(v: Float64Array, o: number): void {
  const n = Math.hypot(v[o]!, v[o + 1]!, v[o + 2]!);
  if (n > 0) { v[o] = v[o]! / n; v[o + 1] = v[o + 1]! / n; v[o + 2] = v[o + 2]! / n; }
}

/** Removes from v[o] its part along the unit vector u[uo], then normalises it. */
function orthogonalise(v: Float64Array, o: number, u: Float64Array, uo: number): void {
  const d = v[o]! * u[uo]! + v[o + 1]! * u[uo + 1]! + v[o + 2]! * u[uo + 2]!;
  tmp[0] = v[o]! - d * u[uo]!; tmp[1] = v[o + 1]! - d * u[uo + 1]!; tmp[2] = v[o + 2]! - d * u[uo + 2]!;
  v[o] = tmp[0]!; v[o + 1] = tmp[1]!; v[o + 2] = tmp[2]!;
  normalise(v, o);
}

/** Writes a × b into out[oo] (out may not alias a or b at the same offset). */
function cross(a: Float64Array, ao: number, b: Float64Array, bo: number, out: Float64Array, oo: number): void {
  const x = a[ao + 1]! * b[bo + 2]! - a[ao + 2]! * b[bo + 1]!;
  const y = a[ao + 2]! * b[bo]! - a[ao]! * b[bo + 2]!;
  const z = a[ao]! * b[bo + 1]! - a[ao + 1]! * b[bo]!;
  out[oo] = x; out[oo + 1] = y; out[oo + 2] = z;
}
