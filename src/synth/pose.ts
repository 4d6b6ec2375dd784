// One instant of the walker: the local rotation of every joint and the root position, internal frame, metres.
import type { WalkerModel } from './model.js';
import { copy3, mulT3o } from './rot3.js';
import { SS_STANCE } from './schedule.js';
import { PelvisFrame, pelvisPose, stanceLeg } from './stance.js';
import { swingLeg } from './swing.js';
import { upperBody } from './upper.js';

const legW = new Float64Array(36);

/** Writes the local rotations (joint-key order, 9 each) and root position at time t; the pelvis frame is kept in pf. */
export function poseAt(m: WalkerModel, t: number, pf: PelvisFrame, locals: Float64Array, root: Float64Array): void {
  pelvisPose(m, t, pf);
  copy3(pf.R, 0, locals, 0);
  root[0] = pf.P[0]!; root[1] = pf.P[1]!; root[2] = pf.P[2]!;
  for (let s = 0; s < 2; s++) {
    if (pf.ss[s * 6 + SS_STANCE]! > 0) stanceLeg(m, s, pf, legW);
    else swingLeg(m, s, pf, legW);
    const o = (1 + 4 * s) * 9;
    mulT3o(pf.R, 0, legW, 0, locals, o);
    mulT3o(legW, 0, legW, 9, locals, o + 9);
    mulT3o(legW, 9, legW, 18, locals, o + 18);
    mulT3o(legW, 18, legW, 27, locals, o + 27);
  }
  upperBody(m, pf, t, locals);
}

export { PelvisFrame };
