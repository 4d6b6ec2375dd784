// Left/right symmetry measures: the classic scalar indices for strictly positive magnitudes, and a curve-level
// measure (normalised cross-correlation and phase lag) for time-normalised angle curves.
//
// Scalar measures (L, R: the left and right values; positive results mean the right is larger):
//   symmetry index   SI = (R − L) / (0.5 (R + L)) × 100 %       Robinson, Herzog and Nigg 1987, J Manipulative
//                    Physiol Ther 10(4):172-176, written right minus left.
//   symmetry ratio   R / L.
//   symmetry angle   SA = (45° − arctan(L / R)) / 90° × 100 %, and when (45° − arctan(L / R)) > 90°,
//                    SA = (45° − arctan(L / R) − 180°) / 90° × 100 %   Zifchock, Davis, Higginson and Royer 2008,
//                    Gait & Posture 27(4):622-627 (form recalled from memory). The correction only acts for
//                    L / R < −1, so it never fires on the strictly positive values these functions accept;
//                    `symmetryAngleFormula` keeps it for any input.
// The scalar measures are only computed for strictly positive magnitudes (durations, lengths, ranges, peaks):
// for a value at or below zero, or a set of values that crosses zero, they return null with a reason.

/** A symmetry value, or null with the reason it was not computed. */
export type SymmetryValue = { value: number; reason: null } | { value: null; reason: string };

const DEG = 180 / Math.PI;

/** Returns null-with-reason unless both values are finite and strictly positive. */
function positive(l: number, r: number, what: string): SymmetryValue | null {
  for (const [side, v] of [['left', l], ['right', r]] as const)
    if (!Number.isFinite(v) || v <= 0)
      return { value: null, reason: `the ${side} value (${v}) is not a strictly positive magnitude; the ${what} is only computed for durations, lengths, ranges and peaks above zero` };
  return null;
}

/** Returns the symmetry index (R − L) / (0.5 (R + L)) × 100, in percent (positive: right larger). */
export function symmetryIndex(l: number, r: number): SymmetryValue {
  return positive(l, r, 'symmetry index') ?? { value: ((r - l) / (0.5 * (r + l))) * 100, reason: null };
}

/** Returns the symmetry ratio R / L (above 1: right larger). */
export function symmetryRatio(l: number, r: number): SymmetryValue {
  return positive(l, r, 'symmetry ratio') ?? { value: r / l, reason: null };
}

/** Returns the symmetry angle in percent (positive: right larger), for strictly positive values. */
export function symmetryAngle(l: number, r: number): SymmetryValue {
  return positive(l, r, 'symmetry angle') ?? { value: symmetryAngleFormula(l, r), reason: null };
}

/** Returns the symmetry angle formula of Zifchock et al. 2008 with its correction, in percent, for any L and non-zero R. */
export function symmetryAngleFormula(l: number, r: number): number {
  const a = 45 - Math.atan(l / r) * DEG;
  return ((a > 90 ? a - 180 : a) / 90) * 100;
}

/** Symmetry of two sides' per-cycle values: their means and the three scalar measures of the means. */
export interface ValuesSymmetry {
  leftMean: number;
  rightMean: number;
  index: SymmetryValue;
  ratio: SymmetryValue;
  angle: SymmetryValue;
}

/**
 * Returns the scalar measures of the means of per-cycle values (NaN values skipped); when any value of either
 * side is at or below zero the set crosses zero and every measure is null with that reason.
 */
export function valuesSymmetry(left: ArrayLike<number>, right: ArrayLike<number>): ValuesSymmetry {
  const mean = (xs: ArrayLike<number>) => {
    let n = 0, s = 0, low = Infinity;
    for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) { n++; s += xs[i]!; if (xs[i]! < low) low = xs[i]!; }
    return { m: n > 0 ? s / n : NaN, low };
  };
  const L = mean(left), R = mean(right);
  const crosses = L.low <= 0 || R.low <= 0;
  if (crosses) {
    const reason = `the values reach zero or below (lowest left ${L.low}, right ${R.low}); symmetry measures are only computed for strictly positive magnitudes`;
    const no: SymmetryValue = { value: null, reason };
    return { leftMean: L.m, rightMean: R.m, index: no, ratio: no, angle: no };
  }
  return { leftMean: L.m, rightMean: R.m, index: symmetryIndex(L.m, R.m), ratio: symmetryRatio(L.m, R.m), angle: symmetryAngle(L.m, R.m) };
}

/** Curve-level symmetry: correlation at the best circular shift and that shift as a share of the cycle. */
export interface CurveSymmetry {
  /** Largest Pearson correlation over circular shifts of the right curve, −1..1. */
  correlation: number;
  /** The shift at that maximum, percent of the cycle in (−50, 50]: positive when the right curve runs later. */
  lagPct: number;
  /** Pearson correlation without a shift. */
  zeroLagCorrelation: number;
}

/**
 * Returns the normalised cross-correlation of two cycle curves over circular shifts, or null with a reason
 * (different lengths, non-finite samples, a flat curve). With `closed` (the default, as for 101-sample curves
 * from 0 to 100 %) the last sample repeats the first phase and is dropped before shifting. At shift k the right
 * curve's sample i + k is paired with the left's sample i; ties go to the smallest |lag|.
 */
export function curveSymmetry(left: ArrayLike<number>, right: ArrayLike<number>, closed = true): CurveSymmetry | { correlation: null; reason: string } {
  if (left.length !== right.length) return { correlation: null, reason: `the curves differ in length (${left.length} and ${right.length})` };
  const m = closed ? left.length - 1 : left.length;
  if (m < 3) return { correlation: null, reason: `the curves are too short (${left.length} samples)` };
  let ml = 0, mr = 0;
  for (let i = 0; i < m; i++) {
    if (!Number.isFinite(left[i]!) || !Number.isFinite(right[i]!)) return { correlation: null, reason: `sample ${i} is not a finite number` };
    ml += left[i]!; mr += right[i]!;
  }
  ml /= m; mr /= m;
  let sl = 0, sr = 0;
  for (let i = 0; i < m; i++) { sl += (left[i]! - ml) ** 2; sr += (right[i]! - mr) ** 2; }
  if (!(sl > 0) || !(sr > 0)) return { correlation: null, reason: 'a curve is flat (no variation), so its correlation is undefined' };
  const norm = Math.sqrt(sl * sr);
  let best = -Infinity, bestLag = 0, zero = NaN;
  const half = Math.floor(m / 2);
  for (let k = -Math.ceil(m / 2) + 1; k <= half; k++) {
    let s = 0;
    for (let i = 0; i < m; i++) s += (left[i]! - ml) * (right[(((i + k) % m) + m) % m]! - mr);
    const c = s / norm;
    if (k === 0) zero = c;
    if (c > best + 1e-12 || (Math.abs(c - best) <= 1e-12 && Math.abs(k) < Math.abs(bestLag))) { best = c; bestLag = k; }
  }
  return { correlation: best, lagPct: (bestLag * 100) / m, zeroLagCorrelation: zero };
}
