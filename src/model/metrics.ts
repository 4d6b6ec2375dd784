// Forecast errors: mean per-joint position error at horizons, and prediction-band coverage.

/** Horizons reported, seconds. */
export const HORIZONS_S = [0.25, 0.5, 1.0] as const;

/** Returns the forecast step index (0-based, step 0 is one step after the last observed) nearest `seconds`. */
export function horizonStep(seconds: number, rate: number): number {
  return Math.max(0, Math.round(seconds * rate) - 1);
}

/** Returns the mean Euclidean error over nodes at forecast step k, in the units of the inputs. */
export function meanJointError(pred: Float64Array, truth: Float64Array, nodeCount: number, k: number): number {
  let s = 0;
  for (let n = 0; n < nodeCount; n++) {
    const o = (k * nodeCount + n) * 3;
    s += Math.hypot(pred[o]! - truth[o]!, pred[o + 1]! - truth[o + 1]!, pred[o + 2]! - truth[o + 2]!);
  }
  return s / nodeCount;
}

/**
 * Returns the share of truth coordinates inside the central `level` band of the samples
 * ([samples × steps × nodes × 3]) over all steps, nodes and axes (empirical quantiles per coordinate).
 */
export function bandCoverage(samples: Float64Array, sampleCount: number, truth: Float64Array, level = 0.9): number {
  const L = truth.length;
  const col = new Float64Array(sampleCount);
  const lo = (1 - level) / 2, hi = 1 - lo;
  let inside = 0;
  for (let c = 0; c < L; c++) {
    for (let s = 0; s < sampleCount; s++) col[s] = samples[s * L + c]!;
    col.sort();
    const q = (p: number) => {
      const x = p * (sampleCount - 1), i = Math.floor(x), w = x - i;
      return i + 1 < sampleCount ? col[i]! * (1 - w) + col[i + 1]! * w : col[i]!;
    };
    const v = truth[c]!;
    if (v >= q(lo) && v <= q(hi)) inside++;
  }
  return inside / L;
}
