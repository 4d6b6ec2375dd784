// Gait Variable Scores and the Gait Profile Score (Baker et al. 2009): the root mean square difference of a
// take's mean curve from the reference mean over the cycle, per curve (GVS), and the root mean square of the
// GVSs over the curves of a side or of both sides (GPS). With the project's 8 curves per side (no hip
// rotation) the GPS covers 8 curves a side, not the paper's 9.
import type { CurveNorm } from './format.js';

/** Minimal clinically important difference of the GPS, degrees (Baker et al. 2012; recalled from memory). */
export const GPS_MCID_DEG = 1.6;

/** Returns the RMS over the samples of (take − reference), skipping samples where either is not finite; NaN if none. */
export function gaitVariableScore(take: ArrayLike<number>, reference: ArrayLike<number>): number {
  let n = 0, ss = 0;
  const len = Math.min(take.length, reference.length);
  for (let i = 0; i < len; i++) {
    const d = take[i]! - reference[i]!;
    if (Number.isFinite(d)) { n++; ss += d * d; }
  }
  return n ? Math.sqrt(ss / n) : NaN;
}

/** Returns the RMS of the finite scores (the GPS of those curves); NaN if none. */
export function profileScore(scores: ArrayLike<number>): number {
  return gaitVariableScore(scores, new Float64Array(scores.length));
}

/** Gait variable scores per curve and side, and the profile score per side and overall. */
export interface ProfileScores {
  gvs: Record<string, { left: number; right: number }>;
  gps: { left: number; right: number; overall: number };
}

/** Returns the GVS of each curve and side and the GPS of each side and overall, against the reference curves. */
export function profileScores(
  means: { left: Record<string, ArrayLike<number>>; right: Record<string, ArrayLike<number>> },
  curves: Record<string, CurveNorm>,
  angles: readonly string[],
): ProfileScores {
  const gvs: ProfileScores['gvs'] = {};
  const L: number[] = [], R: number[] = [];
  for (const a of angles) {
    const ref = curves[a]!.mean;
    const l = gaitVariableScore(means.left[a]!, ref), r = gaitVariableScore(means.right[a]!, ref);
    gvs[a] = { left: l, right: r };
    L.push(l);
    R.push(r);
  }
  return { gvs, gps: { left: profileScore(L), right: profileScore(R), overall: profileScore([...L, ...R]) } };
}

/** Returns the q-quantile (0..1) of the finite values by linear interpolation between order statistics (Hyndman and Fan 1996, type 7); NaN if none. */
export function quantile(values: ArrayLike<number>, q: number): number {
  const xs = Array.from(values).filter(Number.isFinite).sort((a, b) => a - b);
  if (!xs.length) return NaN;
  const h = (xs.length - 1) * q, lo = Math.floor(h), hi = Math.min(xs.length - 1, lo + 1);
  return xs[lo]! + (h - lo) * (xs[hi]! - xs[lo]!);
}
