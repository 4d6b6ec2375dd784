// Fitting the pair readouts (readout.ts) of a trained model and its twin: the decoded forecast of every
// training window with full history is compared with the recorded future at the knot steps; the
// readout is the ridge regression of that difference on the window's features, its weight picked on the
// held-out subjects' windows. Mirror images of the training windows are added, as training adds them.
import { denormalise } from '../motion/normalise.js';
import { STATE_SIZE } from '../motion/reflect.js';
import { windowsOf, type Window } from '../motion/window.js';
import { Pcg32 } from '../nn/prng.js';
import type { TrainingTake } from './batch.js';
import { modelWindowOptions } from './config.js';
import { createForecaster, decodePaths } from './forecast.js';
import type { CouplingModel } from './model.js';
import {
  fitReadout, mirrorNodeVectors, readoutFeatures, readoutHistory, readoutKnots, readoutScratch,
  type ReadoutData, type ReadoutFit, type ReadoutSenders,
} from './readout.js';

/** Sample paths averaged for a window's decoded mean while fitting (the factors' draws barely move it). */
const FIT_SAMPLES = 4;

/** Returns the readout fitting data of `model` (its readout ignored) over the windows of `takes` every `stride` steps. */
export function readoutData(model: CouplingModel, takes: readonly TrainingTake[], stride: number, mirror: boolean): ReadoutData {
  const c = model.config, N = c.nodes, F = c.forecast, W = N * STATE_SIZE, knots = readoutKnots(c), K = knots.length;
  const saved = model.readout;
  model.readout = null;
  try {
    const fc = createForecaster(model, FIT_SAMPLES), scratch = readoutScratch(c), mean = new Float64Array(F * W);
    const out: ReadoutData = { features: [], targets: [] };
    let i = 0;
    for (const t of takes)
      for (const win of windowsOf(t.track, stride, modelWindowOptions(c))) {
        if (win.futureSteps !== F || win.historySteps !== readoutHistory(c)) continue;
        const f = readoutFeatures(c, win.history, win.historySteps, scratch);
        if (!f) continue;
        const paths = decodePaths(fc, win, new Pcg32(1 + i++, 0x726f7574));
        mean.fill(0);
        for (let m = 0; m < FIT_SAMPLES; m++) for (let j = 0; j < F * W; j++) mean[j] = mean[j]! + paths[m * F * W + j]! / FIT_SAMPLES;
        denormalise(model.stats, mean, mean);
        const target = targetOf(win, mean, knots, N);
        const features = Float64Array.from(f);
        out.features.push(features);
        out.targets.push(target);
        if (mirror) {
          out.features.push(mirrorNodeVectors(features, t.track.nodeMirror, new Float64Array(features.length)));
          out.targets.push(mirrorNodeVectors(target, t.track.nodeMirror, new Float64Array(N * K * 3)));
        }
      }
    return out;
  } finally {
    model.readout = saved;
  }
}

/** Returns the recorded future minus the decoded mean (window frame, leg lengths) at the knots, nodes × knots × 3. */
function targetOf(win: Window, mean: Float64Array, knots: readonly number[], N: number): Float64Array {
  const K = knots.length, out = new Float64Array(N * K * 3);
  knots.forEach((k, q) => {
    for (let n = 0; n < N; n++)
      for (let a = 0; a < 3; a++) {
        const o = (k * N + n) * STATE_SIZE + a;
        out[(n * K + q) * 3 + a] = win.future[o]! - mean[o]!;
      }
  });
  return out;
}

/** A readout fit of one model: the fit (null when there was nothing to fit on) and, when no readout was kept, why. */
export interface ReadoutOutcome {
  fit: ReadoutFit | null;
  /** Null when the readout was kept; else the reason it was not (the forecast is then the decoder's alone). */
  dropped: string | null;
}

/**
 * Fits `model.readout` from the training takes' windows (every `stride` steps, mirrored) with the ridge
 * weight picked on the held-out takes' windows (every `validStride` steps); every node's features reach
 * every receiver unless the model has no coupling. The readout is kept only where the held-out windows
 * show that it lowers the error at the knots; otherwise (or with too few windows of full history to fit
 * or judge it) `model.readout` is null and the outcome says why.
 */
export function fitModelReadout(model: CouplingModel, train: readonly TrainingTake[], valid: readonly TrainingTake[], stride: number, validStride: number): ReadoutOutcome {
  const senders: ReadoutSenders = model.config.noCoupling ? 'self' : 'all';
  model.readout = null;
  const history = `${(readoutHistory(model.config) / model.config.rate).toFixed(1)} s of history and 1 s of future`;
  const trainData = readoutData(model, train, stride, true);
  if (trainData.features.length < 2) return { fit: null, dropped: `no training window has ${history}` };
  const validData = readoutData(model, valid, validStride, false);
  if (validData.features.length === 0) return { fit: null, dropped: `no held-out window has ${history} to judge it on` };
  const fit = fitReadout(model.config, senders, trainData, validData);
  const best = Math.min(...fit.validError.map((e) => e.error));
  if (!(best < fit.validNone)) return { fit, dropped: 'it did not lower the held-out error' };
  model.readout = fit.readout;
  return { fit, dropped: null };
}

/** A readout outcome as a training summary reports it (errors in leg lengths). */
export interface ReadoutSummaryJson {
  kept: boolean;
  dropped: string | null;
  senders: ReadoutSenders | null;
  lambda: number | null;
  train_windows: number;
  valid_windows: number;
  valid_knot_error_before: number | null;
  valid_knot_error_after: number | null;
  valid_knot_error: { lambda: number; error: number }[];
}

/** Returns a readout outcome for a training summary: kept or why not, its weight and the held-out knot error before and after. */
export function readoutSummaryJson(o: ReadoutOutcome | null): ReadoutSummaryJson | null {
  if (!o) return null;
  const f = o.fit, after = f ? Math.min(...f.validError.map((e) => e.error)) : null;
  return {
    kept: o.dropped === null, dropped: o.dropped, senders: f?.readout.senders ?? null, lambda: o.dropped === null ? f!.readout.lambda : null,
    train_windows: f?.trainWindows ?? 0, valid_windows: f?.validWindows ?? 0,
    valid_knot_error_before: f?.validNone ?? null, valid_knot_error_after: after !== null && Number.isFinite(after) ? after : null,
    valid_knot_error: f?.validError ?? [],
  };
}
