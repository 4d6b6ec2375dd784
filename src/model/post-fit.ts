// After training: the pair readout of the model and of its twin, then the spread calibration of each
// (the readout changes the forecast the spread is calibrated on). The two models' work is independent,
// so with two threads the twin's runs on a worker thread (post-fit-worker.ts) while the model's runs
// here; the results are the same bits as one after the other.
import { Worker } from 'node:worker_threads';
import { windowsOf, type Window } from '../motion/window.js';
import type { TrainingTake } from './batch.js';
import { calibrateSpread } from './calibrate.js';
import { modelWindowOptions } from './config.js';
import type { CouplingModel } from './model.js';
import type { PostFitWorkerData } from './post-fit-worker.js';
import { fitModelReadout, type ReadoutOutcome } from './readout-fit.js';
import { workerEntry } from './worker-entry.js';

/** What postFitOne reads besides the model. */
export interface PostFitInput {
  /** Training and held-out takes of the readout fit (windows every `stride` and `validStride` steps). */
  train: readonly TrainingTake[];
  valid: readonly TrainingTake[];
  /** Takes whose windows (every `validStride` steps, full causal history) calibrate the spread: the held-out ones, then any others never trained on. */
  calibration: readonly TrainingTake[];
  stride: number;
  validStride: number;
  /** Fit the readout (false: keep the model's own and only recalibrate). */
  readout: boolean;
}

/** One model's post-fit outcome: its readout fit (null when not refitted) and its calibrated spread. */
export interface PostFitResult {
  readout: ReadoutOutcome | null;
  spreadScale: number;
  spreadAdapt: CouplingModel['spreadAdapt'];
  /** Windows the spread was calibrated on. */
  windows: number;
}

/** Returns the windows of `takes` every `stride` steps that have their full causal history and future. */
export function fullHistoryWindows(takes: readonly TrainingTake[], model: CouplingModel, stride: number): Window[] {
  const c = model.config, first = c.stridePrior ? c.priorHistory : c.observe;
  const out: Window[] = [];
  for (const t of takes)
    for (const w of windowsOf(t.track, stride, modelWindowOptions(c))) if (w.futureSteps === c.forecast && w.endObservedStep >= first) out.push(w);
  return out;
}

/** Fits the model's readout (when asked and it has the stride prior) and calibrates its spread; the model is updated in place. */
export function postFitOne(model: CouplingModel, input: PostFitInput): PostFitResult {
  const readout = input.readout && model.config.stridePrior ? fitModelReadout(model, input.train, input.valid, input.stride, input.validStride) : null;
  const wins = fullHistoryWindows(input.calibration, model, input.validStride);
  if (wins.length) calibrateSpread(model, wins);
  return { readout, spreadScale: model.spreadScale, spreadAdapt: model.spreadAdapt, windows: wins.length };
}

/** Returns the model's and the twin's post-fit results, the twin's on a worker thread when `threads` > 1. */
export async function postFit(model: CouplingModel, twin: CouplingModel | null, input: PostFitInput, threads: number): Promise<{ model: PostFitResult; twin: PostFitResult | null }> {
  if (!twin) return { model: postFitOne(model, input), twin: null };
  if (threads < 2) return { model: postFitOne(model, input), twin: postFitOne(twin, input) };
  const worker = onWorker(twin, input);
  // The worker's promise settles on an event, so the model's (synchronous) work here runs beside it.
  let mine: PostFitResult;
  try {
    mine = postFitOne(model, input);
  } catch (e) {
    // Do not leave the worker running (or its failure unobserved) when this thread's part fails.
    await worker.stop();
    throw e;
  }
  const theirs = await worker.result;
  if (theirs.readout) twin.readout = theirs.readout.dropped === null ? theirs.readout.fit!.readout : null;
  twin.spreadScale = theirs.spreadScale;
  twin.spreadAdapt = theirs.spreadAdapt;
  return { model: mine, twin: theirs };
}

/** Starts postFitOne for `model` on a worker thread: its result (the model itself is not changed), and a way to stop it. */
function onWorker(model: CouplingModel, input: PostFitInput): { result: Promise<PostFitResult>; stop: () => Promise<void> } {
  const entry = workerEntry('post-fit-worker');
  const data: PostFitWorkerData = {
    config: model.config, stats: model.stats, weights: Float32Array.from(model.store.valueView()), current: model.readout,
    train: [...input.train], valid: [...input.valid], calibration: [...input.calibration], stride: input.stride, validStride: input.validStride, readout: input.readout,
  };
  const worker = new Worker(entry.code, { workerData: data, eval: entry.eval });
  const result = new Promise<PostFitResult>((resolve, reject) => {
    worker.once('message', (m: { result?: PostFitResult; error?: string }) => {
      void worker.terminate();
      if (m.error !== undefined) reject(new Error(`post-fit worker failed: ${m.error}`));
      else resolve(m.result!);
    });
    worker.once('error', reject);
    worker.once('exit', (code) => reject(new Error(`post-fit worker stopped (exit code ${code}) before it answered`)));
  });
  return {
    result,
    stop: async () => {
      result.catch(() => undefined);
      await worker.terminate();
    },
  };
}
