// What gait analysis works on: every joint and both virtual heels per frame, in metres, in a canonical
// right-handed frame with Z up, low-pass filtered, with the joint index of every role.
import { InputError } from '../errors/index.js';
import { planFk, poseFrame, restPose } from '../skeleton/fk.js';
import { heelOffsets } from '../skeleton/heel.js';
import type { ImportedTake } from '../skeleton/import.js';
import { ROLE_NAMES, type RoleName } from '../skeleton/roles.js';
import { lowpassInterleaved } from './filter.js';
import { rotationToZ } from '../skeleton/axes.js';

/** Default low-pass cutoff for joint positions (common practice for walking kinematics). */
export const DEFAULT_LOWPASS_HZ = 6;

export interface GaitInput {
  path: string;
  fps: number;
  frames: number;
  jointCount: number;
  /** Joint positions, frames x joints x 3, metres, canonical frame (Z up), filtered when asked. */
  positions: Float64Array;
  /** Virtual heels, frames x 2 (left, right) x 3, same frame and filter. */
  heels: Float64Array;
  /** Joint index per role, -1 where the skeleton lacks it. */
  role: Record<RoleName, number>;
  /** Rest pose in the canonical frame, joints x 3, metres (the neutral standing pose). */
  rest: Float64Array;
  /** Heels of the rest pose, 2 x 3. */
  restHeels: Float64Array;
  /** Mean of the left and right hip-knee-ankle lengths at rest, metres. */
  legLengthM: number;
  /** Low-pass cutoff used, or null when off. */
  lowpassHz: number | null;
  /** Rotation from file axes to the canonical frame, row-major 3x3. */
  toCanonical: Float64Array;
}

/** Returns the gait input of an imported take: FK, units to metres, axes to Z up, optional low-pass. */
export function prepareGait(imported: ImportedTake, lowpassHz: number | null = DEFAULT_LOWPASS_HZ): GaitInput {
  const { take, frame, path } = imported;
  const roleMap = frame.roles.roles;
  const role = Object.fromEntries(ROLE_NAMES.map((r) => [r, roleMap[r]?.joint ?? -1])) as Record<RoleName, number>;
  for (const r of ['l_hip', 'l_knee', 'l_ankle', 'l_toe', 'r_hip', 'r_knee', 'r_ankle', 'r_toe', 'pelvis'] as const)
    if (role[r] < 0) throw new InputError(`${path}: gait analysis needs the ${r} role, which was not found; give it in a role-map file (--roles).`);
  const s = frame.units.metresPerUnit;
  const R = rotationToZ(frame.up.vector);
  const F = take.frameCount;
  const J = take.joints.length;
  const restUp = frame.roles.restUp ?? frame.up.vector;
  const d = heelOffsets(take, roleMap, restUp);
  const ankles = [role.l_ankle, role.r_ankle];
  const plan = planFk(take);
  const pos = new Float64Array(J * 3);
  const rot = new Float64Array(J * 9);
  const positions = new Float64Array(F * J * 3);
  const heels = new Float64Array(F * 6);
  // Canonical = R · (s · p), for a point p in file coordinates.
  const put = (out: Float64Array, o: number, x: number, y: number, z: number) => {
    out[o] = s * (R[0]! * x + R[1]! * y + R[2]! * z);
    out[o + 1] = s * (R[3]! * x + R[4]! * y + R[5]! * z);
    out[o + 2] = s * (R[6]! * x + R[7]! * y + R[8]! * z);
  };
  for (let f = 0; f < F; f++) {
    poseFrame(plan, take.values, f, pos, rot);
    for (let j = 0; j < J; j++) put(positions, (f * J + j) * 3, pos[j * 3]!, pos[j * 3 + 1]!, pos[j * 3 + 2]!);
    for (let k = 0; k < 2; k++) {
      const a3 = ankles[k]! * 3, a9 = ankles[k]! * 9, dx = d[k * 3]!, dy = d[k * 3 + 1]!, dz = d[k * 3 + 2]!;
      put(heels, f * 6 + k * 3,
        pos[a3]! + rot[a9]! * dx + rot[a9 + 1]! * dy + rot[a9 + 2]! * dz,
        pos[a3 + 1]! + rot[a9 + 3]! * dx + rot[a9 + 4]! * dy + rot[a9 + 5]! * dz,
        pos[a3 + 2]! + rot[a9 + 6]! * dx + rot[a9 + 7]! * dy + rot[a9 + 8]! * dz);
    }
  }
  const fps = 1 / take.frameTime;
  if (lowpassHz !== null) {
    lowpassInterleaved(positions, F, J * 3, lowpassHz, fps);
    lowpassInterleaved(heels, F, 6, lowpassHz, fps);
  }
  const restFile = restPose(take);
  const rest = new Float64Array(J * 3);
  for (let j = 0; j < J; j++) put(rest, j * 3, restFile[j * 3]!, restFile[j * 3 + 1]!, restFile[j * 3 + 2]!);
  const restHeels = new Float64Array(6);
  for (let k = 0; k < 2; k++) {
    const a3 = ankles[k]! * 3;
    put(restHeels, k * 3, restFile[a3]! + d[k * 3]!, restFile[a3 + 1]! + d[k * 3 + 1]!, restFile[a3 + 2]! + d[k * 3 + 2]!);
  }
  const seg = (a: number, b: number) => Math.hypot(rest[a * 3]! - rest[b * 3]!, rest[a * 3 + 1]! - rest[b * 3 + 1]!, rest[a * 3 + 2]! - rest[b * 3 + 2]!);
  const legLengthM = 0.5 * (seg(role.l_hip, role.l_knee) + seg(role.l_knee, role.l_ankle) + seg(role.r_hip, role.r_knee) + seg(role.r_knee, role.r_ankle));
  return { path, fps, frames: F, jointCount: J, positions, heels, role, rest, restHeels, legLengthM, lowpassHz, toCanonical: R };
}
