// The sagittal arm angle per frame: the upper arm (shoulder → elbow) in the vertical plane of the walking
// direction, atan2(v · d, −v · z) with d the unit walking direction and z up, so a hanging arm reads 0 and
// an arm swung forward reads positive (flexion), backward negative (extension). The rest pose's own angle is
// subtracted when the rest arm hangs (its projection on the sagittal plane is at least half its length and
// points down); a rest pose with the arms out to the sides (a T-pose) keeps the absolute angle and says so.
// Relative phase and vector coding do not depend on this offset (both centre or difference the signal).
import type { GaitInput } from '../gait/input.js';
import type { SideName } from '../gait/types.js';

const DEG = 180 / Math.PI;

/** Both arms' sagittal angles in degrees per frame (NaN where there is no walking direction or no arm). */
export interface ArmAngles {
  left: Float64Array;
  right: Float64Array;
  /** Per side: whether the rest pose's angle was subtracted (false for a rest pose with raised arms). */
  restZeroed: Record<SideName, boolean>;
  /** Per side: whether the skeleton has both the shoulder and the elbow role. */
  present: Record<SideName, boolean>;
  warnings: string[];
}

/** Returns both arms' sagittal angles per frame; `direction` is frames × 3, unit and horizontal (zero = none). */
export function sagittalArmAngles(input: GaitInput, direction: Float64Array): ArmAngles {
  const F = input.frames, J = input.jointCount, P = input.positions;
  const warnings: string[] = [];
  const out = { left: new Float64Array(F).fill(NaN), right: new Float64Array(F).fill(NaN) };
  const restZeroed = { left: false, right: false }, present = { left: false, right: false };
  // Rest forward: the hips' left axis turned a quarter clockwise about up (forward = left × up, Z up).
  const R = input.rest, lh = input.role.l_hip * 3, rh = input.role.r_hip * 3;
  let fx = R[lh + 1]! - R[rh + 1]!, fy = -(R[lh]! - R[rh]!);
  const fn = Math.hypot(fx, fy);
  fx /= fn; fy /= fn;
  for (const side of ['left', 'right'] as const) {
    const sh = input.role[side === 'left' ? 'l_shoulder' : 'r_shoulder'], el = input.role[side === 'left' ? 'l_elbow' : 'r_elbow'];
    if (sh < 0 || el < 0) { warnings.push(`${input.path}: no ${side} shoulder or elbow; the ${side} arm angle is not measured.`); continue; }
    present[side] = true;
    const vx0 = R[el * 3]! - R[sh * 3]!, vy0 = R[el * 3 + 1]! - R[sh * 3 + 1]!, vz0 = R[el * 3 + 2]! - R[sh * 3 + 2]!;
    const len = Math.hypot(vx0, vy0, vz0), fwd0 = vx0 * fx + vy0 * fy;
    let offset = 0;
    if (len > 0 && Math.hypot(fwd0, vz0) >= 0.5 * len && -vz0 > 0) { offset = Math.atan2(fwd0, -vz0) * DEG; restZeroed[side] = true; }
    else warnings.push(`${input.path}: the ${side} arm does not hang in the rest pose; its sagittal angle is measured from the vertical, not from the rest pose.`);
    const o = out[side];
    for (let f = 0; f < F; f++) {
      const dx = direction[f * 3]!, dy = direction[f * 3 + 1]!;
      if (dx === 0 && dy === 0) continue;
      const b = f * J * 3;
      const vx = P[b + el * 3]! - P[b + sh * 3]!, vy = P[b + el * 3 + 1]! - P[b + sh * 3 + 1]!, vz = P[b + el * 3 + 2]! - P[b + sh * 3 + 2]!;
      o[f] = Math.atan2(vx * dx + vy * dy, -vz) * DEG - offset;
    }
  }
  return { ...out, restZeroed, present, warnings };
}
