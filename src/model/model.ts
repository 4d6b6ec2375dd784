// The coupling model's parameters: one ParamStore holding the encoder GRU, the static and dynamic factor
// heads, the learned autoregressive prior of the dynamic factors, the decoder's message and node-update
// layers and the learned noise levels. A model is its configuration, its normalisation statistics and
// this store; work buffers live in a Workspace (workspace.ts) sized for a batch.
import { normalise, type MotionStats } from '../motion/normalise.js';
import { STATE_SIZE } from '../motion/reflect.js';
import { createGru, type GruParams } from '../nn/gru.js';
import { ParamStore, type Param } from '../nn/params.js';
import { Pcg32 } from '../nn/prng.js';
import { registeredStrideForecast, strideForecast } from './baselines.js';
import { resolveModelConfig, type ModelConfig } from './config.js';
import type { PairReadout } from './readout.js';
import { SIGNATURE_FEATURES } from './signature.js';
import type { SpreadAdapt } from './spread.js';

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
  /**
   * The signature read (signature.ts): each pair's standardised take signature ≈ s_ij·sigW + sigB, the
   * same map for every pair. Training only; absent without the signature term or without coupling.
   */
  sigW: Param | null;
  sigB: Param | null;
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
  /** How the noise SD follows each window's backcast error (spread.ts); null: the same for every window. */
  spreadAdapt: SpreadAdapt | null;
  /** The pair readout's linear correction of the decoded forecast (readout.ts); null before it is fitted. */
  readout: PairReadout | null;
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
  return { config: c, stats, store, params, kinematic: c.kinematic ? kinematicStep(c, stats) : null, spreadScale: 1, spreadAdapt: null, readout: null };
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

/** Work arrays of stridePriorSteps for one configuration. */
export interface StridePriorScratch {
  positions: Float64Array;
  forecast: Float64Array;
  state: Float64Array;
  last: Float64Array;
}

/** Returns the work arrays stridePriorSteps needs for a configuration. */
export function stridePriorScratch(c: ModelConfig): StridePriorScratch {
  const N = c.nodes;
  return {
    positions: new Float64Array(Math.max(c.observe, c.priorHistory) * N * 3), forecast: new Float64Array(c.forecast * N * 3),
    state: new Float64Array(c.forecast * N * STATE_SIZE), last: new Float64Array(N * STATE_SIZE),
  };
}

/**
 * Returns `out` (forecast × N × 6, normalised units) holding the stride prior's change of state per
 * forecast step: prior(k + 1) − prior(k), where prior(1 … F) is the phase-aligned stride-mean forecast
 * (baselines.ts, up to three strides) of the window's history positions, velocities backward differences
 * at the model rate (the first from the last observed position), and prior(0) the last observed state.
 * `history` is the window's history state (historySteps × N × 6 ending at the last observed step, window
 * frame, not normalised, mirrored when the window is): the baseline is computed in the window frame, which gives the same forecast as in the
 * world turned into the frame (it only adds pelvis travel and averages positions, and its stride period is a
 * normalised autocorrelation), and the same for a window and its mirror image. It reads nothing after the
 * last observed step; with no stride period found it falls back to constant velocity.
 */
export function stridePriorSteps(c: ModelConfig, stats: MotionStats, history: ArrayLike<number>, historySteps: number, out: Float64Array, scratch = stridePriorScratch(c)): Float64Array {
  const N = c.nodes, H = historySteps, F = c.forecast, W = N * STATE_SIZE;
  const { forecast: fut, state, last } = scratch;
  const pos = historyPositions(c, history, H, scratch);
  (c.priorRegistration ? registeredStrideForecast : strideForecast)(pos, N, c.rate, H - 1, F, 3, fut);
  for (let k = 0; k < F; k++)
    for (let n = 0; n < N; n++)
      for (let a = 0; a < 3; a++) {
        const p = fut[(k * N + n) * 3 + a]!, prev = k === 0 ? pos[((H - 1) * N + n) * 3 + a]! : fut[((k - 1) * N + n) * 3 + a]!;
        const o = k * W + n * STATE_SIZE + a;
        state[o] = p;
        state[o + 3] = (p - prev) * c.rate;
      }
  for (let i = 0; i < W; i++) last[i] = history[(H - 1) * W + i]!;
  normalise(stats, state, state);
  normalise(stats, last, last);
  for (let k = F - 1; k >= 0; k--)
    for (let i = 0; i < W; i++) out[k * W + i] = state[k * W + i]! - (k === 0 ? last[i]! : state[(k - 1) * W + i]!);
  return out;
}

/** Copies the positions of `historySteps` steps of window state into the scratch (checked against the model). */
function historyPositions(c: ModelConfig, history: ArrayLike<number>, H: number, scratch: StridePriorScratch): Float64Array {
  const N = c.nodes, W = N * STATE_SIZE, pos = scratch.positions;
  if (!Number.isInteger(H) || H < c.observe || H * N * 3 > pos.length || history.length < H * W)
    throw new RangeError(`the stride prior needs ${c.observe}..${pos.length / (N * 3)} steps of history (got ${H})`);
  for (let t = 0; t < H; t++)
    for (let n = 0; n < N; n++) for (let a = 0; a < 3; a++) pos[(t * N + n) * 3 + a] = history[t * W + n * STATE_SIZE + a]!;
  return pos;
}

/**
 * Returns `out` (reconSteps × N × 6, normalised) holding, for each of the last reconSteps observed
 * transitions t → t + 1, the stride prior's one-step change from the history up to t (state at t + 1 from
 * the baseline minus the state at t), the fixed step of the teacher-forced term.
 */
export function strideReconSteps(c: ModelConfig, stats: MotionStats, history: ArrayLike<number>, historySteps: number, out: Float64Array, scratch = stridePriorScratch(c)): Float64Array {
  const N = c.nodes, H = historySteps, R = c.reconSteps, W = N * STATE_SIZE;
  const { forecast: one, state, last } = scratch;
  const pos = historyPositions(c, history, H, scratch);
  const st = state.subarray(0, W);
  for (let q = 0; q < R; q++) {
    const t = H - 1 - R + q;
    (c.priorRegistration ? registeredStrideForecast : strideForecast)(pos, N, c.rate, t, 1, 3, one);
    for (let n = 0; n < N; n++)
      for (let a = 0; a < 3; a++) {
        const p = one[n * 3 + a]!, o = n * STATE_SIZE + a;
        st[o] = p;
        st[o + 3] = (p - pos[(t * N + n) * 3 + a]!) * c.rate;
      }
    for (let i = 0; i < W; i++) last[i] = history[t * W + i]!;
    normalise(stats, st, st);
    normalise(stats, last, last);
    for (let i = 0; i < W; i++) out[q * W + i] = st[i]! - last[i]!;
  }
  return out;
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
  // The learned change of state starts near zero and is learned from there; with the stride prior it starts
  // at exactly zero, so the untrained model forecasts the baseline itself (measured: 14.7 mm at 1 s after 200
  // steps against 19.4 mm from the small random start; the weights behind it get gradient from the first step on).
  const upW2 = c.stridePrior ? store.add('dec.up.w2', [U, STATE_SIZE], 'zeros') : store.add('dec.up.w2', [U, STATE_SIZE], { normal: 0.01 }, rng);
  const upB2 = store.add('dec.up.b2', [STATE_SIZE], 'zeros');
  const lvRecon = store.add('noise.recon', [W], { constant: -2 });
  const lvRollout = store.add('noise.rollout', [c.forecast, W], { constant: 0 });
  // Registered last, so model files written before the signature term keep their layout.
  const signed = coupled && c.signatureWeight > 0;
  const sigW = signed ? store.add('enc.sig.w', [c.staticDims, SIGNATURE_FEATURES], 'xavier', rng) : null;
  const sigB = signed ? store.add('enc.sig.b', [SIGNATURE_FEATURES], 'zeros') : null;
  return {
    gru, staticHead, dynamicHead, priorA, priorC, priorLv,
    msgWa, msgWb, msgWz, msgBz, gateW, gateB, upW1x, upW1m, upNode, upB1, upW2, upB2, lvRecon, lvRollout, sigW, sigB,
  };
}
