// The pair-line layer's measure while the coupling model is not there: how much the distance between
// two role joints changes over the take (its population standard deviation, cm, every recorded frame).
// Rigid pairs (both ends on one segment) read near 0; pairs across moving limbs read high.
import type { Take } from '../bvh/take.js';
import { planFk, poseFrame } from '../skeleton/fk.js';
import type { ResolvedFrame } from '../skeleton/frame.js';
import { ROLE_NAMES, type RoleName } from '../skeleton/roles.js';
import type { ViewPairs } from './types.js';

/** Roles the pair layer joins (the trunk's spine and neck differ most between layouts and are left out). */
export const PAIR_ROLES: readonly RoleName[] = ROLE_NAMES.filter((r) => r !== 'spine' && r !== 'neck');

/** Returns, for every unordered pair of present roles, the SD of their distance over all frames, in cm. */
export function pairDistanceSpread(take: Take, frame: ResolvedFrame): ViewPairs {
  const roles = PAIR_ROLES.filter((r) => frame.roles.roles[r] !== null);
  const idx = Int32Array.from(roles, (r) => frame.roles.roles[r]!.joint);
  const n = idx.length;
  const P = (n * (n - 1)) / 2;
  const mean = new Float64Array(P);
  const m2 = new Float64Array(P);
  const J = take.joints.length;
  const plan = planFk(take);
  const pos = new Float64Array(J * 3);
  const rot = new Float64Array(J * 9);
  const cm = frame.units.metresPerUnit * 100;
  const F = take.frameCount;
  for (let f = 0; f < F; f++) {
    poseFrame(plan, take.values, f, pos, rot);
    let p = 0;
    for (let a = 0; a < n; a++) {
      const ia = idx[a]! * 3;
      for (let b = a + 1; b < n; b++, p++) {
        const ib = idx[b]! * 3;
        const dx = pos[ia]! - pos[ib]!, dy = pos[ia + 1]! - pos[ib + 1]!, dz = pos[ia + 2]! - pos[ib + 2]!;
        const d = Math.sqrt(dx * dx + dy * dy + dz * dz) * cm;
        // Welford's running mean and sum of squared deviations.
        const delta = d - mean[p]!;
        mean[p] = mean[p]! + delta / (f + 1);
        m2[p] = m2[p]! + delta * (d - mean[p]!);
      }
    }
  }
  const pairs: ViewPairs['pairs'] = [];
  let min = Infinity, max = -Infinity, p = 0;
  for (let a = 0; a < n; a++)
    for (let b = a + 1; b < n; b++, p++) {
      const value = F > 0 ? Math.sqrt(m2[p]! / F) : 0;
      min = Math.min(min, value);
      max = Math.max(max, value);
      pairs.push({ a: idx[a]!, b: idx[b]!, label: `${roles[a]}–${roles[b]}`, value: Math.round(value * 1000) / 1000 });
    }
  return {
    measure: 'pair distance spread',
    description: 'Standard deviation of the distance between two role joints over the whole take (every recorded frame). A plain geometric measure, not the coupling model.',
    unit: 'cm',
    min: pairs.length ? Math.round(min * 1000) / 1000 : 0,
    max: pairs.length ? Math.round(max * 1000) / 1000 : 0,
    pairs,
  };
}
