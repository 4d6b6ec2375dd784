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
  return bandStats(samples, sampleCount, truth, level).coverage;
}

/**
 * Returns the central `level` band's coverage (as bandCoverage) and mean interval score over the
 * coordinates: the band's width plus 2/α times each miss beyond it, α = 1 − level (Gneiting and
 * Raftery 2007). `col` (at least sampleCount long) is scratch.
 */
export function bandStats(samples: Float64Array, sampleCount: number, truth: Float64Array, level: number, col = new Float64Array(sampleCount)): { coverage: number; score: number } {
  const L = truth.length, alpha = 1 - level, lo = alpha / 2, hi = 1 - lo;
  const q = (p: number) => {
    const x = p * (sampleCount - 1), i = Math.floor(x), w = x - i;
    return i + 1 < sampleCount ? col[i]! * (1 - w) + col[i + 1]! * w : col[i]!;
  };
  let inside = 0, score = 0;
  for (let c = 0; c < L; c++) {
    // Insertion sort in place: sample counts are small, and a subarray per coordinate would allocate.
    for (let s = 0; s < sampleCount; s++) {
      const x = samples[s * L + c]!;
      let j = s - 1;
      while (j >= 0 && col[j]! > x) { col[j + 1] = col[j]!; j--; }
      col[j + 1] = x;
    }
    const l = q(lo), u = q(hi), v = truth[c]!;
    if (v >= l && v <= u) inside++;
    score += u - l + (v < l ? (2 / alpha) * (l - v) : 0) + (v > u ? (2 / alpha) * (v - u) : 0);
  }
  return { coverage: inside / L, score: score / L };
}
