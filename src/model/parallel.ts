// Training on several cores: shard 0 of every step runs on the calling thread, shards 1 … n − 1 on worker
// threads (shard-worker.ts), each from the same weights (a shared buffer) and its own noise stream; the
// shard gradients are then reduced in index order. The result is bit-identical to the sequential step
// runner of train.ts, so `trainParallel` and `train` give the same weights for one seed.
import { Worker } from 'node:worker_threads';
import { reduceInOrder } from '../nn/params.js';
import { Pcg32 } from '../nn/prng.js';
import type { Buf } from '../nn/types.js';
import { elboBackward, elboForward } from './elbo.js';
import type { CouplingModel } from './model.js';
import type { ShardJob, ShardWorkerData } from './shard-worker.js';
import { workerEntry } from './worker-entry.js';
import { prepareTraining, trainingLoop, type StepRequest, type TrainingContext, type TrainingSummary, type TrainOptions } from './train.js';

/** A step runner whose shards beyond the first run on worker threads. */
export interface ParallelRunner {
  /** Returns the mean loss after computing the batch's gradient into the store. */
  gradient(req: StepRequest): Promise<number>;
  close(): Promise<void>;
}

/** Returns a parallel runner for a prepared training run (ctx.shards − 1 worker threads). */
export function createParallelRunner(ctx: TrainingContext): ParallelRunner {
  const { model, runner, shards, batchSize } = ctx;
  if (!(model.store.values instanceof Float32Array)) throw new RangeError('parallel training runs in float32');
  const per = batchSize / shards, size = model.store.size;
  const weightsShared = new SharedArrayBuffer(size * 4);
  const weights = new Float32Array(weightsShared);
  const entry = workerEntry('shard-worker');
  const workers = Array.from({ length: shards - 1 }, () => {
    const grad = new SharedArrayBuffer(size * 4);
    const data: ShardWorkerData = { config: model.config, stats: model.stats, takes: ctx.trainTakes, shardSize: per, weights: weightsShared, grad };
    const worker = new Worker(entry.code, { workerData: data, eval: entry.eval });
    worker.unref();
    return { worker, grad: new Float32Array(grad) };
  });
  const ask = (w: (typeof workers)[number], job: ShardJob): Promise<number> =>
    new Promise((resolve, reject) => {
      const onMessage = (m: { loss?: number; error?: string }) => {
        w.worker.off('error', onError);
        if (m.error !== undefined) reject(new Error(`shard worker failed: ${m.error}`));
        else resolve(m.loss!);
      };
      const onError = (e: Error) => {
        w.worker.off('message', onMessage);
        reject(e);
      };
      w.worker.once('message', onMessage);
      w.worker.once('error', onError);
      w.worker.postMessage(job);
    });
  return {
    async gradient(req) {
      weights.set(model.store.valueView() as Float32Array);
      const pending = workers.map((w, k) => {
        const i = k + 1;
        return ask(w, { refs: req.refs.slice(i * per, (i + 1) * per), groups: req.groups.slice(i * per, (i + 1) * per), noiseSeed: req.noiseSeed, stream: i + 1 });
      });
      const s0 = runner.shards[0]!;
      model.store.zeroGrads();
      const b = s0.builder.fill(req.refs.slice(0, per), req.groups.slice(0, per));
      let loss = elboForward(model, s0.ws, b, new Pcg32(req.noiseSeed, 1)).total;
      elboBackward(model, s0.ws, b);
      s0.grad.set(model.store.gradView() as never);
      for (const l of await Promise.all(pending)) loss += l;
      const parts: Buf[] = [s0.grad, ...workers.map((w) => w.grad)];
      const g = model.store.gradView();
      reduceInOrder(parts, g, size);
      const inv = 1 / shards;
      for (let i = 0; i < size; i++) g[i] = g[i]! * inv;
      return loss * inv;
    },
    async close() {
      await Promise.all(workers.map((w) => w.worker.terminate()));
    },
  };
}

/** Returns a trained model and its summary with the shards on worker threads (same weights as train for one seed). */
export async function trainParallel(takes: Parameters<typeof prepareTraining>[0], options: TrainOptions = {}): Promise<{ model: CouplingModel; summary: TrainingSummary }> {
  const ctx = prepareTraining(takes, options);
  if (ctx.shards < 2) {
    const run = trainingLoop(ctx, options);
    let r = run.next();
    while (!r.done) r = run.next(ctx.runner.gradient(r.value.refs, r.value.groups, r.value.noiseSeed));
    return r.value;
  }
  const par = createParallelRunner(ctx);
  try {
    const run = trainingLoop(ctx, options);
    let r = run.next();
    while (!r.done) r = run.next(await par.gradient(r.value));
    return r.value;
  } finally {
    await par.close();
  }
}
