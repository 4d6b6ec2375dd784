// Calibration of the forecast spread on held-out windows: for each exponent of a small grid
// (spread.ts: the noise SD follows each window's backcast error to that power), the scale is set by
// bisection so that the central 90 % band covers 90 % of the future positions; of those, the exponent
// with the lowest mean interval score is kept (Gneiting and Raftery 2007, "Strictly proper scoring
// rules, prediction, and estimation", JASA 102: the band's width plus 2/α times each miss beyond it; at
// equal coverage, the sharper band that misses by less wins).
import { STATE_SIZE } from '../motion/reflect.js';
import type { Window } from '../motion/window.js';
import { Pcg32 } from '../nn/prng.js';
import { createForecaster, decodePaths, positionsOf, toWorld, type ForecastOptions } from './forecast.js';
import { scaledBandStats } from './metrics.js';
import type { CouplingModel } from './model.js';
import { backcastError, backcastScratch, spreadFactor, SPREAD_EXPONENTS, type SpreadAdapt } from './spread.js';

/**
 * Returns the spread scale (also stored in model.spreadScale, with the chosen adaptation in
 * model.spreadAdapt) that makes the central `level` band of the samples cover that share of the held-out
 * windows' future positions, for the exponent with the lowest interval score.
 */
export function calibrateSpread(model: CouplingModel, windows: readonly Window[], options: ForecastOptions & { level?: number; exponents?: readonly number[] } = {}): number {
  const level = options.level ?? 0.9, fc = createForecaster(model, options.samples ?? 20);
  const c = model.config, N = c.nodes, W = N * STATE_SIZE, F = c.forecast, Sm = fc.sampleCount;
  const lv = model.params.lvRollout.value, scratch = backcastScratch(c);
  // The world frame is affine in the normalised state, so a sample's positions at noise scale g are
  // base + g · dir: base from the decoded path, dir from one unit of its noise. Both are made once per
  // window, and each scale tried costs a multiply-add and the band.
  const P3 = F * N * 3, one = new Float64Array(F * W), clean = new Float64Array(P3), noisy = new Float64Array(P3);
  const cases = windows.filter((w) => w.futureSteps === F).map((win, i) => {
    const rng = new Pcg32((options.seed ?? 1) + i, 0x63616c);
    const paths = decodePaths(fc, win, rng);
    const eps = new Float64Array(paths.length);
    rng.fillGauss(eps);
    // Coordinate-major ([P3 × samples]), as scaledBandStats reads them.
    const base = new Float64Array(Sm * P3), dir = new Float64Array(Sm * P3);
    for (let m = 0; m < Sm; m++) {
      const o = m * F * W;
      positionsOf(toWorld(fc, win, paths.subarray(o, o + F * W)), clean, 0);
      for (let j = 0; j < F * W; j++) one[j] = paths[o + j]! + Math.exp(0.5 * lv[j]!) * eps[o + j]!;
      positionsOf(toWorld(fc, win, one), noisy, 0);
      for (let j = 0; j < P3; j++) {
        base[j * Sm + m] = clean[j]!;
        dir[j * Sm + m] = noisy[j]! - clean[j]!;
      }
    }
    const truth = new Float64Array(P3);
    positionsOf(win.toWorld(Float64Array.from(win.future), new Float64Array(win.future.length)), truth, 0);
    return { base, dir, truth, backcast: backcastError(c, win.history, win.historySteps, scratch) };
  });
  if (cases.length === 0) return model.spreadScale;
  const known = cases.map((x) => x.backcast).filter(Number.isFinite).sort((a, b) => a - b);
  const reference = known.length ? known[known.length >> 1]! : NaN;
  const col = new Float64Array(Sm);
  const evaluate = (k: number, adapt: SpreadAdapt | null) => {
    let coverage = 0, score = 0;
    for (const cs of cases) {
      const b = scaledBandStats(cs.base, cs.dir, k * spreadFactor(adapt, cs.backcast), Sm, cs.truth, level, col);
      coverage += b.coverage;
      score += b.score;
    }
    return { coverage: coverage / cases.length, score: score / cases.length };
  };
  let best: { k: number; adapt: SpreadAdapt | null; score: number } | null = null;
  for (const exponent of options.exponents ?? SPREAD_EXPONENTS) {
    if (exponent !== 0 && !(reference > 0)) continue;
    const adapt = exponent === 0 ? null : { exponent, reference };
    let lo = Math.log(1e-3), hi = Math.log(1e3);
    // 18 halvings of the log range: the scale to within 0.005 %.
    for (let it = 0; it < 18; it++) {
      const mid = 0.5 * (lo + hi);
      if (evaluate(Math.exp(mid), adapt).coverage < level) lo = mid;
      else hi = mid;
    }
    const k = Math.exp(0.5 * (lo + hi)), { score } = evaluate(k, adapt);
    if (!best || score < best.score) best = { k, adapt, score };
  }
  model.spreadScale = best!.k;
  model.spreadAdapt = best!.adapt;
  return model.spreadScale;
}
