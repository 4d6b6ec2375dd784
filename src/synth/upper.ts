// Upper body: trunk counter-rotation against the pelvis, a steady head, and arm swing opposite the legs.
import type { WalkerModel } from './model.js';
import { matrixToEuler, mulT3o, setEuler } from './rot3.js';
import { SS_PHASE, SS_STANCE, SS_STANCE_SHARE, SS_STRIDE } from './schedule.js';
import type { PelvisFrame } from './stance.js';

const DEG = Math.PI / 180;

/** Joint-key slots of the upper body in the locals array (JOINT_KEYS order). */
const SPINE = 9, CHEST = 10, NECK = 11, HEAD = 12, L_CLAV = 13, R_CLAV = 17;

const thorax = new Float64Array(9);
const head = new Float64Array(9);
const rel = new Float64Array(9);
const half = new Float64Array(9);
const e3 = new Float64Array(3);

/** Returns the trunk's forward lurch (radians) at time t from any stumbling swing that has just happened. */
function stumbleLurch(m: WalkerModel, pf: PelvisFrame, t: number): number {
  let lurch = 0;
  for (let s = 0; s < 2; s++) {
    const k = pf.ss[s * 6 + SS_STRIDE]!;
    for (let kk = Math.max(0, k - 1); kk <= k; kk++) {
      const i = s * m.sc.count + kk;
      const sev = m.sc.stumble[i]!;
      if (sev <= 0) continue;
      const t0 = m.sc.to[i]!, t1 = m.sc.ic[i + 1]! + 0.4;
      if (t >= t0 && t <= t1) lurch += 10 * sev * Math.sin((Math.PI * (t - t0)) / (t1 - t0));
    }
  }
  return lurch * DEG;
}

/** Writes `total` split into two equal-angle halves: `first` then `second` with first · second = total. */
function splitHalves(total: Float64Array, first: Float64Array, fo: number, second: Float64Array, so: number): void {
  matrixToEuler(total, 0, 0, 2, 1, e3, 0);
  setEuler(half, 0, 0, 0.5 * e3[0]!, 2, 0.5 * e3[1]!, 1, 0.5 * e3[2]!);
  for (let k = 0; k < 9; k++) first[fo + k] = half[k]!;
  mulT3o(half, 0, total, 0, second, so);
}

/** Writes the local rotations of the spine, chest, neck, head and both arms at time t into `locals` (key order). */
export function upperBody(m: WalkerModel, pf: PelvisFrame, t: number, locals: Float64Array): void {
  const { sides } = m;
  // Thorax counter-rotates against the pelvis (antiphase, a little smaller) and leans slightly forward.
  let roll = -0.4 * pf.obliquity;
  for (let s = 0; s < 2; s++) {
    const lean = sides[s]!.trunkLeanDeg;
    if (lean <= 0 || pf.ss[s * 6 + SS_STANCE]! <= 0) continue;
    const bump = Math.sin((Math.PI * pf.ss[s * 6 + SS_PHASE]!) / pf.ss[s * 6 + SS_STANCE_SHARE]!);
    roll += (s === 0 ? -1 : 1) * lean * DEG * bump; // lean over the short-stance side
  }
  setEuler(thorax, 0, 1, pf.heading - 0.8 * pf.rotation, 2, roll, 0, 3 * DEG + stumbleLurch(m, pf, t));
  mulT3o(pf.R, 0, thorax, 0, rel, 0);
  splitHalves(rel, locals, SPINE * 9, locals, CHEST * 9);
  // Head stays on the path heading, level.
  setEuler(head, 0, 1, pf.heading - 0.1 * pf.rotation, 2, 0, 0, 2 * DEG);
  mulT3o(thorax, 0, head, 0, rel, 0);
  splitHalves(rel, locals, NECK * 9, locals, HEAD * 9);
  // Arms: the shoulder extends most at its own leg's contact (arm opposite the leg), elbow flexes as it comes forward.
  for (let s = 0; s < 2; s++) {
    const p = sides[s]!;
    const ph = pf.ss[s * 6 + SS_PHASE]!;
    const sx = s === 0 ? 1 : -1;
    const c = Math.cos(2 * Math.PI * (ph - p.armLag));
    const flex = -4 - p.armAmplitude * c;
    const elbow = 20 - p.elbowAmplitude * c;
    const base = (s === 0 ? L_CLAV : R_CLAV) * 9;
    setEuler(locals, base, 1, sx * 2 * c * DEG * (p.armAmplitude / 16), 2, 0, 0, 0);
    setEuler(locals, base + 9, 0, -flex * DEG, 2, sx * 7 * DEG, 1, 0);
    setEuler(locals, base + 18, 0, -elbow * DEG, 2, 0, 1, 0);
    setEuler(locals, base + 27, 0, -6 * DEG, 2, sx * 2 * DEG, 1, 0);
  }
}
