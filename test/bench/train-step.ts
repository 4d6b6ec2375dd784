// Benchmark section: one training step (forward, backward, clipping, Adam) of the representative coupling
// model on 16 windows, the src/nn kernels side by side with the same model in TensorFlow.js on its wasm
// and cpu backends, in one run. The model is test/nn/support/step-model.ts (and its TensorFlow.js twin,
// shown equal in loss and gradients by test/nn/step-model.test.ts); src/model's final model replaces it.
import { createRequire } from 'node:module';
import { loadavg } from 'node:os';
import { dirname } from 'node:path';
import * as tf from '@tensorflow/tfjs';
import { getThreadsCount, setWasmPaths } from '@tensorflow/tfjs-backend-wasm';
import { BENCH_CONFIG, StepModel, syntheticBatch, type StepConfig } from '../nn/support/step-model.js';
import { TfStepModel, toTfLayout } from '../nn/support/step-model-tf.js';
import { activate, activateBackward } from '../../src/nn/activations.js';
import { causalConvBackward, causalConvForward, createCausalConv } from '../../src/nn/causal-conv.js';
import { createGru, createGruCache, gruBackward, gruForward } from '../../src/nn/gru.js';
import { ParamStore } from '../../src/nn/params.js';
import { Pcg32 } from '../../src/nn/prng.js';
import { measureInterleaved, type Timing } from './stats.js';
import { ratio, type Row, type Section } from './report.js';

export interface TrainStepOptions {
  /** Timed repetitions for the kernels and TF.js wasm; cpu gets fewer. */
  reps: number;
  cpuReps: number;
  config?: StepConfig;
}

const LR = 1e-3;

/** Returns a timed TF.js training step on the backend, and the twin's loss on the kernel model's weights and noise. */
async function tfStep(
  backend: 'wasm' | 'cpu', cfg: StepConfig, mine: StepModel, x: Float32Array,
): Promise<{ step: () => number; gap: number; threads: number; dispose: () => void }> {
  await tf.setBackend(backend);
  await tf.ready();
  const twin = new TfStepModel(cfg, mine.store, mine.basePairs);
  const { epsS, epsD } = mine.noise();
  const inp = toTfLayout(cfg, x, epsS, epsD);
  const opt = tf.train.adam(LR);
  const vars = twin.varList();
  const P = cfg.nodes * (cfg.nodes - 1);
  const sShape = [P * cfg.windows, cfg.staticDims], dShape = [P * cfg.steps * cfg.windows, cfg.dynamicDims];
  // Same-work check: both losses on the kernel model's current weights and noise.
  const mineLoss = mine.forward(x);
  const loss = tf.tidy(() => twin.loss(inp.x, inp.epsS, inp.epsD).dataSync()[0]!);
  const step = () =>
    tf.tidy(() => {
      const cost = opt.minimize(() => twin.loss(inp.x, tf.randomNormal(sShape), tf.randomNormal(dShape)), true, vars);
      return cost!.dataSync()[0]!;
    });
  const dispose = () => {
    tf.dispose([inp.x, inp.epsS, inp.epsD, ...vars]);
    opt.dispose();
  };
  return { step, gap: Math.abs(loss - mineLoss) / Math.abs(mineLoss), threads: backend === 'wasm' ? getThreadsCount() : 1, dispose };
}

/**
 * Returns the timings of the two per-node temporal encoders on the bench's shape, forward and backward:
 * the GRU, and a causal convolution stack of the same width (kernel 3, dilations 1, 2, 4, 8: 31 steps of
 * receptive field, tanh between layers).
 */
function encoderChoice(cfg: StepConfig, reps: number): { gru: Timing; conv: Timing } {
  const rows = cfg.windows * cfg.nodes, T = cfg.steps, F = cfg.features, H = cfg.hidden;
  const rng = new Pcg32(3, 9), store = new ParamStore();
  const x = new Float32Array(T * rows * F).map(() => rng.gauss());
  const dOut = new Float32Array(T * rows * H).map(() => rng.gauss());
  const gru = createGru(store, 'g', F, H, rng), cache = createGruCache(store, gru, rows, T);
  const convs = [1, 2, 4, 8].map((d, i) => createCausalConv(store, `c${i}`, i === 0 ? F : H, H, 3, d, rng));
  const acts = convs.map(() => new Float32Array(T * rows * H)), grads = convs.map(() => new Float32Array(T * rows * H));
  const runConv = () => {
    let input = x;
    convs.forEach((c, i) => {
      causalConvForward(c, input, acts[i]!, T, rows);
      activate('tanh', acts[i]!, acts[i]!, T * rows * H);
      input = acts[i]!;
    });
    let g = dOut;
    for (let i = convs.length - 1; i >= 0; i--) {
      activateBackward('tanh', acts[i]!, acts[i]!, g, grads[i]!, T * rows * H);
      const dx = i > 0 ? grads[i - 1]!.fill(0) : null;
      causalConvBackward(convs[i]!, i > 0 ? acts[i - 1]! : x, grads[i]!, dx, T, rows);
      if (dx) g = dx;
    }
    return acts[3]!;
  };
  const runGru = () => {
    gruForward(gru, x, null, cache);
    return gruBackward(gru, x, cache, dOut, null, null);
  };
  const t = measureInterleaved({ gru: runGru, conv: runConv }, 1, reps);
  return { gru: t['gru']!, conv: t['conv']! };
}

/** Returns the training-step section: timings of the three implementations and the target ratio vs wasm. */
export async function runTrainStep(opts: TrainStepOptions): Promise<Section> {
  const cfg = opts.config ?? BENCH_CONFIG;
  const notes: string[] = [];
  const x = syntheticBatch(cfg, 7);
  const mine = new StepModel(cfg, 1, LR);
  mine.rng.fillGauss(mine.noise().epsS);
  mine.rng.fillGauss(mine.noise().epsD);

  // Each TF.js backend is timed round-robin with the kernel model (one step of each per round), so a change
  // of machine load during the run falls on both sides of each ratio alike.
  const require = createRequire(import.meta.url);
  setWasmPaths(dirname(require.resolve('@tensorflow/tfjs-backend-wasm/dist/tfjs-backend-wasm.wasm')) + '/');
  const wasm = await tfStep('wasm', cfg, mine, x);
  const vsWasm = measureInterleaved({ mine: () => mine.trainStep(x), tf: wasm.step }, 1, opts.reps);
  wasm.dispose();
  const cpu = await tfStep('cpu', cfg, mine, x);
  const vsCpu = measureInterleaved({ mine: () => mine.trainStep(x), tf: cpu.step }, 1, opts.cpuReps);
  cpu.dispose();
  const tMine = vsWasm['mine']!, tWasm = vsWasm['tf']!, tCpu = vsCpu['tf']!, tMineCpu = vsCpu['mine']!;

  const enc = encoderChoice(cfg, 5);

  const P = cfg.nodes * (cfg.nodes - 1);
  const shape = `${cfg.windows} windows, ${cfg.nodes} nodes, ${P} pairs, hidden ${cfg.hidden}, GRU over ${cfg.steps} steps, decoder ${cfg.decoderSteps} steps`;
  const rows: Row[] = [
    { name: 'src/nn step', value: tMine.median * 1e3, unit: 'ms', note: `median of ${tMine.reps}, 1 thread` },
    { name: 'TF.js wasm step', value: tWasm.median * 1e3, unit: 'ms', note: `median of ${tWasm.reps}, ${wasm.threads} thread(s)` },
    { name: 'TF.js cpu step', value: tCpu.median * 1e3, unit: 'ms', note: `median of ${tCpu.reps}` },
    { name: 'src/nn step (cpu rounds)', value: tMineCpu.median * 1e3, unit: 'ms', note: 'timed round-robin with TF.js cpu' },
    { name: 'encoder: GRU', value: enc.gru.median * 1e3, unit: 'ms', note: `forward + backward, ${cfg.windows * cfg.nodes} rows × ${cfg.steps} steps, hidden ${cfg.hidden}` },
    { name: 'encoder: causal conv', value: enc.conv.median * 1e3, unit: 'ms', note: 'same shape, 4 layers, kernel 3, dilations 1 2 4 8 (receptive field 31 steps)' },
    { name: 'params', value: mine.store.size, unit: '', note: shape },
  ];
  const lossGap = Math.max(wasm.gap, cpu.gap);
  rows.push({ name: 'same-work loss gap', value: lossGap, unit: 'rel', note: 'src/nn vs TF.js (wasm, cpu) on the same weights and noise' });
  // TF.js reduces its sums in float32 (src/nn in float64); over the ~1.3 million KL terms of the bench batch
  // that alone gives gaps near 5e-4, so the alarm is set at 5e-3.
  if (lossGap > 5e-3) notes.push(`the TF.js loss differs from src/nn's by ${lossGap.toExponential(2)} (relative): the models are not doing the same work`);
  notes.push(`each ratio timed round-robin (one step of each side per round); load average at the end ${loadavg().map((v) => v.toFixed(1)).join(' ')}`);
  notes.push('step = forward + backward + Adam on both sides; src/nn also draws its noise (PCG32) and clips by global norm');
  notes.push('representative model of test/nn/support/step-model.ts (teacher-forced decoder, no rollout loss); the final src/model model may differ');
  return {
    title: 'training step (coupling model, 16 windows)',
    rows,
    ratios: [
      ratio('TF.js wasm / src/nn', tWasm.median / tMine.median, '>=', 1.5, 'speed-up over the wasm backend'),
      ratio('TF.js cpu / src/nn', tCpu.median / tMineCpu.median, '>=', 1, 'reported against the cpu backend'),
    ],
    notes,
  };
}
