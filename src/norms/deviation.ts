// The Gait Deviation Index (Schwartz and Rozumalski 2008), adapted to a clinic's own controls.
//
// As the paper describes it (recalled from memory): a limb's gait vector is its 9 kinematic curves (pelvis and
// hip in three planes, knee flexion, ankle dorsiflexion, foot progression) sampled every 2 % of the cycle
// (51 × 9 = 459 values); a singular value decomposition of many gait vectors gives "gait features"; the first
// 15 kept about 98 % of the variance; a limb's raw distance is the Euclidean distance of its feature
// coordinates from the control mean's; GDI = 100 − 10 · (ln d − mean ln d_controls) / SD(ln d_controls), so the
// controls average 100 and every 10 points below is one control SD further from normal.
//
// Here: the 8 curves the project measures (no hip rotation: pelvis tilt, obliquity, rotation, hip flexion, hip
// abduction, knee flexion, ankle dorsiflexion, foot progression; 8 × 51 = 408 values); the features come from
// the SVD of the reference's own control strides (uncentred, as in the paper), not from a mixed patient set,
// so a deviation orthogonal to every control feature is not seen; `coverage` says how much of a stride's
// departure from the control mean the features hold.
import { leadingRightSingular } from './eigen.js';
import type { DeviationModel } from './format.js';

/** Features kept (the paper's 15; recalled from memory). */
export const GDI_FEATURES = 15;
/** Samples per curve: every 2 % of the cycle (recalled from memory). */
export const GDI_SAMPLES = 51;

/** Returns the gait vector of one cycle: each curve (of `from` samples) read every 2 %, curves one after another; false when a value is missing. */
export function gaitVector(curves: readonly ArrayLike<number>[], offset: number, from: number, out: Float64Array, samples = GDI_SAMPLES): boolean {
  let o = 0;
  for (const c of curves) {
    for (let i = 0; i < samples; i++) {
      const x = ((from - 1) * i) / (samples - 1);
      const j = Math.floor(x), t = x - j;
      const v = t === 0 ? c[offset + j]! : c[offset + j]! + t * (c[offset + j + 1]! - c[offset + j]!);
      if (!Number.isFinite(v)) return false;
      out[o++] = v;
    }
  }
  return true;
}

/** Returns the deviation model fitted to control gait vectors (rows × p, row-major) with k features. */
export function fitDeviationModel(vectors: Float64Array, rows: number, p: number, k: number, curves: string[], samplesPerCurve: number): DeviationModel {
  const svd = leadingRightSingular(vectors, rows, p, k);
  const K = svd.k;
  const feats = new Float64Array(rows * K);
  projectRows(vectors, rows, p, svd.basis, K, feats);
  const mean = new Float64Array(K);
  for (let r = 0; r < rows; r++) for (let q = 0; q < K; q++) mean[q] += feats[r * K + q]! / rows;
  const vmean = new Float64Array(p);
  for (let r = 0; r < rows; r++) for (let i = 0; i < p; i++) vmean[i] += vectors[r * p + i]! / rows;
  const ln = new Float64Array(rows);
  for (let r = 0; r < rows; r++) ln[r] = Math.log(featureDistance(feats, r * K, mean, K));
  let s = 0;
  for (let r = 0; r < rows; r++) s += ln[r]!;
  const mu = s / rows;
  let ss = 0;
  for (let r = 0; r < rows; r++) ss += (ln[r]! - mu) ** 2;
  return {
    curves, samples_per_curve: samplesPerCurve, features: K, retained: svd.retained,
    feature_mean: Array.from(mean), vector_mean: Array.from(vmean), basis: Array.from(svd.basis),
    ln_distance: { mean: mu, sd: Math.sqrt(ss / (rows - 1)) }, strides: rows,
  };
}

/** A gait vector's index, its raw distance and the share of its departure the features hold. */
export interface DeviationResult {
  gdi: number;
  distance: number;
  /** |projected departure|² / |departure|², 0..1 (1: the features see all of it). */
  coverage: number;
}

/** Returns the deviation index of one gait vector of length curves × samples_per_curve. */
export function deviationIndex(m: DeviationModel, x: ArrayLike<number>): DeviationResult {
  const K = m.features, p = x.length;
  const c = new Float64Array(K);
  for (let q = 0; q < K; q++) {
    let s = 0;
    for (let i = 0; i < p; i++) s += m.basis[q * p + i]! * x[i]!;
    c[q] = s;
  }
  const d = featureDistance(c, 0, m.feature_mean, K);
  // Departure from the control mean gait vector in the full space; its projection has length d.
  let full = 0;
  for (let i = 0; i < p; i++) full += (x[i]! - m.vector_mean[i]!) ** 2;
  return { gdi: gdiFromDistance(m, d), distance: d, coverage: full > 0 ? Math.min(1, (d * d) / full) : 1 };
}

/** Returns 100 − 10 · (ln d − mean ln d) / SD(ln d) for a raw feature-space distance d. */
export function gdiFromDistance(m: DeviationModel, d: number): number {
  return 100 - (10 * (Math.log(d) - m.ln_distance.mean)) / m.ln_distance.sd;
}

/** Writes the feature coordinates of every row (rows × k) into `out`. */
function projectRows(x: Float64Array, rows: number, p: number, basis: ArrayLike<number>, k: number, out: Float64Array): void {
  for (let r = 0; r < rows; r++)
    for (let q = 0; q < k; q++) {
      let s = 0;
      for (let i = 0; i < p; i++) s += basis[q * p + i]! * x[r * p + i]!;
      out[r * k + q] = s;
    }
}

/** Returns the Euclidean distance between k coordinates at `a[o..]` and `b`. */
function featureDistance(a: ArrayLike<number>, o: number, b: ArrayLike<number>, k: number): number {
  let s = 0;
  for (let q = 0; q < k; q++) s += (a[o + q]! - b[q]!) ** 2;
  return Math.sqrt(s);
}
