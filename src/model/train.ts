// Training of the coupling model: normalisation statistics from the training takes (mirror-symmetric),
// a split of held-out subjects (by subject, never by window; with one subject only, each take's tail in
// time: split.ts), seeded shuffles into batches (pairs of windows of one take under match pairing, each
// pair mirrored or not), Adam with global-norm clipping, and early stopping on the held-out forecast error
// with the best weights kept.
//
// Determinism: every random draw comes from PCG32 streams derived from the seed, and each step computes
// the gradients of its sub-batches (shards) one after another into their own buffers, then sums them
// with reduceInOrder, so the same seed gives bit-identical weights however the shards are later spread
// over worker threads.
import { InputError } from '../errors/index.js';
import { statsOfWindows, type MotionStats } from '../motion/normalise.js';
import { windowsOf } from '../motion/window.js';
import { Adam, clipGlobalNorm } from '../nn/adam.js';
import { reduceInOrder } from '../nn/params.js';
import { allOrderedPairs } from '../nn/pairs.js';
import { Pcg32 } from '../nn/prng.js';
import type { Buf } from '../nn/types.js';
import { BatchBuilder, windowRefs, type TrainingTake, type WindowRef } from './batch.js';
import { resolveModelConfig, type ModelConfig } from './config.js';
import { elboBackward, elboForward, type LossReport } from './elbo.js';
import { createModel, type CouplingModel } from './model.js';
import { clampNoise, initNoiseFromData } from './noise.js';
import { standardiseSignatures, takeSignature } from './signature.js';
import { heldOutSplit, type HeldOutKind } from './split.js';
import { forecastProbe, probeError } from './validate.js';
import { createWorkspace, type Workspace } from './workspace.js';

/** What a progress callback is told after every step and every validation. */
export interface TrainProgress {
  epoch: number;
  epochs: number;
  step: number;
  stepsPerEpoch: number;
  trainLoss: number;
  /** Held-out loss of the latest finished epoch (NaN before the first). */
  validLoss: number;
  phase: 'train' | 'validate';
}

/** Options of train; every field but the takes has a default. */
export interface TrainOptions {
  config?: Partial<ModelConfig>;
  seed?: number;
  epochs?: number;
  /** Windows per step (default 16; even under match pairing). */
  batchSize?: number;
  /** Sub-batches whose gradients are reduced in order (default 2, one per core). */
  shards?: number;
  learningRate?: number;
  clipNorm?: number;
  /** Steps between the last observed steps of successive training windows (default 3). */
  windowStride?: number;
  /** Cap on steps per epoch (default: all windows once). */
  maxStepsPerEpoch?: number;
  /**
   * Subjects held out for early stopping; default: every fifth subject in sorted order (at least one when
   * there are two or more), or with one subject only the last quarter of each take in time (split.ts).
   */
  validSubjects?: readonly string[];
  /** Epochs without a better held-out loss before stopping (default 3). */
  patience?: number;
  /** Left/right mirror augmentation (default true). */
  mirror?: boolean;
  /**
   * What early stopping watches on the held-out subjects: 'forecast' (default), the mean forecast's
   * per-joint error (validate.ts; the untrained start's is recorded first for reference), or 'loss', the ELBO.
   */
  stopOn?: 'forecast' | 'loss';
  /** Statistics to use instead of computing them from the training takes. */
  stats?: MotionStats;
  onProgress?: (p: TrainProgress) => void;
}

/** What a training run did, stored in the model file. */
export interface TrainingSummary {
  seed: number;
  epochs: number;
  steps: number;
  bestEpoch: number;
  trainSubjects: string[];
  validSubjects: string[];
  /** Whole subjects held out, or (one subject only) each take's tail in time; absent in older files: subjects. */
  heldOut?: HeldOutKind;
  trainWindows: number;
  validWindows: number;
  trainLoss: number[];
  validLoss: number[];
  /** What early stopping watched, and the held-out forecast error (mm) before training and after each epoch (empty under 'loss'). */
  stopOn: 'forecast' | 'loss';
  validForecastMm: number[];
  /** Held-out loss terms at the best epoch (KL per dimension included). */
  best: LossReport | null;
  msPerStep: number;
}

/** Returns the normalisation statistics of the takes' windows (observed and future steps, mirrored copies added). */
export function statsOfTakes(takes: readonly TrainingTake[], config: ModelConfig, stride = 15): MotionStats {
  const t0 = takes[0];
  if (!t0) throw new InputError('no takes to compute normalisation statistics from');
  function* all() {
    for (const t of takes) if (t.track.steps > config.observe + config.forecast) yield* windowsOf(t.track, stride, { observe: config.observe, forecast: config.forecast });
  }
  return statsOfWindows(all(), t0.track.nodes, { nodeMirror: t0.track.nodeMirror });
}

/** Returns refs in a seeded Fisher-Yates order. */
function shuffle<T>(items: T[], rng: Pcg32): T[] {
  for (let i = items.length - 1; i > 0; i--) {
    const j = Math.floor(rng.next() * (i + 1));
    const t = items[i]!; items[i] = items[j]!; items[j] = t;
  }
  return items;
}

/** Returns batches of refs (and their groups): pairs of windows of one take under match pairing, else single windows. */
function makeBatches(refs: readonly WindowRef[], B: number, pairing: boolean, mirror: boolean, rng: Pcg32): { refs: WindowRef[]; groups: number[] }[] {
  const units: WindowRef[][] = [];
  if (pairing) {
    const byTake = new Map<number, WindowRef[]>();
    for (const r of refs) (byTake.get(r.take) ?? byTake.set(r.take, []).get(r.take)!).push(r);
    for (const list of byTake.values()) {
      shuffle(list, rng);
      for (let i = 0; i + 1 < list.length; i += 2) units.push([list[i]!, list[i + 1]!]);
    }
  } else for (const r of refs) units.push([r]);
  shuffle(units, rng);
  const per = pairing ? B / 2 : B, out: { refs: WindowRef[]; groups: number[] }[] = [];
  for (let i = 0; i + per <= units.length; i += per) {
    const batchRefs: WindowRef[] = [], groups: number[] = [];
    for (let u = 0; u < per; u++) {
      const m = mirror && rng.next() < 0.5;
      for (const r of units[i + u]!) { batchRefs.push({ ...r, mirrored: m }); groups.push(u); }
    }
    out.push({ refs: batchRefs, groups });
  }
  return out;
}

/** Returns the mean held-out loss over fixed batches (posterior noise from a fixed stream, so it is repeatable). */
export function evaluateLoss(model: CouplingModel, ws: Workspace, builder: BatchBuilder, batches: readonly { refs: WindowRef[]; groups: number[] }[], seed: number): LossReport | null {
  if (batches.length === 0) return null;
  const rng = new Pcg32(seed, 0x76616c);
  let acc: LossReport | null = null;
  for (const b of batches) {
    const r = elboForward(model, ws, builder.fill(b.refs, b.groups), rng);
    if (!acc) acc = { ...r, klStaticPerDim: [...r.klStaticPerDim], klDynamicPerDim: [...r.klDynamicPerDim] };
    else {
      for (const k of ['total', 'recon', 'rollout', 'klStatic', 'klDynamic', 'label', 'signature'] as const) acc[k] += r[k];
      r.klStaticPerDim.forEach((v, i) => (acc!.klStaticPerDim[i]! += v));
      r.klDynamicPerDim.forEach((v, i) => (acc!.klDynamicPerDim[i]! += v));
    }
  }
  const n = batches.length, a = acc!;
  for (const k of ['total', 'recon', 'rollout', 'klStatic', 'klDynamic', 'label', 'signature'] as const) a[k] /= n;
  a.klStaticPerDim = a.klStaticPerDim.map((v) => v / n);
  a.klDynamicPerDim = a.klDynamicPerDim.map((v) => v / n);
  return a;
}

/** One optimiser step's gradient machinery: a workspace, a batch builder and a gradient buffer per shard. */
export interface StepRunner {
  shards: { ws: Workspace; builder: BatchBuilder; grad: Buf }[];
  /**
   * Returns the mean loss after computing the batch's gradient into the store (shards reduced in order).
   * Shard i draws its noise from PCG32(noiseSeed, stream i + 1) alone, so a shard's gradient does not
   * depend on which thread or in which order it runs.
   */
  gradient(refs: readonly WindowRef[], groups: readonly number[], noiseSeed: number): number;
}

/** Returns a step runner for batches of `batch` windows split into `shards` equal sub-batches. */
export function createStepRunner(model: CouplingModel, takes: readonly TrainingTake[], batch: number, shards: number): StepRunner {
  if (batch % shards !== 0) throw new RangeError(`batch size ${batch} is not a multiple of ${shards} shards`);
  const per = batch / shards, size = model.store.size;
  const list = Array.from({ length: shards }, () => ({
    ws: createWorkspace(model, per), builder: new BatchBuilder(model.config, model.stats, takes, per, model.store), grad: model.store.alloc(size),
  }));
  return {
    shards: list,
    gradient(refs, groups, noiseSeed) {
      let loss = 0;
      list.forEach((s, i) => {
        model.store.zeroGrads();
        const b = s.builder.fill(refs.slice(i * per, (i + 1) * per), groups.slice(i * per, (i + 1) * per));
        loss += elboForward(model, s.ws, b, new Pcg32(noiseSeed, i + 1)).total;
        elboBackward(model, s.ws, b);
        s.grad.set(model.store.gradView() as never);
      });
      const g = model.store.gradView();
      reduceInOrder(list.map((s) => s.grad), g, size);
      const inv = 1 / shards;
      for (let i = 0; i < size; i++) g[i] = g[i]! * inv;
      return loss * inv;
    },
  };
}

/** One step's gradient request of the training loop: the batch and the step's noise seed. */
export interface StepRequest {
  refs: WindowRef[];
  groups: number[];
  noiseSeed: number;
}

/** Everything a training run is set up with, before its first step. */
export interface TrainingContext {
  model: CouplingModel;
  trainTakes: TrainingTake[];
  validTakes: TrainingTake[];
  batchSize: number;
  shards: number;
  /** How the held-out takes were chosen. */
  split: HeldOutKind;
  /** The sequential step runner (its first shard's buffers also serve validation). */
  runner: StepRunner;
}

/** Returns a trained model and its summary, on one thread; throws InputError when the takes give no training windows. */
export function train(takes: readonly TrainingTake[], options: TrainOptions = {}): { model: CouplingModel; summary: TrainingSummary } {
  const ctx = prepareTraining(takes, options);
  const run = trainingLoop(ctx, options);
  let r = run.next();
  while (!r.done) r = run.next(ctx.runner.gradient(r.value.refs, r.value.groups, r.value.noiseSeed));
  return r.value;
}

/**
 * Returns the takes with their standardised take signatures attached (signature.ts; statistics from the
 * training takes), or as given when the configuration has no signature term.
 */
export function withSignatures(train: readonly TrainingTake[], valid: readonly TrainingTake[], config: ModelConfig): { train: TrainingTake[]; valid: TrainingTake[] } {
  if (!(config.signatureWeight > 0) || config.noCoupling || train.length === 0) return { train: [...train], valid: [...valid] };
  const pairs = allOrderedPairs(config.nodes), all = [...train, ...valid];
  const std = standardiseSignatures(all.map((t) => takeSignature(t.track, config, pairs)), train.length);
  const out = all.map((t, i) => ({ ...t, signature: std[i] }));
  return { train: out.slice(0, train.length), valid: out.slice(train.length) };
}

/** Returns the model and data of a training run, checked, with the noise levels initialised from data. */
export function prepareTraining(takes: readonly TrainingTake[], options: TrainOptions = {}): TrainingContext {
  const config = resolveModelConfig(options.config);
  const seed = options.seed ?? 1, B = options.batchSize ?? 16, shards = options.shards ?? 2;
  if (B % shards !== 0) throw new RangeError(`batch size ${B} is not a multiple of ${shards} shards`);
  if (config.matchPairing && (B / shards) % 2 !== 0) throw new RangeError('under match pairing each shard needs an even number of windows');
  const off = takes.find((t) => t.track.rate !== config.rate || t.track.nodeCount !== config.nodes);
  if (off) throw new InputError(`${off.track.path}: the track has ${off.track.nodeCount} nodes at ${off.track.rate} Hz; the model needs ${config.nodes} nodes at ${config.rate} Hz`);
  const split = heldOutSplit(takes, config, options.validSubjects, B, options.windowStride ?? 3);
  const { train: trainTakes, valid: validTakes } = withSignatures(split.train, split.valid, config);
  if (trainTakes.length === 0) throw new InputError('every take belongs to a held-out subject; nothing is left to train on');
  const stats = options.stats ?? statsOfTakes(trainTakes, config);
  const model = createModel(config, stats, { seed });
  const trainRefs = windowRefs(trainTakes, config, options.windowStride ?? 3);
  if (trainRefs.length < B) throw new InputError(`the takes give ${trainRefs.length} training windows of ${((config.observe + config.forecast) / config.rate).toFixed(1)} s; at least ${B} are needed (longer or more takes)`);
  const runner = createStepRunner(model, trainTakes, B, shards);
  // Noise levels start at the errors of the untrained decoder on a few training batches (noise.ts).
  const probe = makeBatches(trainRefs, B, config.matchPairing, false, new Pcg32(seed, 0x696e6974)).slice(0, 4);
  const probeShard = runner.shards[0]!, per = B / shards;
  initNoiseFromData(model, probeShard.ws, (function* () {
    for (const b of probe) for (let i = 0; i < shards; i++) yield probeShard.builder.fill(b.refs.slice(i * per, (i + 1) * per), b.groups.slice(i * per, (i + 1) * per));
  })());
  return { model, trainTakes, validTakes, split: split.kind, batchSize: B, shards, runner };
}

/**
 * The training loop as a generator: it yields one StepRequest per step and expects back the step's mean
 * loss with the batch's gradient in the store's gradient buffer (from any step runner); it returns the
 * trained model (best held-out weights) and the summary.
 */
export function* trainingLoop(ctx: TrainingContext, options: TrainOptions = {}): Generator<StepRequest, { model: CouplingModel; summary: TrainingSummary }, number> {
  const { model, trainTakes, validTakes, split, batchSize: B, shards, runner } = ctx;
  const config = model.config, stats = model.stats;
  const seed = options.seed ?? 1, epochs = options.epochs ?? 20;
  const stride = options.windowStride ?? 3;
  const trainRefs = windowRefs(trainTakes, config, stride);
  // Held-out windows with their full causal history; a take's tail is short, so it gives every window.
  const firstValid = config.stridePrior ? config.priorHistory : config.observe;
  const validRefs = windowRefs(validTakes, config, split === 'tail' ? stride : stride * 5).filter((r) => r.end >= firstValid);
  const validRunner = validTakes.length ? { ws: runner.shards[0]!.ws, builder: new BatchBuilder(config, stats, validTakes, B / shards, model.store) } : null;
  const validBatches = validRunner ? makeBatches(validRefs, B / shards, config.matchPairing, false, new Pcg32(seed, 0x7661)).slice(0, 16) : [];
  const adam = new Adam(model.store.size, { lr: options.learningRate ?? 2e-3 }, model.store.values);
  const clip = options.clipNorm ?? 5, patience = options.patience ?? 3;
  const order = new Pcg32(seed, 0x73687566);
  // Noise seed of step k: seed · 2^24 + k (exact below 2^53 for seeds under 2^29).
  const noiseBase = (seed % 2 ** 29) * 2 ** 24;
  const summary: TrainingSummary = {
    seed, epochs: 0, steps: 0, bestEpoch: -1, trainSubjects: [...new Set(trainTakes.map((t) => t.subject))].sort(),
    validSubjects: [...new Set(validTakes.map((t) => t.subject))].sort(), heldOut: split,
    trainWindows: trainRefs.length, validWindows: validRefs.length, trainLoss: [], validLoss: [], best: null, msPerStep: NaN,
    stopOn: options.stopOn ?? 'forecast', validForecastMm: [],
  };
  let best = Infinity, bestWeights: Buf | null = null, stale = 0, ms = 0, validLoss = NaN;
  const probe = summary.stopOn === 'forecast' && validTakes.length ? forecastProbe(model, validTakes.map((t) => t.track), { everyS: split === 'tail' ? 0.5 : 2 }) : null;
  if (summary.stopOn === 'forecast' && !probe) summary.stopOn = 'loss';
  // The untrained start's figure is recorded for reference; only trained weights are candidates, so the
  // factors a model file carries are always learned ones.
  if (probe) summary.validForecastMm.push(probeError(model, probe));
  for (let epoch = 0; epoch < epochs; epoch++) {
    let batches = makeBatches(trainRefs, B, config.matchPairing, options.mirror ?? true, order);
    if (options.maxStepsPerEpoch !== undefined) batches = batches.slice(0, options.maxStepsPerEpoch);
    let sum = 0;
    for (let i = 0; i < batches.length; i++) {
      const b = batches[i]!;
      const t = performance.now();
      sum += yield { refs: b.refs, groups: b.groups, noiseSeed: noiseBase + summary.steps };
      clipGlobalNorm(model.store.gradView(), clip);
      adam.step(model.store.valueView(), model.store.gradView());
      clampNoise(model);
      ms += performance.now() - t;
      summary.steps++;
      options.onProgress?.({ epoch, epochs, step: i + 1, stepsPerEpoch: batches.length, trainLoss: sum / (i + 1), validLoss, phase: 'train' });
    }
    summary.trainLoss.push(sum / Math.max(1, batches.length));
    summary.epochs = epoch + 1;
    const report = validRunner ? evaluateLoss(model, validRunner.ws, validRunner.builder, validBatches, seed) : null;
    validLoss = report ? report.total : summary.trainLoss[epoch]!;
    summary.validLoss.push(validLoss);
    options.onProgress?.({ epoch, epochs, step: batches.length, stepsPerEpoch: batches.length, trainLoss: summary.trainLoss[epoch]!, validLoss, phase: 'validate' });
    const watched = probe ? probeError(model, probe) : validLoss;
    if (probe) summary.validForecastMm.push(watched);
    if (watched < best) {
      best = watched;
      summary.bestEpoch = epoch;
      summary.best = report;
      bestWeights = Float32Array.from(model.store.valueView());
      stale = 0;
    } else if (++stale >= patience) break;
  }
  if (bestWeights) model.store.valueView().set(bestWeights as never);
  summary.msPerStep = summary.steps ? ms / summary.steps : NaN;
  return { model, summary };
}
