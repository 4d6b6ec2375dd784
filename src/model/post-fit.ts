// After training: the pair readout of the model and of its twin, then the spread calibration of each
// (the readout changes the forecast the spread is calibrated on). The two models' work is independent,
// so with two threads the twin's runs on a worker thread (post-fit-worker.ts) while the model's runs
// here, the worker first making half of the model's readout training data (the model's part is the
// longer); the results are the same bits as one after the other.
import { Worker } from 'node:worker_threads';
import { windowsOf, type Window } from '../motion/window.js';
import type { TrainingTake } from './batch.js';
import { calibrateSpread } from './calibrate.js';
import { modelWindowOptions } from './config.js';
import type { CouplingModel } from './model.js';
import { modelSpec } from './model-spec.js';
import type { PostFitWorkerData, PostFitWorkerMessage } from './post-fit-worker.js';
import type { ReadoutData } from './readout.js';
import { fitModelReadout, mergeReadoutData, readoutTrainingData, type ReadoutOutcome } from './readout-fit.js';
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

/** Whether postFitOne fits the model's readout (asked, and the model has the stride prior whose forecast it reads). */
export function fitsReadout(model: CouplingModel, input: PostFitInput): boolean {
  return input.readout && model.config.stridePrior;
}

/**
 * Fits the model's readout (when fitsReadout) and calibrates its spread; the model is updated in place.
 * `trainingData`: the readout's training data, when already made (readoutTrainingData).
 */
export function postFitOne(model: CouplingModel, input: PostFitInput, trainingData?: ReadoutData): PostFitResult {
  const readout = fitsReadout(model, input) ? fitModelReadout(model, input.train, input.valid, input.stride, input.validStride, trainingData) : null;
  const wins = fullHistoryWindows(input.calibration, model, input.validStride);
  if (wins.length) calibrateSpread(model, wins);
  return { readout, spreadScale: model.spreadScale, spreadAdapt: model.spreadAdapt, windows: wins.length };
}

/**
 * Returns the model's and the twin's post-fit results. With `threads` > 1 a worker thread first makes
 * half of the model's readout training data (its costliest part: a decoded forecast per window) while
 * this thread makes the other half, then runs the twin's post-fit while this thread fits and calibrates
 * the model; the results are the same bits as on one thread.
 */
export async function postFit(model: CouplingModel, twin: CouplingModel | null, input: PostFitInput, threads: number): Promise<{ model: PostFitResult; twin: PostFitResult | null }> {
  const share = threads > 1 && fitsReadout(model, input);
  if (threads < 2 || (!twin && !share)) return { model: postFitOne(model, input), twin: twin ? postFitOne(twin, input) : null };
  const worker = onWorker(share ? model : null, twin, input);
  // The worker's promises settle on events, so this thread's (synchronous) work runs beside it.
  let mine: PostFitResult;
  try {
    let trainingData: ReadoutData | undefined;
    if (share) {
      const here = readoutTrainingData(model, input.train, input.stride, { index: 0, of: 2 });
      trainingData = mergeReadoutData([here, await worker.share]);
    }
    mine = postFitOne(model, input, trainingData);
  } catch (e) {
    // Do not leave the worker running (or its failure unobserved) when this thread's part fails.
    await worker.stop();
    throw e;
  }
  const theirs = await worker.result;
  if (twin && theirs) {
    if (theirs.readout) twin.readout = theirs.readout.dropped === null ? theirs.readout.fit!.readout : null;
    twin.spreadScale = theirs.spreadScale;
    twin.spreadAdapt = theirs.spreadAdapt;
  }
  return { model: mine, twin: theirs };
}

/**
 * Starts the worker thread: the share of `helped`'s readout training data (readoutData part 1 of 2; when
 * given), then postFitOne for `twin` (when given; the twin itself is not changed). Returns both results and
 * a way to stop it.
 */
function onWorker(helped: CouplingModel | null, twin: CouplingModel | null, input: PostFitInput): { share: Promise<ReadoutData>; result: Promise<PostFitResult | null>; stop: () => Promise<void> } {
  const entry = workerEntry('post-fit-worker');
  const data: PostFitWorkerData = {
    helped: helped ? modelSpec(helped) : null, twin: twin ? modelSpec(twin) : null,
    train: [...input.train], valid: [...input.valid], calibration: [...input.calibration], stride: input.stride, validStride: input.validStride, readout: input.readout,
  };
  const worker = new Worker(entry.code, { workerData: data, eval: entry.eval });
  let resolveShare!: (d: ReadoutData) => void, rejectShare!: (e: unknown) => void;
  const share = new Promise<ReadoutData>((resolve, reject) => { resolveShare = resolve; rejectShare = reject; });
  const result = new Promise<PostFitResult | null>((resolve, reject) => {
    const fail = (e: unknown) => {
      rejectShare(e);
      reject(e);
    };
    worker.on('message', (m: PostFitWorkerMessage) => {
      if (m.error !== undefined) {
        void worker.terminate();
        fail(new Error(`post-fit worker failed: ${m.error}`));
      } else if (m.share) resolveShare(m.share);
      else {
        void worker.terminate();
        resolve(m.result ?? null);
      }
    });
    worker.once('error', fail);
    worker.once('exit', (code) => fail(new Error(`post-fit worker stopped (exit code ${code}) before it answered`)));
  });
  // Either may go unawaited (no share asked, or this thread failed first): their rejections are seen by stop or result.
  share.catch(() => undefined);
  return {
    share,
    result,
    stop: async () => {
      result.catch(() => undefined);
      await worker.terminate();
    },
  };
}
