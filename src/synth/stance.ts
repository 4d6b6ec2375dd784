// Stance: the foot rocker (heel, foot-flat, toe joint, toe tip) fixed to its footprint, the pelvis pose that
// keeps the stance knees on their normative curve, and the stance leg solved to the planted foot.
import { KNEE_FLEXION, evalCycle, smoothstep, warpPhase } from './curves.js';
import { legReach, solveLeg } from './legik.js';
import type { WalkerModel } from './model.js';
import { distanceAt, pathAt } from './path.js';
import { apply3o, setEuler, setRy } from './rot3.js';
import { SS_PHASE, SS_STANCE, SS_STANCE_SHARE, SS_STRIDE, SS_SWING, sideState } from './schedule.js';

const DEG = Math.PI / 180;

/** One time instant of the walker's trunk base: pelvis pose, both sides' states and load shares. */
export class PelvisFrame {
  readonly P = new Float64Array(3);
  readonly R = new Float64Array(9);
  /** Side states (see sideState), left then right, 6 slots each. */
  readonly ss = new Float64Array(12);
  /** Load share of each side, summing to 1 while any foot is down. */
  readonly w = new Float64Array(2);
  /** Path heading (radians) and the pelvic rotation about it (radians). */
  heading = 0;
  rotation = 0;
  obliquity = 0;
}

/** Returns the designed stance foot pitch (radians, heel up +) at normative phase q for an ankle range scale. */
export function designedFootPitch(q: number, ankleScale: number): number {
  if (q < 0.08) return -14 * DEG * ankleScale * (1 - smoothstep(q / 0.08));
  if (q < 0.3) return 0;
  const x = Math.min(1, (q - 0.3) / 0.32);
  return 50 * DEG * (0.6 + 0.4 * ankleScale) * x * x;
}

const TOE_ROLL = 0.52; // normative phase at which the roll onto the toe tip begins (own tuning)
const TOE_PITCH_AT_TOE_OFF = 25 * DEG;

/** Returns the designed toe-segment pitch (radians, rear end up +) at normative phase q: the roll onto the toe tip. */
export function designedToePitch(q: number): number {
  if (q < TOE_ROLL) return 0;
  const x = Math.min(1, (q - TOE_ROLL) / (0.62 - TOE_ROLL));
  return TOE_PITCH_AT_TOE_OFF * x * x;
}

const rYaw = new Float64Array(9);
const vTmp = new Float64Array(3);

/**
 * Writes the ankle position of footprint `i` (side*count+stride) rolled to foot pitch `phi` and toe pitch `chi`,
 * plus the foot and toe world rotations; the rolling contact point stays on its footprint.
 */
export function footPose(m: WalkerModel, i: number, phi: number, chi: number, outA: Float64Array, ao: number, rf: Float64Array, fo: number, rt: Float64Array, tto: number): void {
  const psi = m.sc.footPsi[i]!;
  const fx = m.sc.ankleX[i]!, fy = m.seg.ankleHeight, fz = m.sc.ankleZ[i]!;
  setRy(rYaw, 0, psi);
  setEuler(rf, fo, 1, psi, 0, phi, 0, 0);
  // On the heel the foot and toes move as one; from foot-flat on the toes stay down until the roll onto the tip.
  setEuler(rt, tto, 1, psi, 0, phi < 0 ? phi : chi, 0, 0);
  // Anchor of the pivot (on the floor) minus the rotated pivot vector.
  if (phi < 0) {
    apply3o(rYaw, 0, m.heelVec, 0, vTmp, 0);
    const hx = fx + vTmp[0]!, hy = fy + vTmp[1]!, hz = fz + vTmp[2]!;
    apply3o(rf, fo, m.heelVec, 0, vTmp, 0);
    outA[ao] = hx - vTmp[0]!; outA[ao + 1] = hy - vTmp[1]!; outA[ao + 2] = hz - vTmp[2]!;
    return;
  }
  apply3o(rYaw, 0, m.mtpVec, 0, vTmp, 0);
  let mx = fx + vTmp[0]!, my = fy + vTmp[1]!, mz = fz + vTmp[2]!;
  if (chi > 0) {
    apply3o(rYaw, 0, m.tipVec, 0, vTmp, 0);
    const tx = mx + vTmp[0]!, ty = my + vTmp[1]!, tz = mz + vTmp[2]!;
    apply3o(rt, tto, m.tipVec, 0, vTmp, 0);
    mx = tx - vTmp[0]!; my = ty - vTmp[1]!; mz = tz - vTmp[2]!;
  }
  apply3o(rf, fo, m.mtpVec, 0, vTmp, 0);
  outA[ao] = mx - vTmp[0]!; outA[ao + 1] = my - vTmp[1]!; outA[ao + 2] = mz - vTmp[2]!;
}

/** Returns the nominal knee flexion (radians) of side s at normative phase q. */
export function nominalKnee(m: WalkerModel, s: number, q: number): number {
  return Math.max(1, m.sides[s]!.kneeScale * evalCycle(KNEE_FLEXION, q)) * DEG;
}

const pathTmp = new Float64Array(3);
const hipTmp = new Float64Array(3);
const ankTmp = new Float64Array(3);
const rfTmp = new Float64Array(9);
const rtTmp = new Float64Array(9);

/** Writes the pelvis pose and both sides' states and load shares at time t into `pf`. */
export function pelvisPose(m: WalkerModel, t: number, pf: PelvisFrame): void {
  const { sc, sides, o } = m;
  sideState(sc, 0, t, pf.ss.subarray(0, 6));
  sideState(sc, 1, t, pf.ss.subarray(6, 12));
  const pR = pf.ss[6 + SS_PHASE]!;
  const sL = pf.ss[SS_SWING]!, sR = pf.ss[6 + SS_SWING]!;
  const s = distanceAt(m.dist, t);
  pathAt(m.path, s, pathTmp, 0);
  const psi = pathTmp[2]!;
  // Pelvic rotation (right side forward +) peaks at right contact; obliquity (left up +) raises the stance side
  // after loading; tilt (anterior +) ~10° with two small waves a cycle — shapes recalled from memory (Perry 2010).
  const rotAmp = 4 * 0.5 * (sides[0]!.pelvisRotationGain + sides[1]!.pelvisRotationGain) * (o.speed / 1.3);
  const rot = rotAmp * Math.cos(2 * Math.PI * pR);
  let obl = -4 * Math.sin(2 * Math.PI * (pR + 0.05));
  obl += sides[0]!.hipHikeDeg * Math.sin(Math.PI * sL) - sides[1]!.hipHikeDeg * Math.sin(Math.PI * sR);
  const tilt = 10 + 1.5 * Math.cos(4 * Math.PI * (pR - 0.45));
  pf.heading = psi;
  pf.rotation = rot * DEG;
  pf.obliquity = obl * DEG;
  setEuler(pf.R, 0, 1, psi + rot * DEG, 2, obl * DEG, 0, tilt * DEG);
  // Lateral sway toward the stance side, ~2 cm each way (common practice).
  const sway = -0.022 * (o.height / 1.75) * Math.sin(2 * Math.PI * (pR - 0.05));
  pf.P[0] = pathTmp[0]! + sway * Math.cos(psi);
  pf.P[2] = pathTmp[1]! - sway * Math.sin(psi);
  loadShares(m, t, pf);
  // Height: each stance leg proposes the root height that puts its knee on the normative curve with the
  // designed foot roll; the proposals are blended by load share.
  let wsum = 0, ysum = 0, leadY = 0, leadW = 1;
  for (let side = 0; side < 2; side++) {
    const w = pf.w[side]!;
    if (w <= 0 && pf.ss[side * 6 + SS_STANCE]! <= 0) continue;
    const b = side * 6;
    const k = pf.ss[b + SS_STRIDE]!;
    const q = warpPhase(pf.ss[b + SS_PHASE]!, pf.ss[b + SS_STANCE_SHARE]!);
    footPose(m, side * sc.count + k, designedFootPitch(q, sides[side]!.ankleScale), designedToePitch(q), ankTmp, 0, rfTmp, 0, rtTmp, 0);
    apply3o(pf.R, 0, m.hipOffset, side * 3, hipTmp, 0);
    const hx = pf.P[0]! + hipTmp[0]! - ankTmp[0]!, hz = pf.P[2]! + hipTmp[2]! - ankTmp[2]!;
    const d = legReach(m.seg.thigh, m.seg.shank, nominalKnee(m, side, q));
    const y = ankTmp[1]! + Math.sqrt(Math.max(0, d * d - hx * hx - hz * hz)) - hipTmp[1]!;
    wsum += w;
    ysum += w * y;
    if (w < 1 && q < 0.3) { leadY = y; leadW = w; }
  }
  let y = wsum > 0 ? ysum / wsum : m.rootHeight - 0.02;
  // A foot just down must be reachable: while it takes the load, the pelvis may not stay above its reach.
  if (leadW < 1) y -= (1 - leadW) * softRelu(y - leadY, 0.004);
  pf.P[1] = y;
}

/** Returns 0 for x ≤ 0, x²/(2ε) up to ε, then x − ε/2: a once-differentiable ramp. */
function softRelu(x: number, eps: number): number {
  return x <= 0 ? 0 : x < eps ? (x * x) / (2 * eps) : x - eps / 2;
}

/** Writes the load share of each side into pf.w from the side states already in pf.ss. */
function loadShares(m: WalkerModel, t: number, pf: PelvisFrame): void {
  const { sc } = m;
  const stL = pf.ss[SS_STANCE]! > 0, stR = pf.ss[6 + SS_STANCE]! > 0;
  if (stL && !stR) { pf.w[0] = 1; pf.w[1] = 0; return; }
  if (stR && !stL) { pf.w[0] = 0; pf.w[1] = 1; return; }
  if (!stL && !stR) { pf.w[0] = 0; pf.w[1] = 0; return; }
  // Double support: the later contact is the leading foot; weight passes to it until the trailing toe-off.
  const iL = pf.ss[SS_STRIDE]!, iR = pf.ss[6 + SS_STRIDE]!;
  const icL = sc.ic[iL]!, icR = sc.ic[sc.count + iR]!;
  const lead = icL > icR ? 0 : 1;
  const icLead = lead === 0 ? icL : icR;
  const toTrail = lead === 0 ? sc.to[sc.count + iR]! : sc.to[iL]!;
  const x = smoothstep((t - icLead) / Math.max(1e-6, toTrail - icLead));
  pf.w[lead] = x;
  pf.w[1 - lead] = 1 - x;
}

const hipW = new Float64Array(3);
const ankW = new Float64Array(3);
const poleW = new Float64Array(3);

/**
 * Writes the stance leg of side s at the pelvis frame `pf` (time t) as world rotations of thigh, shank, foot and
 * toe (9 each at the given offsets of `out`: 0, 9, 18, 27); the foot stays on its footprint, the knee follows
 * the normative curve while the leg can reach.
 */
export function stanceLeg(m: WalkerModel, s: number, pf: PelvisFrame, out: Float64Array): void {
  const b = s * 6;
  const k = pf.ss[b + SS_STRIDE]!;
  const i = s * m.sc.count + k;
  const q = warpPhase(pf.ss[b + SS_PHASE]!, pf.ss[b + SS_STANCE_SHARE]!);
  const ankleScale = m.sides[s]!.ankleScale;
  const chi = designedToePitch(q);
  apply3o(pf.R, 0, m.hipOffset, s * 3, hipW, 0);
  hipW[0] += pf.P[0]!; hipW[1] += pf.P[1]!; hipW[2] += pf.P[2]!;
  const d = legReach(m.seg.thigh, m.seg.shank, nominalKnee(m, s, q));
  let phi = designedFootPitch(q, ankleScale);
  if (pf.w[s]! < 1) {
    // Not carrying the whole load: roll the foot so the knee stays on its curve (loading: about the heel;
    // pre-swing: about the toe joint or tip).
    const loading = q < 0.3;
    let lo = loading ? -40 * DEG : 0, hi = loading ? 0 : 85 * DEG;
    const flo = reachError(m, i, lo, chi, d, out), fhi = reachError(m, i, hi, chi, d, out);
    if (flo * fhi > 0) phi = Math.abs(flo) < Math.abs(fhi) ? lo : hi;
    else {
      let fl = flo;
      for (let it = 0; it < 48; it++) {
        const mid = 0.5 * (lo + hi);
        const fm = reachError(m, i, mid, chi, d, out);
        if ((fm < 0) === (fl < 0)) { lo = mid; fl = fm; } else hi = mid;
      }
      phi = 0.5 * (lo + hi);
    }
  }
  footPose(m, i, phi, chi, ankW, 0, out, 18, out, 27);
  // Bend the knee toward the foot's heading.
  const psi = m.sc.footPsi[i]!;
  poleW[0] = Math.sin(psi); poleW[1] = 0; poleW[2] = Math.cos(psi);
  solveLeg(hipW, 0, ankW, 0, poleW, 0, m.seg.thigh, m.seg.shank, out, 0, out, 9, ankTmp, 0);
}

/** Returns |hip − ankle| − d for footprint i rolled to pitch phi (hip in hipW); uses out[18..36] as scratch. */
function reachError(m: WalkerModel, i: number, phi: number, chi: number, d: number, out: Float64Array): number {
  footPose(m, i, phi, chi, ankW, 0, out, 18, out, 27);
  const dx = hipW[0]! - ankW[0]!, dy = hipW[1]! - ankW[1]!, dz = hipW[2]! - ankW[2]!;
  return Math.sqrt(dx * dx + dy * dy + dz * dz) - d;
}
