// The virtual heel: a point on each foot built from ankle and toe, rigid with the ankle's segment.
//
// Construction (rest pose, all rotations zero; u = the rest pose's unit up):
//   f      = toe_rest − ankle_rest                 the foot vector
//   f_h    = f − (f·u) u                           its part perpendicular to up
//   heel_rest = ankle_rest − 0.3 f_h − ((ankle_rest − toe_rest)·u) u
// i.e. on the toe's height, behind the ankle by 0.3 of the horizontal ankle-to-toe distance.
// The offset d = heel_rest − ankle_rest is carried by the ankle's world rotation:
//   heel(t) = ankle(t) + R_ankle_world(t) · d
import type { Take } from '../bvh/take.js';
import { InputError } from '../errors/index.js';
import { planFk, poseFrame, restPose } from './fk.js';
import type { RoleMap } from './roles.js';
import type { UpAxis } from './units.js';

/** Fraction of the horizontal ankle-to-toe distance the heel sits behind the ankle. */
export const HEEL_BACK_FRACTION = 0.3;

/** An up direction: an axis letter (optionally signed, "-y") or a vector. */
export type UpInput = UpAxis | '-y' | '-z' | ArrayLike<number>;

/** Returns the unit up vector of an axis letter or vector. */
export function upVector(up: UpInput): [number, number, number] {
  if (typeof up === 'string') {
    const sign = up.startsWith('-') ? -1 : 1;
    return up.endsWith('z') ? [0, 0, sign] : [0, sign, 0];
  }
  const len = Math.hypot(up[0]!, up[1]!, up[2]!);
  if (!(len > 0)) throw new InputError('The up direction must be a non-zero vector.');
  return [up[0]! / len, up[1]! / len, up[2]! / len];
}

/** Returns the ankle joints and heel offsets d of both sides: offsets as [l dx, dy, dz, r dx, dy, dz], file units. */
function heelSetup(take: Take, roles: RoleMap, up: UpInput): { ankles: [number, number]; offsets: Float64Array } {
  const u = upVector(up);
  const rest = restPose(take);
  const offsets = new Float64Array(6);
  const ankles: [number, number] = [-1, -1];
  (['l', 'r'] as const).forEach((s, k) => {
    const ankle = roles[`${s}_ankle`];
    const toe = roles[`${s}_toe`];
    const side = s === 'l' ? 'left' : 'right';
    if (!ankle || !toe) throw new InputError(`The virtual heel needs the ${side} ankle and toe, but the role map has no ${!ankle ? `${s}_ankle` : `${s}_toe`}; give it in a role-map file.`);
    const a = ankle.joint * 3, t = toe.joint * 3;
    const f = [rest[t]! - rest[a]!, rest[t + 1]! - rest[a + 1]!, rest[t + 2]! - rest[a + 2]!];
    const fu = f[0]! * u[0] + f[1]! * u[1] + f[2]! * u[2];
    // (ankle − toe)·u = −f·u, so heel − ankle = −0.3 f_h + (f·u) u.
    for (let i = 0; i < 3; i++) offsets[k * 3 + i] = -HEEL_BACK_FRACTION * (f[i]! - fu * u[i]!) + fu * u[i]!;
    ankles[k] = ankle.joint;
  });
  return { ankles, offsets };
}

/** Returns the heel offsets d = heel_rest − ankle_rest of both feet, [left xyz, right xyz], file units. */
export function heelOffsets(take: Take, roles: RoleMap, up: UpInput): Float64Array {
  return heelSetup(take, roles, up).offsets;
}

/**
 * Returns heel world positions for frames [from, to): frames x 2 (left, right) x 3, file units.
 * `up` is the rest pose's up (the one the heel is built on); pass `out` to reuse a buffer.
 */
export function heelTrajectories(take: Take, roles: RoleMap, up: UpInput, from = 0, to = take.frameCount, out?: Float64Array): Float64Array {
  const { ankles, offsets: d } = heelSetup(take, roles, up);
  const n = Math.max(0, to - from);
  const res = out ?? new Float64Array(n * 6);
  if (res.length < n * 6) throw new InputError(`The heel buffer holds ${res.length} values but ${n * 6} are needed.`);
  const plan = planFk(take);
  const pos = new Float64Array(plan.jointCount * 3);
  const rot = new Float64Array(plan.jointCount * 9);
  for (let f = 0; f < n; f++) {
    poseFrame(plan, take.values, from + f, pos, rot);
    for (let k = 0; k < 2; k++) {
      const a3 = ankles[k]! * 3, a9 = ankles[k]! * 9, k3 = k * 3, o = f * 6 + k3;
      const dx = d[k3]!, dy = d[k3 + 1]!, dz = d[k3 + 2]!;
      res[o] = pos[a3]! + rot[a9]! * dx + rot[a9 + 1]! * dy + rot[a9 + 2]! * dz;
      res[o + 1] = pos[a3 + 1]! + rot[a9 + 3]! * dx + rot[a9 + 4]! * dy + rot[a9 + 5]! * dz;
      res[o + 2] = pos[a3 + 2]! + rot[a9 + 6]! * dx + rot[a9 + 7]! * dy + rot[a9 + 8]! * dz;
    }
  }
  return res;
}
