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
  const L = truth.length, plan = bandPlan(sampleCount, level);
  let inside = 0, score = 0;
  for (let c = 0; c < L; c++) {
    for (let s = 0; s < sampleCount; s++) keepOrdered(col, plan, s, samples[s * L + c]!);
    const v = truth[c]!, l = bandLimit(col, plan, plan.il, plan.wl), u = bandLimit(col, plan, plan.ih, plan.wh);
    if (v >= l && v <= u) inside++;
    score += intervalScore(l, u, v, plan.alpha);
  }
  return { coverage: inside / L, score: score / L };
}

/**
 * bandStats of the samples base + g · dir, with base and dir coordinate-major ([coordinates × samples]):
 * the same figures as bandStats on those samples laid out sample-major, without building them, and
 * reading memory in order (the spread calibration tries many g on the same base and dir).
 */
export function scaledBandStats(base: Float64Array, dir: Float64Array, g: number, sampleCount: number, truth: Float64Array, level: number, col = new Float64Array(sampleCount)): { coverage: number; score: number } {
  const L = truth.length, plan = bandPlan(sampleCount, level);
  let inside = 0, score = 0;
  for (let c = 0, o = 0; c < L; c++, o += sampleCount) {
    for (let s = 0; s < sampleCount; s++) keepOrdered(col, plan, s, base[o + s]! + g * dir[o + s]!);
    const v = truth[c]!, l = bandLimit(col, plan, plan.il, plan.wl), u = bandLimit(col, plan, plan.ih, plan.wh);
    if (v >= l && v <= u) inside++;
    score += intervalScore(l, u, v, plan.alpha);
  }
  return { coverage: inside / L, score: score / L };
}

/**
 * Which order statistics a central band reads (type-7 quantiles: il and il + 1 at the lower end, ih and
 * ih + 1 at the upper end, weights wl and wh) and how keepOrdered keeps them: the `a` smallest samples in
 * col[0..a) and the `b` largest in col[a..a+b), both ascending, or (`partial` false, when they would
 * overlap) every sample sorted.
 */
interface BandPlan { S: number; alpha: number; il: number; wl: number; ih: number; wh: number; a: number; b: number; partial: boolean }

function bandPlan(S: number, level: number): BandPlan {
  const alpha = 1 - level, xl = (alpha / 2) * (S - 1), xh = (1 - alpha / 2) * (S - 1), il = Math.floor(xl), ih = Math.floor(xh);
  const a = Math.min(S, il + 2), b = S - ih;
  return { S, alpha, il, wl: xl - il, ih, wh: xh - ih, a, b, partial: a + b < S };
}

/** Adds sample s (0-based, in order) of one coordinate to col as the plan keeps them: insertion, bounded at the two ends. */
function keepOrdered(col: Float64Array, p: BandPlan, s: number, x: number): void {
  if (!p.partial) {
    let j = s - 1;
    while (j >= 0 && col[j]! > x) { col[j + 1] = col[j]!; j--; }
    col[j + 1] = x;
    return;
  }
  const a = p.a, b = p.b;
  if (s < a || x < col[a - 1]!) {
    let j = (s < a ? s : a - 1) - 1;
    while (j >= 0 && col[j]! > x) { col[j + 1] = col[j]!; j--; }
    col[j + 1] = x;
  }
  if (s < b) {
    let j = a + s - 1;
    while (j >= a && col[j]! > x) { col[j + 1] = col[j]!; j--; }
    col[j + 1] = x;
  } else if (x > col[a]!) {
    let j = a + 1;
    while (j < a + b && col[j]! < x) { col[j - 1] = col[j]!; j++; }
    col[j - 1] = x;
  }
}

/** Order statistic k of the coordinate's samples kept by keepOrdered. */
function orderStat(col: Float64Array, p: BandPlan, k: number): number {
  return !p.partial || k < p.a ? col[k]! : col[p.a + k - (p.S - p.b)]!;
}

/** The type-7 quantile between order statistics i and i + 1 at weight w. */
function bandLimit(col: Float64Array, p: BandPlan, i: number, w: number): number {
  return i + 1 < p.S ? orderStat(col, p, i) * (1 - w) + orderStat(col, p, i + 1) * w : orderStat(col, p, i);
}

/** The interval score of one truth v against the band [l, u] at miss rate α (Gneiting and Raftery 2007). */
function intervalScore(l: number, u: number, v: number, alpha: number): number {
  return u - l + (v < l ? (2 / alpha) * (l - v) : 0) + (v > u ? (2 / alpha) * (v - u) : 0);
}
