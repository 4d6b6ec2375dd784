// A worker thread that fits one model's pair readout and then calibrates its spread, so that after
// training the twin's post-fit work runs beside the model's (pair-fit.ts postFit). It rebuilds the
// model from its configuration, statistics, weights and readout (the same bits as the main thread's), runs the
// same code on the same takes and windows, and sends back the readout outcome and the spread.
import { parentPort, workerData } from 'node:worker_threads';
import type { MotionStats } from '../motion/normalise.js';
import type { TrainingTake } from './batch.js';
import type { ModelConfig } from './config.js';
import { createModel } from './model.js';
import { postFitOne, type PostFitResult } from './post-fit.js';
import type { PairReadout } from './readout.js';

/** What the main thread sends: the model and what postFitOne reads. */
export interface PostFitWorkerData {
  config: ModelConfig;
  stats: MotionStats;
  weights: Float32Array;
  /** The model's readout as it stands (kept when it is not refitted, so the spread is calibrated with it). */
  current: PairReadout | null;
  train: TrainingTake[];
  valid: TrainingTake[];
  calibration: TrainingTake[];
  stride: number;
  validStride: number;
  readout: boolean;
}

if (parentPort) {
  const d = workerData as PostFitWorkerData;
  try {
    const model = createModel(d.config, d.stats, { seed: 1 });
    model.store.valueView().set(d.weights);
    model.readout = d.current;
    const r: PostFitResult = postFitOne(model, d);
    parentPort.postMessage({ result: r });
  } catch (e) {
    parentPort.postMessage({ error: (e as Error).stack ?? String(e) });
  }
}
