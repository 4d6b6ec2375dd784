// The held-out forecast error training stops on: the mean per-joint position error (mm, world) of the
// model's mean forecast over every forecast step, on fixed windows of the held-out subjects' takes.
// The ELBO alone can improve (sharper noise, smaller KL) while the mean forecast drifts; early stopping
// on the error a user sees keeps the trained weights that forecast best.
import type { Track } from '../motion/track.js';
import { makeWindow } from '../motion/window.js';
import { modelWindowOptions } from './config.js';
import { createForecaster, forecast, type Forecaster } from './forecast.js';
import { meanJointError } from './metrics.js';
import type { CouplingModel } from './model.js';

/** Fixed held-out forecast cases: track and last observed step. */
export interface ForecastProbe {
  cases: { track: Track; end: number }[];
  forecaster: Forecaster;
  samples: number;
}

/** Returns up to `most` cases, one every `everyS` seconds of each track from the prior's history on. */
export function forecastProbe(model: CouplingModel, tracks: readonly Track[], options: { everyS?: number; most?: number; samples?: number } = {}): ForecastProbe {
  const c = model.config, cases: { track: Track; end: number }[] = [];
  const first = c.stridePrior ? c.priorHistory : c.observe;
  for (const track of tracks) {
    const step = Math.max(1, Math.round((options.everyS ?? 2) * track.rate));
    for (let e = first; e + c.forecast < track.steps; e += step) cases.push({ track, end: e });
  }
  // An even spread over the takes when there are more cases than wanted.
  const most = options.most ?? 64;
  const picked = cases.length <= most ? cases : Array.from({ length: most }, (_, i) => cases[Math.floor((i * cases.length) / most)]!);
  const samples = options.samples ?? 8;
  return { cases: picked, forecaster: createForecaster(model, samples), samples };
}

/** Returns the mean over cases and forecast steps of the mean forecast's per-joint error, mm (NaN without cases). */
export function probeError(model: CouplingModel, probe: ForecastProbe): number {
  const c = model.config, N = c.nodes, F = c.forecast;
  let sum = 0;
  for (const { track, end } of probe.cases) {
    const win = makeWindow(track, end, modelWindowOptions(c));
    const mean = forecast(model, win, { samples: probe.samples, seed: 1 }, probe.forecaster).mean;
    const truth = track.positions.subarray((end + 1) * N * 3, (end + 1 + F) * N * 3);
    let e = 0;
    for (let k = 0; k < F; k++) e += meanJointError(mean, truth, N, k);
    sum += e / F;
  }
  return probe.cases.length ? (1000 * sum) / probe.cases.length : NaN;
}
