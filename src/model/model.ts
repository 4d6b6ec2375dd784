// The coupling model's parameters: one ParamStore holding the encoder GRU, the static and dynamic factor
// heads, the learned autoregressive prior of the dynamic factors, the decoder's message and node-update
// layers and the learned noise levels. A model is its configuration, its normalisation statistics and
// this store; work buffers live in a Workspace (workspace.ts) sized for a batch.
import type { MotionStats } from '../motion/normalise.js';
import { STATE_SIZE } from '../motion/reflect.js';
import { createGru, type GruParams } from '../nn/gru.js';
import { ParamStore, type Param } from '../nn/params.js';
import { Pcg32 } from '../nn/prng.js';
import { resolveModelConfig, type ModelConfig } from './config.js';

/** Encoder input width per node: state 6 plus the node one-hot. */
export function encoderInputDim(c: ModelConfig): number {
  return STATE_SIZE + c.nodes;
}

/** A factor head: the split first layer over node features (Wa h_i + Wb h_j + b), softsign, then mean and log-variance heads. */
export interface FactorHead {
  wa: Param;
  wb: Param;
  b: Param;
  wMu: Param;
  bMu: Param;
  wLv: Param;
  bLv: Param;
  dims: number;
}

/** Every parameter of the model, by part. */
export interface ModelParams {
  gru: GruParams;
  staticHead: FactorHead;
  dynamicHead: FactorHead;
  /** Prior p(d_j | d_{j−1}) = N(d_{j−1}·A + c, e^lv); d_0 ~ N(0, 1). */
  priorA: Param;
  priorC: Param;
  priorLv: Param;
  /** Decoder messages: softsign(x_i·Wa + x_j·Wb + [s, d]·Wz + bz), gated by σ([s, d]·wg + bg). Absent with noCoupling. */
  msgWa: Param | null;
  msgWb: Param | null;
  msgWz: Param | null;
  msgBz: Param | null;
  gateW: Param | null;
  gateB: Param | null;
  /** Node update: Δx = softsign(x·W1x + Σm·W1m + nodeBias[n] + b1)·W2 + b2. */
  upW1x: Param;
  upW1m: Param | null;
  upNode: Param;
  upB1: Param;
  upW2: Param;
  upB2: Param;
  /** Learned log-variance of the one-step reconstruction, per (node, component). */
  lvRecon: Param;
  /** Learned log-variance of the rollout, per forecast step and (node, component). */
  lvRollout: Param;
}

/** A coupling model: configuration, normalisation, parameters, and the forecast spread calibration. */
export interface CouplingModel {
  config: ModelConfig;
  stats: MotionStats;
  store: ParamStore;
  params: ModelParams;
  /**
   * The kinematic step in normalised units: Δ position[n, a] = gain · x[n, 3 + a] + bias (from the
   * statistics: gain = sd_v / (rate · sd_p), bias = mean_v / (rate · sd_p)); null when switched off.
   */
  kinematic: { gain: Float64Array; bias: Float64Array } | null;
  /** Factor multiplying the forecast noise SD (fitted on held-out windows; 1 when not calibrated). */
  spreadScale: number;
}

/** Options of createModel. */
export interface CreateModelOptions {
  /** Seed of the weight initialisation. */
  seed?: number;
  /** 64 builds a double-precision store (gradient checks); training uses 32. */
  precision?: 32 | 64;
}

function factorHead(store: ParamStore, name: string, inDim: number, hidden: number, dims: number, rng: Pcg32): FactorHead {
  return {
    wa: store.add(`${name}.wa`, [inDim, hidden], 'xavier', rng),
    wb: store.add(`${name}.wb`, [inDim, hidden], 'xavier', rng),
    b: store.add(`${name}.b`, [hidden], 'zeros'),
    wMu: store.add(`${name}.wMu`, [hidden, dims], 'xavier', rng),
    bMu: store.add(`${name}.bMu`, [dims], 'zeros'),
    wLv: store.add(`${name}.wLv`, [hidden, dims], { normal: 0.01 }, rng),
    // Posteriors start narrow (variance e^-2), so the decoder can read the factors from the first steps.
    bLv: store.add(`${name}.bLv`, [dims], { constant: -2 }),
    dims,
  };
}

/** Returns a fresh model with weights drawn from `seed` (same seed, same weights, bit for bit). */
export function createModel(config: Partial<ModelConfig>, stats: MotionStats, options: CreateModelOptions = {}): CouplingModel {
  const c = resolveModelConfig(config);
  if (stats.mean.length !== c.nodes * STATE_SIZE) throw new RangeError(`normalisation statistics hold ${stats.mean.length / STATE_SIZE} nodes, the config ${c.nodes}`);
  const store = new ParamStore({ precision: options.precision ?? 32 });
  const params = buildParams(store, c, new Pcg32(options.seed ?? 1, 0x6d6f64656c));
  return { config: c, stats, store, params, kinematic: c.kinematic ? kinematicStep(c, stats) : null, spreadScale: 1 };
}

/** Returns the gains and biases of the kinematic step p(t + 1) = p(t) + v(t) / rate in normalised units. */
export function kinematicStep(c: ModelConfig, stats: MotionStats): { gain: Float64Array; bias: Float64Array } {
  const gain = new Float64Array(c.nodes * 3), bias = new Float64Array(c.nodes * 3);
  for (let n = 0; n < c.nodes; n++)
    for (let a = 0; a < 3; a++) {
      const p = n * STATE_SIZE + a, v = p + 3;
      gain[n * 3 + a] = stats.sd[v]! / (c.rate * stats.sd[p]!);
      bias[n * 3 + a] = stats.mean[v]! / (c.rate * stats.sd[p]!);
    }
  return { gain, bias };
}

/** Returns the parameters of a configuration registered in `store` in a fixed order (the model file relies on it). */
export function buildParams(store: ParamStore, c: ModelConfig, rng: Pcg32): ModelParams {
  const H = c.hidden, E = c.pairHidden, M = c.messageHidden, U = c.updateHidden, Z = c.staticDims + c.dynamicDims;
  const W = c.nodes * STATE_SIZE;
  const gru = createGru(store, 'enc.gru', encoderInputDim(c), H, rng);
  const staticHead = factorHead(store, 'enc.static', H, E, c.staticDims, rng);
  const dynamicHead = factorHead(store, 'enc.dynamic', H, E, c.dynamicDims, rng);
  const D = c.dynamicDims;
  const priorA = store.add('prior.A', [D, D], 'zeros');
  for (let i = 0; i < D; i++) priorA.value[i * D + i] = 1;
  const priorC = store.add('prior.c', [D], 'zeros');
  const priorLv = store.add('prior.lv', [D], { constant: -2 });
  const coupled = !c.noCoupling;
  const msgWa = coupled ? store.add('dec.msg.wa', [STATE_SIZE, M], 'xavier', rng) : null;
  const msgWb = coupled ? store.add('dec.msg.wb', [STATE_SIZE, M], 'xavier', rng) : null;
  const msgWz = coupled ? store.add('dec.msg.wz', [Z, M], 'xavier', rng) : null;
  const msgBz = coupled ? store.add('dec.msg.bz', [M], 'zeros') : null;
  const gateW = coupled ? store.add('dec.gate.w', [Z, 1], 'xavier', rng) : null;
  const gateB = coupled ? store.add('dec.gate.b', [1], 'zeros') : null;
  const upW1x = store.add('dec.up.w1x', [STATE_SIZE, U], 'xavier', rng);
  // Messages of all senders are summed, so their layer starts scaled down by the sender count.
  const upW1m = coupled ? store.add('dec.up.w1m', [M, U], { normal: 1 / Math.sqrt(M * (c.nodes - 1)) }, rng) : null;
  const upNode = store.add('dec.up.node', [c.nodes, U], { normal: 0.1 }, rng);
  const upB1 = store.add('dec.up.b1', [U], 'zeros');
  // The change of state starts near zero (a hold-still forecast) and is learned from there.
  const upW2 = store.add('dec.up.w2', [U, STATE_SIZE], { normal: 0.01 }, rng);
  const upB2 = store.add('dec.up.b2', [STATE_SIZE], 'zeros');
  const lvRecon = store.add('noise.recon', [W], { constant: -2 });
  const lvRollout = store.add('noise.rollout', [c.forecast, W], { constant: 0 });
  return {
    gru, staticHead, dynamicHead, priorA, priorC, priorLv,
    msgWa, msgWb, msgWz, msgBz, gateW, gateB, upW1x, upW1m, upNode, upB1, upW2, upB2, lvRecon, lvRollout,
  };
}
