// Benchmark section: the coupling model of src/model itself (default configuration) on synthetic walks:
// one training step of 16 windows (forward, backward over both shards with the in-order reduction,
// clipping and Adam), its forward and backward parts, and a 1-s forecast with 20 samples. The TensorFlow.js
// comparison of a representative model lives in train-step.ts; this section times the real model.
import { Adam, clipGlobalNorm } from '../../src/nn/adam.js';
import { Pcg32 } from '../../src/nn/prng.js';
import { windowRefs, type TrainingTake } from '../../src/model/batch.js';
import { modelWindowOptions, resolveModelConfig, type ModelConfig } from '../../src/model/config.js';
import { elboBackward, elboForward } from '../../src/model/elbo.js';
import { createForecaster, forecast } from '../../src/model/forecast.js';
import { createModel } from '../../src/model/model.js';
import { createStepRunner, prepareTraining, statsOfTakes } from '../../src/model/train.js';
import { createParallelRunner } from '../../src/model/parallel.js';
import { median } from './stats.js';
import { makeWindow } from '../../src/motion/window.js';
import { trackFromImported } from '../../src/motion/track.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake } from '../../src/synth/index.js';
import { measure } from './stats.js';
import { ratio, type Row, type Section } from './report.js';

export interface ModelStepOptions {
  reps: number;
  config?: Partial<ModelConfig>;
}

/** Returns the section: ms per training step of 16 windows (one thread and two), its parts, and the forecast time. */
export async function runModelStep(opts: ModelStepOptions): Promise<Section> {
  const takes: TrainingTake[] = [11, 12].map((s) => ({
    track: trackFromImported(resolveImported(`bench-walker-${s}.bvh`, synthesizeTake({ seed: s, duration: 20, frameRate: 60 }).take)),
    subject: `bench-walker-${s}`,
  }));
  const config = resolveModelConfig(opts.config ?? {});
  const model = createModel(config, statsOfTakes(takes, config), { seed: 1 });
  const runner = createStepRunner(model, takes, 16, 2);
  const refs = windowRefs(takes, config, 3).slice(0, 16);
  const groups = refs.map((_, i) => i >> 1);
  const adam = new Adam(model.store.size, { lr: 1e-3 }, model.store.values);
  const noise = new Pcg32(1, 2);
  let k = 0;
  const step = () => {
    const loss = runner.gradient(refs, groups, ++k);
    clipGlobalNorm(model.store.gradView(), 5);
    adam.step(model.store.valueView(), model.store.gradView());
    return loss;
  };
  const tStep = measure(step, 1, opts.reps);
  // The same step with shard 1 on a worker thread.
  const ctx = prepareTraining(takes, { config: opts.config ?? {}, batchSize: 16, shards: 2, validSubjects: [] });
  const par = createParallelRunner(ctx);
  const adam2 = new Adam(ctx.model.store.size, { lr: 1e-3 }, ctx.model.store.values);
  const times: number[] = [];
  try {
    for (let i = 0; i <= opts.reps; i++) {
      const t0 = process.hrtime.bigint();
      await par.gradient({ refs, groups, noiseSeed: i });
      clipGlobalNorm(ctx.model.store.gradView(), 5);
      adam2.step(ctx.model.store.valueView(), ctx.model.store.gradView());
      if (i > 0) times.push(Number(process.hrtime.bigint() - t0) / 1e6);
    }
  } finally {
    await par.close();
  }
  times.sort((a, b) => a - b);
  const tPar = median(times);
  const shard = runner.shards[0]!;
  const batch = shard.builder.fill(refs.slice(0, 8), groups.slice(0, 8));
  const tFwd = measure(() => elboForward(model, shard.ws, batch, noise).total, 1, opts.reps);
  const tBwd = measure(() => { elboBackward(model, shard.ws, batch); return 0; }, 1, opts.reps);
  // The window as `forecast` makes it (the stride prior's 5-s history); steady state, as `--every` runs.
  const win = makeWindow(takes[0]!.track, 200, modelWindowOptions(config));
  const fc = createForecaster(model, 20);
  const tFc = measure(() => forecast(model, win, { samples: 20 }, fc).mean[0]!, 5, 15);
  const P = config.nodes * (config.nodes - 1);
  const rows: Row[] = [
    { name: 'src/model step', value: tStep.median * 1e3, unit: 'ms', note: `median of ${tStep.reps}; 16 windows as 2 shards of 8 reduced in order, 1 thread` },
    { name: 'src/model step, 2 threads', value: tPar, unit: 'ms', note: `median of ${times.length}; shard 1 on a worker thread, same bits as 1 thread` },
    { name: 'forward (8 windows)', value: tFwd.median * 1e3, unit: 'ms', note: 'encoder, teacher-forced decoder, rollout, KL' },
    { name: 'backward (8 windows)', value: tBwd.median * 1e3, unit: 'ms', note: 'through the rollout and the encoder' },
    { name: 'forecast 1 s, 20 samples', value: tFc.median * 1e3, unit: 'ms', note: `median of ${tFc.reps} after 5 warm-up runs, forecaster reused, 5-s history` },
    { name: 'params', value: model.store.size, unit: '', note: `${config.nodes} nodes, ${P} pairs, hidden ${config.hidden}, ${config.observe} observed, ${config.forecast} forecast steps` },
  ];
  return {
    title: 'coupling model (src/model, default configuration)',
    rows,
    ratios: [ratio('forecast 1 s with 20 samples, ms', tFc.median * 1e3, '<=', 100, 'issue target')],
    notes: ['the same-model TensorFlow.js twin is not built yet; train-step.ts compares a representative model'],
  };
}
