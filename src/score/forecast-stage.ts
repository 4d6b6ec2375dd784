// The forecast stage of scoring: the surprise timeline of a take. Every 0.3 s (`TIMELINE_EVERY_S`)
// where the recorded future second exists, the model forecasts the next second with a few samples
// (default 8); the take's steps whose recorded motion falls far outside the predicted spread are flagged
// as irregular (evaluate.ts: above median + 4 MAD of the take's own timeline), and flagged points within
// 0.5 s of each other count as one episode, one flag. Skipped without a model.
import { createEvaluator, episodeSpan, flagSurprises, forecastAt, irregularEpisodes, type Evaluator } from '../model/evaluate.js';
import { domainCheckJson, domainWarning, firstForecastStep } from '../model/domain.js';
import { cachedModel, modelTrack, takeDomain } from './model-cache.js';
import type { ScoreFlag } from './record.js';
import type { ScoreStage, StageResult } from './stages.js';

/** Seconds between forecasts and samples per forecast of the batch timeline. */
export const TIMELINE_EVERY_S = 0.3;
export const TIMELINE_SAMPLES = 8;

const evaluators = new Map<string, Evaluator>();

/** Returns the evaluator of a model file, loaded once per process (batch workers score many takes). */
function evaluatorOf(file: string): Evaluator {
  let ev = evaluators.get(file);
  if (!ev) {
    ev = createEvaluator({ model: cachedModel(file).model }, TIMELINE_SAMPLES);
    evaluators.set(file, ev);
  }
  return ev;
}

const METRICS = ['forecast_points', 'mpjpe_1s_mm', 'stride_mean_1s_mm', 'coverage_90', 'surprise_median', 'irregular_steps'] as const;
const empty = (): Record<string, number | null> => Object.fromEntries(METRICS.map((m) => [m, null]));

/** The forecast stage: surprise timeline, 1-s error of the model and the stride-mean baseline, irregular steps. */
export const FORECAST_STAGE: ScoreStage = {
  name: 'forecast',
  version: 2,
  metrics: METRICS,
  run(ctx): StageResult {
    if (!ctx.modelFile) return { metrics: empty(), detail: { model: null } };
    const ev = evaluatorOf(ctx.modelFile);
    const c = ev.models.model.config;
    const track = modelTrack(ctx, c.rate);
    const step = Math.max(1, Math.round(TIMELINE_EVERY_S * track.rate));
    const first = firstForecastStep(c, track);
    const points = [];
    for (let e = first; e + c.forecast < track.steps; e += step) points.push(forecastAt(track, e, ev));
    if (points.length === 0)
      return { metrics: empty(), usedModel: true, detail: { model: ctx.modelFile, timeline: [] }, warnings: [`the take is too short for a forecast timeline (it needs ${((c.observe + c.forecast + 1) / c.rate).toFixed(1)} s)`] };
    const domain = takeDomain(ctx, c);
    const flags = flagSurprises(points.map((p) => p.surprise));
    const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
    const surprises = points.map((p) => p.surprise!).sort((a, b) => a - b);
    const timeline = points.map((p, i) => ({
      time_s: Math.round(p.time_s * 1000) / 1000, surprise: Math.round(p.surprise! * 1000) / 1000,
      mpjpe_1s_mm: Math.round(p.mpjpe_mm!.model[2]! * 10) / 10, irregular: flags[i]!,
    }));
    const episodes = irregularEpisodes(timeline);
    const median = surprises[Math.floor(surprises.length / 2)]!;
    const episodeFlags: ScoreFlag[] = episodes.map((e) => ({ stage: 'forecast', measure: 'surprise', value: Math.round(e.peak * 1000) / 1000, text: `irregular motion near ${episodeSpan(e)}, to review: the recorded half second after ${e.peak_s.toFixed(1)} s departs from the forecast by ${e.peak.toFixed(2)} predicted SDs on average (the take's median ${median.toFixed(2)})` }));
    return {
      metrics: {
        forecast_points: points.length,
        mpjpe_1s_mm: mean(points.map((p) => p.mpjpe_mm!.model[2]!)),
        stride_mean_1s_mm: mean(points.map((p) => p.mpjpe_mm!.stride_mean[2]!)),
        coverage_90: mean(points.map((p) => p.coverage_90!)),
        surprise_median: median,
        irregular_steps: episodes.length,
      },
      detail: { model: ctx.modelFile, every_s: TIMELINE_EVERY_S, samples: TIMELINE_SAMPLES, timeline, episodes, domain },
      // Outside straight walking the take's model figures are in doubt: a flag, so the cohort report shows it.
      flags: [...episodeFlags, ...(domain.inside ? [] : [{ stage: 'forecast', measure: 'domain', value: domainCheckJson(domain).stride_mean_1s_mm!, text: domainWarning(domain, 'its forecast, irregular-motion and coupling figures') }])],
      usedModel: true,
    };
  },
};
