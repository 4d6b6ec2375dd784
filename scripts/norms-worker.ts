// Worker thread of scripts/train-default-model.ts: the factor summaries of a share of the normative
// cohort (src/synth/cohort.ts) under a model rebuilt from its spec (src/model/model-spec.ts: the same
// bits as the main thread's), while the main thread does the other share.
import { parentPort, workerData } from 'node:worker_threads';
import type { TakeFactors } from '../src/analysis/factors.js';
import { modelFromSpec, type ModelSpec } from '../src/model/model-spec.js';
import { normativeCohort } from '../src/synth/cohort.js';
import { walkerFactors } from './model-cohort.js';

/** What the main thread sends: the model and the cohort indices [from, to) of this share. */
export interface NormsWorkerData { model: ModelSpec; from: number; to: number }

if (parentPort) {
  const d = workerData as NormsWorkerData;
  try {
    const model = modelFromSpec(d.model);
    const factors: TakeFactors[] = walkerFactors(model, normativeCohort().slice(d.from, d.to));
    parentPort.postMessage({ factors });
  } catch (e) {
    parentPort.postMessage({ error: (e as Error).stack ?? String(e) });
  }
}
