// Left/right asymmetry of the classic coupling measures: each pair on the left against its mirror on the right
// (hip-knee with hip-knee, knee-ankle with knee-ankle, left arm-right leg with right arm-left leg).
//   crp_marp_diff        MARP left − right, degrees (signed)
//   crp_dp_diff          DP left − right, degrees (signed)
//   crp_curve_rms_diff   RMS over the 101 points of the wrapped difference of the mean CRP curves, degrees
//   vc_angle_rms_diff    the same for the mean coupling-angle curves, degrees
//   vc_bin_diff          half the summed absolute differences of the four pattern shares, percentage points
//                        (0 = same distribution, 100 = disjoint; the total variation distance)
//   vc_variability_diff  mean coupling angle variability left − right, degrees (signed)
// Intervals: a percentile bootstrap over cycles (each side's cycles drawn with replacement, independently;
// Efron and Tibshirani 1993), 2.5 and 97.5 percentiles. The unsigned distances are biased upward by
// stride-to-stride noise: a perfectly symmetric walker still scores above 0.
import { Pcg32 } from '../nn/prng.js';
import type { ClassicPairCycles, ClassicPairName } from './classic-couplings.js';
import { unitVectors, wrap180, type UnitVectors } from './circular.js';
import { summariseCrp } from './crp.js';
import { COUPLING_PATTERNS, summariseVectorCoding, type PatternShares } from './vector-coding.js';

/** The asymmetry figures of one pair. */
export interface AsymmetryFigures {
  crp_marp_diff: number | null;
  crp_dp_diff: number | null;
  crp_curve_rms_diff: number | null;
  vc_angle_rms_diff: number | null;
  vc_bin_diff: number | null;
  vc_variability_diff: number | null;
}

/** One pair's left-versus-right asymmetry, plain data. */
export interface ClassicAsymmetry {
  pair: ClassicPairName;
  cycles: { left: number; right: number };
  left_vs_right: AsymmetryFigures;
  /** Bootstrap percentile intervals of each figure ([low, high]), or null when not drawn. */
  ci: Record<keyof AsymmetryFigures, [number, number] | null> | null;
  replicates: number;
}

const FIGURES = ['crp_marp_diff', 'crp_dp_diff', 'crp_curve_rms_diff', 'vc_angle_rms_diff', 'vc_bin_diff', 'vc_variability_diff'] as const;

/** Returns the RMS over the points where both are finite of the wrapped difference a − b (degrees; NaN if none). */
export function circularRmsDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0, n = 0;
  for (let i = 0; i < a.length; i++) {
    const d = wrap180(a[i]! - b[i]!);
    if (Number.isFinite(d)) { s += d * d; n++; }
  }
  return n ? Math.sqrt(s / n) : NaN;
}

/** Returns half the summed absolute differences of two pattern-share sets (percentage points). */
export function shareDistance(a: PatternShares, b: PatternShares): number {
  let s = 0;
  for (const p of COUPLING_PATTERNS) s += Math.abs(a[p] - b[p]);
  return s / 2;
}

function finiteMean(a: ArrayLike<number>): number {
  let s = 0, n = 0;
  for (let i = 0; i < a.length; i++) if (Number.isFinite(a[i]!)) { s += a[i]!; n++; }
  return n ? s / n : NaN;
}

/** Unit vectors of the four curve matrices, computed once per pair for the bootstrap. */
interface Units { crpL: UnitVectors; crpR: UnitVectors; vcL: UnitVectors; vcR: UnitVectors }

/** Returns the six figures of a left and a right pair, optionally on drawn rows of each. */
function figures(L: ClassicPairCycles, R: ClassicPairCycles, rowsL?: Int32Array, rowsR?: Int32Array, u?: Units): Record<keyof AsymmetryFigures, number> {
  const S = L.crp.samples;
  const cl = rowsL ? summariseCrp(L.crp.curves, L.crp.cycles, S, rowsL, u?.crpL) : L.crp;
  const cr = rowsR ? summariseCrp(R.crp.curves, R.crp.cycles, S, rowsR, u?.crpR) : R.crp;
  const vl = rowsL ? summariseVectorCoding(L.vc.curves, L.vc.cycles, S, rowsL, u?.vcL) : L.vc;
  const vr = rowsR ? summariseVectorCoding(R.vc.curves, R.vc.cycles, S, rowsR, u?.vcR) : R.vc;
  return {
    crp_marp_diff: cl.marp - cr.marp,
    crp_dp_diff: cl.dp - cr.dp,
    crp_curve_rms_diff: circularRmsDifference(cl.mean, cr.mean),
    vc_angle_rms_diff: circularRmsDifference(vl.meanAngle, vr.meanAngle),
    vc_bin_diff: shareDistance(vl.shares, vr.shares),
    vc_variability_diff: finiteMean(vl.variability) - finiteMean(vr.variability),
  };
}

/** Returns the p-quantile (0..1) of sorted finite values by linear interpolation (NaN when empty). */
function quantile(sorted: Float64Array, n: number, p: number): number {
  if (n === 0) return NaN;
  const h = (n - 1) * p, lo = Math.floor(h), hi = Math.min(n - 1, lo + 1);
  return sorted[lo]! + (h - lo) * (sorted[hi]! - sorted[lo]!);
}

const num = (v: number): number | null => (Number.isFinite(v) ? v : null);

/** Returns the left-versus-right asymmetry of every pair measured on both sides, with bootstrap intervals. */
export function classicAsymmetry(pairs: readonly ClassicPairCycles[], options: { replicates?: number; seed?: number } = {}): ClassicAsymmetry[] {
  const B = options.replicates ?? 200;
  const out: ClassicAsymmetry[] = [];
  const names = [...new Set(pairs.map((p) => p.name))];
  names.forEach((name, pi) => {
    const L = pairs.find((p) => p.name === name && p.side === 'left'), R = pairs.find((p) => p.name === name && p.side === 'right');
    if (!L || !R) return;
    const point = figures(L, R);
    let ci: ClassicAsymmetry['ci'] = null;
    if (B > 0 && L.crp.cycles > 1 && R.crp.cycles > 1) {
      const rng = new Pcg32(options.seed ?? 1, pi);
      const units: Units = { crpL: unitVectors(L.crp.curves), crpR: unitVectors(R.crp.curves), vcL: unitVectors(L.vc.curves), vcR: unitVectors(R.vc.curves) };
      const rowsL = new Int32Array(L.crp.cycles), rowsR = new Int32Array(R.crp.cycles);
      const draws = Object.fromEntries(FIGURES.map((f) => [f, new Float64Array(B)])) as Record<keyof AsymmetryFigures, Float64Array>;
      const counts = Object.fromEntries(FIGURES.map((f) => [f, 0])) as Record<keyof AsymmetryFigures, number>;
      for (let b = 0; b < B; b++) {
        for (let k = 0; k < rowsL.length; k++) rowsL[k] = Math.floor(rng.next() * rowsL.length);
        for (let k = 0; k < rowsR.length; k++) rowsR[k] = Math.floor(rng.next() * rowsR.length);
        const f = figures(L, R, rowsL, rowsR, units);
        for (const key of FIGURES) if (Number.isFinite(f[key])) draws[key][counts[key]++] = f[key];
      }
      ci = {} as NonNullable<ClassicAsymmetry['ci']>;
      for (const key of FIGURES) {
        const n = counts[key], d = draws[key].subarray(0, n).sort();
        ci[key] = n ? [quantile(d, n, 0.025), quantile(d, n, 0.975)] : null;
      }
    }
    const lvr = Object.fromEntries(FIGURES.map((f) => [f, num(point[f])])) as unknown as AsymmetryFigures;
    out.push({ pair: name, cycles: { left: L.crp.cycles, right: R.crp.cycles }, left_vs_right: lvr, ci, replicates: ci ? B : 0 });
  });
  return out;
}
