// The post-fit worker thread (post-fit.ts postFit): it makes one half of the model's readout training
// data while the main thread makes the other, then fits the twin's pair readout and calibrates its spread
// while the main thread does the model's. It rebuilds each model from its spec (model-spec.ts: the same
// bits as the main thread's), runs the same code on the same takes and
// windows, and sends back the share, then the twin's readout outcome and spread.
import { parentPort, workerData } from 'node:worker_threads';
import type { TrainingTake } from './batch.js';
import { modelFromSpec, type ModelSpec } from './model-spec.js';
import { postFitOne, type PostFitResult } from './post-fit.js';
import type { ReadoutData } from './readout.js';
import { readoutTrainingData } from './readout-fit.js';

/** What the main thread sends: the model whose readout training data it shares (or null), the twin (or null), and what postFitOne reads. */
export interface PostFitWorkerData {
  helped: ModelSpec | null;
  twin: ModelSpec | null;
  train: TrainingTake[];
  valid: TrainingTake[];
  calibration: TrainingTake[];
  stride: number;
  validStride: number;
  readout: boolean;
}

/** What the worker answers: first the share (when asked), then the twin's result (null without a twin), or an error. */
export interface PostFitWorkerMessage { share?: ReadoutData; result?: PostFitResult | null; error?: string }

if (parentPort) {
  const d = workerData as PostFitWorkerData;
  try {
    if (d.helped) parentPort.postMessage({ share: readoutTrainingData(modelFromSpec(d.helped), d.train, d.stride, { index: 1, of: 2 }) } satisfies PostFitWorkerMessage);
    const result: PostFitResult | null = d.twin ? postFitOne(modelFromSpec(d.twin), d) : null;
    parentPort.postMessage({ result } satisfies PostFitWorkerMessage);
  } catch (e) {
    parentPort.postMessage({ error: (e as Error).stack ?? String(e) } satisfies PostFitWorkerMessage);
  }
}
