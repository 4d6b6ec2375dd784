// A worker thread that computes one shard's gradient per training step. It rebuilds the model from the
// configuration and statistics it is given (so its parameter layout equals the main thread's), reads the
// current weights from a shared buffer before each step and writes its gradient into its own shared slot;
// the main thread reduces the slots in index order (parallel.ts). Same inputs, same code, same bits as
// the sequential step.
import { parentPort, workerData } from 'node:worker_threads';
import type { MotionStats } from '../motion/normalise.js';
import { Pcg32 } from '../nn/prng.js';
import { BatchBuilder, type TrainingTake, type WindowRef } from './batch.js';
import type { ModelConfig } from './config.js';
import { elboBackward, elboForward } from './elbo.js';
import { createModel } from './model.js';
import { createWorkspace } from './workspace.js';

/** What the main thread sends when it starts a shard worker. */
export interface ShardWorkerData {
  config: ModelConfig;
  stats: MotionStats;
  takes: TrainingTake[];
  shardSize: number;
  weights: SharedArrayBuffer;
  grad: SharedArrayBuffer;
}

/** One step's work for the worker. */
export interface ShardJob {
  refs: WindowRef[];
  groups: number[];
  noiseSeed: number;
  stream: number;
}

if (parentPort) {
  const data = workerData as ShardWorkerData;
  const model = createModel(data.config, data.stats, { seed: 1 });
  const ws = createWorkspace(model, data.shardSize);
  const builder = new BatchBuilder(data.config, data.stats, data.takes, data.shardSize, model.store);
  const weights = new Float32Array(data.weights), grad = new Float32Array(data.grad);
  const port = parentPort;
  port.on('message', (job: ShardJob) => {
    try {
      model.store.valueView().set(weights);
      model.store.zeroGrads();
      const b = builder.fill(job.refs, job.groups);
      const loss = elboForward(model, ws, b, new Pcg32(job.noiseSeed, job.stream)).total;
      elboBackward(model, ws, b);
      grad.set(model.store.gradView() as Float32Array);
      port.postMessage({ loss });
    } catch (e) {
      port.postMessage({ error: (e as Error).stack ?? String(e) });
    }
  });
}
