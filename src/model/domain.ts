// Whether a take lies inside what the coupling model was trained on: straight walking. A take that turns
// around, walks a curved path or stops defeats the stride-mean baseline (it forecasts the walker going on
// as before) by far more than any straight walk, with or without impairment, so the baseline's median
// 1-s error over the take is the check; it needs no model and reads only the take.
import type { Track } from '../motion/track.js';
import type { ModelConfig } from './config.js';
import { baselineForecast } from './baselines.js';
import { horizonStep, meanJointError } from './metrics.js';

/**
 * Above this median 1-s error of the stride-mean baseline (mm) a take counts as outside the model's
 * straight-walking domain. Chosen from measured figures: held-out invented walkers 15-40 mm by group
 * (eval:forecast: normal 16.0, variable gait 39.6), the demo's straight walks 11-21 mm, its walkway take
 * with turns 910 mm and its serpentine walk 413 mm.
 */
export const DOMAIN_LIMIT_MM = 100;

/** The check's reading: the baseline's median 1-s error (mm) over forecasts every second, and whether it is within the limit. */
export interface DomainCheck {
  strideMeanMm: number | null;
  inside: boolean;
}

/** Returns the domain check of a track from step `first` on (the first step with enough history). */
export function domainCheck(track: Track, first: number, forecastSteps: number): DomainCheck {
  const N = track.nodeCount, W = N * 3, k = Math.min(forecastSteps - 1, horizonStep(1, track.rate));
  const out = new Float64Array(forecastSteps * W), errs: number[] = [];
  const step = Math.max(1, Math.round(track.rate));
  for (let e = first; e + forecastSteps < track.steps; e += step) {
    baselineForecast('stride_mean', track.positions, N, track.rate, e, forecastSteps, out);
    const truth = track.positions.subarray((e + 1) * W, (e + 1 + forecastSteps) * W);
    errs.push(1000 * meanJointError(out, truth, N, k));
  }
  if (!errs.length) return { strideMeanMm: null, inside: true };
  errs.sort((a, b) => a - b);
  const m = errs.length % 2 ? errs[errs.length >> 1]! : (errs[errs.length / 2 - 1]! + errs[errs.length / 2]!) / 2;
  return { strideMeanMm: m, inside: m <= DOMAIN_LIMIT_MM };
}

/** Returns the check as the CLI's JSON writes it (the error to 0.1 mm). */
export function domainCheckJson(d: DomainCheck): { stride_mean_1s_mm: number | null; straight_walking: boolean } {
  return { stride_mean_1s_mm: d.strideMeanMm === null ? null : Math.round(d.strideMeanMm * 10) / 10, straight_walking: d.inside };
}

/** Returns the warning for a take outside the domain (what is affected is named by the caller). */
export function domainWarning(d: DomainCheck, affected: string): string {
  return `the stride-mean forecast misses this take by ${d.strideMeanMm!.toFixed(0)} mm at 1 s (median; straight walking stays below ${DOMAIN_LIMIT_MM} mm): it holds turns, curves or other motion outside the coupling model's straight-walking training, so ${affected} cannot be relied on`;
}

/** Returns the step of a model's first forecast on a take: its stride prior's whole history observed, or less on a short take. */
export function firstForecastStep(c: ModelConfig, track: Track): number {
  return c.stridePrior ? Math.min(c.priorHistory, Math.max(c.observe, track.steps - c.forecast - 1)) : c.observe;
}

/** Returns the domain check of a track for a model (from the model's first forecast step, over its forecast length). */
export function modelDomainCheck(c: ModelConfig, track: Track): DomainCheck {
  return domainCheck(track, firstForecastStep(c, track), c.forecast);
}
