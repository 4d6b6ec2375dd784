// Swing: normative joint curves (with impairment scaling, compensation and stumble perturbation), blended in
// angle space from the leg's actual toe-off pose to its actual next contact pose, kept clear of the floor.
import { ANKLE_DORSIFLEXION, HIP_FLEXION, KNEE_FLEXION, TOE_EXTENSION, evalCycle, smoothstep, warpPhase } from './curves.js';
import { solveLeg } from './legik.js';
import type { WalkerModel } from './model.js';
import { apply3o, copy3, matrixToEuler, mul3o, mulT3o, postRot, setEuler } from './rot3.js';
import { SS_PHASE, SS_STANCE_SHARE, SS_STRIDE, SS_SWING } from './schedule.js';
import { PelvisFrame, pelvisPose, stanceLeg } from './stance.js';

const DEG = Math.PI / 180;

/** Share of the swing a stumble perturbs. */
const STUMBLE_SPAN = 0.65;

/** Leg angle vector slots: hip X, Z, Y (XZY Euler of the hip's local rotation), knee, ankle X, Z, Y, toe. */
export const LEG_ANGLES = 8;

/** Writes the nominal leg angles (radians) of side s at normative phase q; sigma is the swing fraction or -1. */
export function nominalAngles(m: WalkerModel, s: number, q: number, sigma: number, stumble: number, out: Float64Array, o: number): void {
  const p = m.sides[s]!;
  const bump = sigma >= 0 ? Math.sin(Math.PI * sigma) : 0;
  const sx = s === 0 ? 1 : -1; // left abduction is +Z, right abduction −Z
  const hip = 10 + p.hipScale * (evalCycle(HIP_FLEXION, q) - 10) + p.steppageDeg * bump;
  // Hip adduction ~5° in stance, abduction ~5° in swing (recalled from memory, Perry 2010).
  const add = 5 * Math.sin(2 * Math.PI * (q + 0.05));
  let knee = p.kneeScale * evalCycle(KNEE_FLEXION, q) + 1.2 * p.steppageDeg * bump;
  let hipX = -hip;
  if (stumble > 0 && sigma >= 0) {
    // A caught swing: knee and hip flexion held back through the first two thirds (the toe meets the floor),
    // then the normal approach to contact.
    const w = sigma < STUMBLE_SPAN ? Math.sin((Math.PI * sigma) / STUMBLE_SPAN) : 0;
    knee -= 22 * stumble * w;
    hipX += 8 * stumble * w;
  }
  out[o] = hipX * DEG;
  out[o + 1] = (-sx * add + sx * p.circumductionDeg * bump) * DEG;
  out[o + 2] = 0;
  out[o + 3] = Math.max(0.5, knee) * DEG;
  out[o + 4] = -p.ankleScale * evalCycle(ANKLE_DORSIFLEXION, q) * DEG;
  out[o + 5] = 0;
  out[o + 6] = 0;
  out[o + 7] = -evalCycle(TOE_EXTENSION, q) * DEG;
}

const legW = new Float64Array(36);
const loc = new Float64Array(9);
const e3 = new Float64Array(3);

/** Writes the leg angles of world leg rotations `w` (thigh, shank, foot, toe at 0, 9, 18, 27) under pelvis R. */
export function anglesFromWorld(R: Float64Array, w: Float64Array, out: Float64Array, o: number): void {
  mulT3o(R, 0, w, 0, loc, 0);
  matrixToEuler(loc, 0, 0, 2, 1, e3, 0);
  out[o] = e3[0]!; out[o + 1] = e3[1]!; out[o + 2] = e3[2]!;
  mulT3o(w, 0, w, 9, loc, 0);
  out[o + 3] = Math.atan2(loc[7]!, loc[8]!);
  mulT3o(w, 9, w, 18, loc, 0);
  matrixToEuler(loc, 0, 0, 2, 1, e3, 0);
  out[o + 4] = e3[0]!; out[o + 5] = e3[1]!; out[o + 6] = e3[2]!;
  mulT3o(w, 18, w, 27, loc, 0);
  out[o + 7] = Math.atan2(loc[7]!, loc[8]!);
}

const pfTmp = new PelvisFrame();
const nomTmp = new Float64Array(LEG_ANGLES);
const actTmp = new Float64Array(LEG_ANGLES);

const act0 = new Float64Array(LEG_ANGLES);
const nom1 = new Float64Array(LEG_ANGLES);
const RATE_STEP = 0.004; // s, for the angle rates at toe-off
const RATE_FADE = 0.35; // share of swing over which the toe-off rate mismatch fades

/** Writes the actual stance leg angles of side s at time t into `out`. */
function stanceAnglesAt(m: WalkerModel, s: number, t: number, out: Float64Array): void {
  pelvisPose(m, t, pfTmp);
  stanceLeg(m, s, pfTmp, legW);
  anglesFromWorld(pfTmp.R, legW, out, 0);
}

/**
 * Returns the offset into deltaTo/deltaIc/deltaToRate of footprint i, computing on first use the corrections
 * (actual minus nominal) at its toe-off and contact, and the angle-rate mismatch at toe-off.
 */
function deltas(m: WalkerModel, s: number, i: number): number {
  const o = i * LEG_ANGLES;
  if (!Number.isNaN(m.deltaTo[o]!)) return o;
  const { sc } = m;
  const ic = sc.ic[i]!, to = sc.to[i]!, next = sc.ic[i + 1]!;
  const T = next - ic, st = (to - ic) / T;
  // Toe-off: the pose just inside stance and a little before; the nominal swing at its start and a step in.
  stanceAnglesAt(m, s, to - 1e-9, actTmp);
  stanceAnglesAt(m, s, to - RATE_STEP, act0);
  nominalAngles(m, s, warpPhase(st, st), 0, sc.stumble[i]!, nomTmp, 0);
  nominalAngles(m, s, warpPhase(st + RATE_STEP / T, st), RATE_STEP / (next - to), sc.stumble[i]!, nom1, 0);
  for (let a = 0; a < LEG_ANGLES; a++) {
    m.deltaTo[o + a] = wrap(actTmp[a]! - nomTmp[a]!);
    m.deltaToRate[o + a] = (wrap(actTmp[a]! - act0[a]!) - (nom1[a]! - nomTmp[a]!)) / RATE_STEP;
  }
  stanceAnglesAt(m, s, ic, actTmp);
  nominalAngles(m, s, 0, -1, 0, nomTmp, 0);
  for (let a = 0; a < LEG_ANGLES; a++) m.deltaIc[o + a] = wrap(actTmp[a]! - nomTmp[a]!);
  return o;
}

function wrap(a: number): number {
  return a - 2 * Math.PI * Math.round(a / (2 * Math.PI));
}

const ang = new Float64Array(LEG_ANGLES);
const hipP = new Float64Array(3);
const kneeP = new Float64Array(3);
const ankP = new Float64Array(3);
const pt = new Float64Array(3);
const pole = new Float64Array(3);
const tgt = new Float64Array(3);

/** Writes the swing leg of side s at pelvis frame `pf` as world rotations (thigh, shank, foot, toe at 0, 9, 18, 27). */
export function swingLeg(m: WalkerModel, s: number, pf: PelvisFrame, out: Float64Array): void {
  const b = s * 6;
  const k = pf.ss[b + SS_STRIDE]!;
  const i = s * m.sc.count + k;
  const sigma = pf.ss[b + SS_SWING]!;
  const q = warpPhase(pf.ss[b + SS_PHASE]!, pf.ss[b + SS_STANCE_SHARE]!);
  const stumble = m.sc.stumble[i]!;
  nominalAngles(m, s, q, sigma, stumble, ang, 0);
  const nominalAx = ang[4]!;
  const oTo = deltas(m, s, i);
  const oIc = deltas(m, s, i + 1);
  const bl = smoothstep(sigma);
  // The toe-off rate mismatch fades out over the first part of swing, so the leg leaves the floor smoothly.
  const tau = sigma * (m.sc.ic[i + 1]! - m.sc.to[i]!);
  const g = sigma < RATE_FADE ? (1 - sigma / RATE_FADE) ** 2 : 0;
  for (let a = 0; a < LEG_ANGLES; a++)
    ang[a] = ang[a]! + (1 - bl) * (m.deltaTo[oTo + a]! + m.deltaToRate[oTo + a]! * tau * g) + bl * m.deltaIc[oIc + a]!;
  // Clearance floor: 1 cm through most of swing, rising fast after toe-off and easing to 0 at contact;
  // a stumbling swing drops to the floor around its catch.
  let floor = Math.min(0.1 * sigma, 0.01, 0.1 * (1 - sigma));
  if (stumble > 0 && sigma > 0.1 && sigma < 0.5) floor *= 1 - Math.min(1, stumble) * Math.sin((Math.PI * (sigma - 0.1)) / 0.4) ** 2;
  apply3o(pf.R, 0, m.hipOffset, s * 3, hipP, 0);
  hipP[0] += pf.P[0]!; hipP[1] += pf.P[1]!; hipP[2] += pf.P[2]!;
  // First lift a low toe with the ankle (dorsiflexion, up to 15° more), as the dorsiflexors do; a low heel,
  // or what is left, is lifted by raising the ankle through the knee and hip.
  let low = 0, lowIsHeel = false, lever = 0;
  for (let it = 0; it < 4; it++) {
    swingFk(m, pf, out);
    apply3o(out, 18, m.heelVec, 0, pt, 0);
    low = ankP[1]! + pt[1]!;
    lowIsHeel = true;
    lever = 0;
    apply3o(out, 18, m.mtpVec, 0, pt, 0);
    const mtpY = ankP[1]! + pt[1]!;
    const mtpLever = Math.hypot(pt[0]!, pt[2]!);
    if (mtpY < low) { low = mtpY; lowIsHeel = false; lever = mtpLever; }
    apply3o(out, 27, m.tipVec, 0, tgt, 0);
    if (mtpY + tgt[1]! < low) { low = mtpY + tgt[1]!; lowIsHeel = false; lever = Math.hypot(pt[0]! + tgt[0]!, pt[2]! + tgt[2]!); }
    if (low >= floor || lowIsHeel || it === 3) break;
    const room = -15 * DEG - (ang[4]! - nominalAx);
    const step = Math.max(room, -(floor - low) / Math.max(0.05, lever));
    if (step > -1e-6) break;
    ang[4] = ang[4]! + step;
  }
  if (low < floor) {
    tgt[0] = ankP[0]!; tgt[1] = ankP[1]! + (floor - low); tgt[2] = ankP[2]!;
    pole[0] = out[2]!; pole[1] = out[5]!; pole[2] = out[8]!;
    solveLeg(hipP, 0, tgt, 0, pole, 0, m.seg.thigh, m.seg.shank, out, 0, out, 9, ankP, 0);
  }
}

/** Writes the world rotations of the swing leg from the angles in `ang` (hip in hipP), and the ankle into ankP. */
function swingFk(m: WalkerModel, pf: PelvisFrame, out: Float64Array): void {
  setEuler(loc, 0, 0, ang[0]!, 2, ang[1]!, 1, ang[2]!);
  mul3o(pf.R, 0, loc, 0, out, 0);
  copy3(out, 0, out, 9);
  postRot(out, 9, 0, ang[3]!);
  setEuler(loc, 0, 0, ang[4]!, 2, ang[5]!, 1, ang[6]!);
  mul3o(out, 9, loc, 0, out, 18);
  copy3(out, 18, out, 27);
  postRot(out, 27, 0, ang[7]!);
  pt[0] = 0; pt[1] = -m.seg.thigh; pt[2] = 0;
  apply3o(out, 0, pt, 0, kneeP, 0);
  kneeP[0] += hipP[0]!; kneeP[1] += hipP[1]!; kneeP[2] += hipP[2]!;
  pt[1] = -m.seg.shank;
  apply3o(out, 9, pt, 0, ankP, 0);
  ankP[0] += kneeP[0]!; ankP[1] += kneeP[1]!; ankP[2] += kneeP[2]!;
}
