// Scoring forecasts against what the take recorded: the model, its retrained no-coupling twin and
// every baseline on the same window, at the reported horizons, with the model's band coverage and a
// surprise figure (error relative to the predicted spread).
import type { Track } from '../motion/track.js';
import { makeWindow } from '../motion/window.js';
import { BASELINE_NAMES, baselineForecast, type BaselineName } from './baselines.js';
import { createForecaster, forecast, type ForecastResult, type Forecaster } from './forecast.js';
import { HORIZONS_S, bandCoverage, horizonStep, meanJointError } from './metrics.js';
import type { CouplingModel } from './model.js';
import { modelWindowOptions } from './config.js';

export type MethodName = 'model' | 'no_coupling' | BaselineName;

/** The models a forecast is made with; the no-coupling twin is optional. */
export interface ForecastModels {
  model: CouplingModel;
  noCoupling?: CouplingModel | null;
}

/** One forecast from one time, scored where the take holds the recorded future. */
export interface ForecastPoint {
  /** Track step of the last observed step, and its time in seconds. */
  endStep: number;
  time_s: number;
  result: ForecastResult;
  /** Recorded future positions, steps × nodes × 3 (world metres), or null past the take's end. */
  truth: Float64Array | null;
  /** Mean per-joint position error in mm at each horizon, per method (null without a recorded future). */
  mpjpe_mm: Record<MethodName, number[]> | null;
  /** Share of recorded future coordinates inside the model's central 90 % band. */
  coverage_90: number | null;
  /** Mean over nodes and the first half second of |error| / predicted SD (null without a future). */
  surprise: number | null;
}

/** Reusable forecasters for repeated forecasts with one pair of models. */
export interface Evaluator {
  models: ForecastModels;
  model: Forecaster;
  noCoupling: Forecaster | null;
  samples: number;
}

/** Returns an evaluator (work buffers) for `samples` samples per forecast. */
export function createEvaluator(models: ForecastModels, samples = 20): Evaluator {
  return {
    models,
    model: createForecaster(models.model, samples),
    noCoupling: models.noCoupling ? createForecaster(models.noCoupling, Math.max(2, Math.min(samples, 4))) : null,
    samples,
  };
}

/** Returns the first and last track steps a forecast may be made from (whole observed part inside). */
export function forecastRange(track: Track, models: ForecastModels): { first: number; last: number } {
  const c = models.model.config;
  return { first: c.observe, last: track.steps - 1 };
}

/** Returns the forecast from track step `end` (its last observed step), scored where the future is recorded. */
export function forecastAt(track: Track, end: number, ev: Evaluator, seed = 1): ForecastPoint {
  const c = ev.models.model.config;
  const win = makeWindow(track, end, modelWindowOptions(c));
  const result = forecast(ev.models.model, win, { seed, samples: ev.samples }, ev.model);
  const F = c.forecast, N = track.nodeCount, W = N * 3;
  const point: ForecastPoint = { endStep: end, time_s: end / track.rate, result, truth: null, mpjpe_mm: null, coverage_90: null, surprise: null };
  if (end + F >= track.steps) return point;
  const truth = track.positions.slice((end + 1) * W, (end + 1 + F) * W);
  point.truth = truth;
  const horizons = HORIZONS_S.map((h) => Math.min(F - 1, horizonStep(h, track.rate)));
  const errs = (pred: Float64Array) => horizons.map((k) => 1000 * meanJointError(pred, truth, N, k));
  const scores = { model: errs(result.mean) } as Record<MethodName, number[]>;
  if (ev.models.noCoupling && ev.noCoupling) scores.no_coupling = errs(forecast(ev.models.noCoupling, win, { seed }, ev.noCoupling).mean);
  const tmp = new Float64Array(F * W);
  for (const name of BASELINE_NAMES) scores[name] = errs(baselineForecast(name, track.positions, N, track.rate, end, F, tmp));
  point.mpjpe_mm = scores;
  point.coverage_90 = bandCoverage(result.samples, result.sampleCount, truth, 0.9);
  point.surprise = surprise(result, truth, Math.max(1, Math.round(0.5 * track.rate)));
  return point;
}

/** Returns the mean over nodes and the first `steps` forecast steps of |truth − mean| / sample SD. */
export function surprise(r: ForecastResult, truth: Float64Array, steps: number): number {
  const N = r.nodeCount, S = r.sampleCount, L = r.steps * N * 3;
  let sum = 0, count = 0;
  for (let k = 0; k < Math.min(steps, r.steps); k++)
    for (let n = 0; n < N; n++) {
      let d2 = 0, v = 0;
      for (let a = 0; a < 3; a++) {
        const c = (k * N + n) * 3 + a;
        let m = 0, q = 0;
        for (let s = 0; s < S; s++) { const x = r.samples[s * L + c]!; m += x; q += x * x; }
        m /= S;
        v += Math.max(1e-12, q / S - m * m);
        d2 += (truth[c]! - r.mean[c]!) ** 2;
      }
      sum += Math.sqrt(d2 / v);
      count++;
    }
  return sum / count;
}

/** Returns the steps flagged as irregular in a surprise timeline: above median + 4 × the median absolute deviation. */
export function flagSurprises(values: readonly (number | null)[]): boolean[] {
  const xs = values.filter((v): v is number => v !== null).sort((a, b) => a - b);
  if (xs.length < 5) return values.map(() => false);
  const med = xs[Math.floor(xs.length / 2)]!;
  const dev = xs.map((v) => Math.abs(v - med)).sort((a, b) => a - b);
  const mad = dev[Math.floor(dev.length / 2)]!;
  const limit = med + 4 * Math.max(mad, 1e-9);
  return values.map((v) => v !== null && v > limit);
}

/** A run of flagged timeline points: first and last flagged time and the most surprising one. */
export interface IrregularEpisode { start_s: number; end_s: number; peak_s: number; peak: number }

/**
 * Returns the flagged points of a timeline merged into episodes: a flagged point within `gapS` seconds of
 * the previous flagged one joins its episode (one stumble lifts several neighbouring forecasts).
 */
export function irregularEpisodes(points: readonly { time_s: number; surprise: number | null; irregular: boolean }[], gapS = 0.5): IrregularEpisode[] {
  const out: IrregularEpisode[] = [];
  for (const p of points) {
    if (!p.irregular || p.surprise === null) continue;
    const last = out[out.length - 1];
    if (last && p.time_s - last.end_s <= gapS + 1e-9) {
      last.end_s = p.time_s;
      if (p.surprise > last.peak) { last.peak = p.surprise; last.peak_s = p.time_s; }
    } else out.push({ start_s: p.time_s, end_s: p.time_s, peak_s: p.time_s, peak: p.surprise });
  }
  return out;
}

/** Returns an episode's time span as text ("9.2-9.8 s", or "11.3 s" for a single point) with `digits` decimals. */
export function episodeSpan(e: IrregularEpisode, digits = 1): string {
  return e.end_s > e.start_s ? `${e.start_s.toFixed(digits)}-${e.end_s.toFixed(digits)} s` : `${e.start_s.toFixed(digits)} s`;
}
