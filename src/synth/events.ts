// Gait events measured from the written take's own geometry: initial contact when the heel point reaches the
// floor after a swing, toe-off when the last contact point (heel, toe joint, toe tip) leaves it.
import type { Take } from '../bvh/take.js';
import { planFk, poseFrame } from '../skeleton/fk.js';
import type { BuiltSkeleton } from './skeleton.js';

/** Contact events of one side, as frame indices. */
export interface SideEvents {
  initialContact: number[];
  toeOff: number[];
}

/** Inputs of the event finder, all in the take's own units and axes. */
export interface EventSpec {
  skel: BuiltSkeleton;
  /** Key slot (JOINT_KEYS order) of each side's ankle and toe joint: [left, right]. */
  ankleKey: [number, number];
  toeKey: [number, number];
  /** Heel point minus ankle in the rest pose (file units and axes). */
  heelRest: [number, number, number];
  /** Up-axis index (1 = Y, 2 = Z) and file units per metre. */
  up: number;
  unitsPerMetre: number;
  /** Height above the floor (metres) at or below which a point counts as touching. */
  toleranceM: number;
}

/**
 * Returns each side's events and the per-frame heights (metres) of heel, toe joint and tip (frames x 2 sides x 3),
 * found from forward kinematics of the take.
 */
export function findEvents(take: Take, spec: EventSpec): { left: SideEvents; right: SideEvents; heights: Float64Array } {
  const plan = planFk(take);
  const J = plan.jointCount;
  const pos = new Float64Array(J * 3), rot = new Float64Array(J * 9);
  const F = take.frameCount;
  const heights = new Float64Array(F * 6);
  const out: SideEvents[] = [{ initialContact: [], toeOff: [] }, { initialContact: [], toeOff: [] }];
  const state = [0, 0]; // 0 unknown, 1 stance, 2 swing
  const [hx, hy, hz] = spec.heelRest;
  const u = spec.up;
  const tol = spec.toleranceM;
  for (let f = 0; f < F; f++) {
    poseFrame(plan, take.values, f, pos, rot, 0);
    for (let s = 0; s < 2; s++) {
      const a = spec.skel.jointIndex[spec.ankleKey[s]!]!;
      const t = spec.skel.jointIndex[spec.toeKey[s]!]!;
      const e = spec.skel.endIndex[spec.toeKey[s]!]!;
      const r = a * 9;
      const heel = pos[a * 3 + u]! + rot[r + u * 3]! * hx + rot[r + u * 3 + 1]! * hy + rot[r + u * 3 + 2]! * hz;
      const h0 = heel / spec.unitsPerMetre;
      const h1 = pos[t * 3 + u]! / spec.unitsPerMetre;
      const h2 = pos[e * 3 + u]! / spec.unitsPerMetre;
      heights[f * 6 + s * 3] = h0;
      heights[f * 6 + s * 3 + 1] = h1;
      heights[f * 6 + s * 3 + 2] = h2;
      const anyDown = h0 <= tol || h1 <= tol || h2 <= tol;
      if (state[s] === 0) state[s] = anyDown ? 1 : 2;
      else if (state[s] === 2 && h0 <= tol) {
        out[s]!.initialContact.push(f);
        state[s] = 1;
      } else if (state[s] === 1 && !anyDown) {
        out[s]!.toeOff.push(f);
        state[s] = 2;
      }
    }
  }
  return { left: out[0]!, right: out[1]!, heights };
}

/** Returns the gait phase (0..1 from this side's contact) of every frame; null before the first or after the last contact. */
export function phaseOfFrames(frameCount: number, contacts: readonly number[]): (number | null)[] {
  const phase: (number | null)[] = new Array(frameCount).fill(null);
  for (let c = 0; c + 1 < contacts.length; c++) {
    const a = contacts[c]!, b = contacts[c + 1]!;
    for (let f = a; f < b; f++) phase[f] = Math.round(((f - a) / (b - a)) * 1e4) / 1e4;
  }
  return phase;
}
