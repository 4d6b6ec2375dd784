// The pair readout: a closed-form linear correction of the decoded forecast. Each receiver node i gets
// Δ_i(k) = b_i(k) + Σ_j W_ij(k) · f_j, one linear message per ordered pair (j → i) from the sender's
// causal features f_j, summed at the receiver, for the forecast positions at a few knot steps (linear in
// between). The no-coupling twin's readout keeps only j = i. Both are fitted by ridge regression on the
// training subjects' windows (mirror images included), the ridge weight picked on the held-out subjects.
//
// Why it exists: trained by gradient steps, the decoder's learned change on top of the stride prior stayed
// at the prior's own error (held-out 1-s error 19.1 mm, its twin 19.2). A ridge regression of the prior's
// error on every node's recent motion removed 17 % of it on the held-out cohort, the same regression on
// each node's own motion 4 % (DEVELOPERS.md, "The pair readout"): what the joints' coupling says about the
// next second is mostly in how the current step is running against the registered stride (its backcast).
//
// Features of node j (window frame, leg lengths, all from the window's causal history): its position at
// the last observed step and READOUT_LAGS steps before it; the stride prior's forecast position at four
// forecast steps; and the backcast: how far the steps of the last READOUT_BACKCAST observed steps landed
// from the registered stride forecast made just before them.
//
// Capture jitter: fitted on clean synthetic motion, the readout's weights on the last few lags act as
// differences and amplify a noisy capture's frame-to-frame jitter. A second, jitter-robust readout is
// fitted with jittered copies of the training windows added (readout-fit.ts); a window whose measured
// jitter (captureJitter: its positions' fourth differences over the last second) lies well above that of
// the clean training windows (readout-fit.ts jitterThreshold) is corrected by that one instead. The choice
// reads every node's jitter, also in the twin's readout: it carries the capture's quality, not its motion.
import { STATE_SIZE } from '../motion/reflect.js';
import { choleskyFactor, choleskySolveMany } from '../nn/cholesky.js';
import { registeredStrideForecast, strideForecast } from './baselines.js';
import type { ModelConfig } from './config.js';

/** Steps before the last observed one whose positions are features (0 = the last observed step). */
export const READOUT_LAGS = [0, 1, 2, 3, 4, 6, 8, 12, 16] as const;
/** Observed steps covered by the backcast, and the backcast steps (1-based after its start) used as features. */
export const READOUT_BACKCAST = 10;
export const READOUT_BACKCAST_STEPS = [2, 4, 6, 8, 10] as const;
/** Ridge weights tried (times the sample count, on standardised features). */
export const READOUT_LAMBDAS = [0.001, 0.003, 0.01, 0.03, 0.1] as const;
/** Ridge weight used when no held-out windows pick one. */
export const READOUT_DEFAULT_LAMBDA = 0.01;

/** Which senders a receiver reads: every node (the coupling model) or only itself (the no-coupling twin). */
export type ReadoutSenders = 'all' | 'self';

/** Steps at the end of the history whose fourth differences measure the capture jitter (1 s at 30 Hz). */
export const JITTER_STEPS = 30;

/** The jitter-robust readout and the measured jitter above which a window uses it. */
export interface ReadoutJitterSwitch {
  /** captureJitter (leg lengths) above which the robust readout corrects a window. */
  threshold: number;
  robust: PairReadout;
}

/** A fitted pair readout. */
export interface PairReadout {
  senders: ReadoutSenders;
  lambda: number;
  /** Forecast steps (0-based) the correction is fitted at; in between it is linear, before the first it grows from 0. */
  knots: number[];
  /** Forecast steps whose stride-prior positions are features. */
  priorSteps: number[];
  /** Mean and SD of each feature over the fitting windows (nodes × features per node). */
  featureMean: Float64Array;
  featureSd: Float64Array;
  /** Mean correction (nodes × knots × 3). */
  targetMean: Float64Array;
  /**
   * Weights on standardised features. 'all': (nodes · perNode) × (nodes · knots · 3) row-major;
   * 'self': per node perNode × (knots · 3), nodes one after another.
   */
  weights: Float64Array;
  /** The jitter-robust readout for windows of a noisy capture (absent or null: this one for every window). */
  jitter?: ReadoutJitterSwitch | null;
}

/**
 * Returns the capture jitter of history positions (steps × N × 3, window frame, leg lengths): the RMS over
 * nodes, axes and the last JITTER_STEPS steps of the fourth difference, divided by √70, which makes it the
 * SD of white noise on the positions (each fourth difference sums five values with weights 1, −4, 6, −4,
 * 1: variance 70σ²). Walking itself adds little: its content lies far below the Nyquist rate, where the
 * fourth difference's gain is small.
 */
export function captureJitter(positions: Float64Array, steps: number, nodes: number): number {
  const n3 = nodes * 3, from = Math.max(4, steps - JITTER_STEPS);
  let sum = 0, count = 0;
  for (let t = from; t < steps; t++)
    for (let i = 0; i < n3; i++) {
      const p = (k: number) => positions[(t - k) * n3 + i]!;
      const d4 = p(0) - 4 * p(1) + 6 * p(2) - 4 * p(3) + p(4);
      sum += d4 * d4;
      count++;
    }
  return count ? Math.sqrt(sum / (70 * count)) : 0;
}

/** Returns the readout that corrects a window of measured capture jitter `jitter`: the robust one above the threshold. */
export function readoutFor(r: PairReadout, jitter: number): PairReadout {
  return r.jitter && jitter > r.jitter.threshold ? r.jitter.robust : r;
}

/** Features per node. */
export function readoutFeaturesPerNode(c: ModelConfig): number {
  return 3 * (READOUT_LAGS.length + readoutPriorSteps(c).length + READOUT_BACKCAST_STEPS.length);
}

/** Forecast steps whose prior positions are features: the first, a third, two thirds and the last. */
export function readoutPriorSteps(c: ModelConfig): number[] {
  const F = c.forecast;
  return [...new Set([0, Math.round(F / 3) - 1, Math.round((2 * F) / 3) - 1, F - 1].map((k) => Math.max(0, k)))].sort((a, b) => a - b);
}

/** Knot steps: every fifth forecast step counted back from the last (4, 9, …, 29 for 30 steps). */
export function readoutKnots(c: ModelConfig): number[] {
  const out: number[] = [];
  for (let k = c.forecast - 1; k >= 0; k -= 5) out.unshift(k);
  return out;
}

/** Steps of history the readout needs: the model's full causal history (shorter windows get no correction). */
export function readoutHistory(c: ModelConfig): number {
  return c.stridePrior ? c.priorHistory : c.observe;
}

/** Work arrays of the readout for one configuration. */
export interface ReadoutScratch {
  positions: Float64Array; prior: Float64Array; back: Float64Array; features: Float64Array; standardised: Float64Array; knots: Float64Array;
  /** What the last readoutCorrection measured and used: the window's captureJitter (null without a switch) and whether the robust readout ran. */
  jitter: number | null;
  robust: boolean;
}

/** Returns work arrays for readoutFeatures and readoutCorrection. */
export function readoutScratch(c: ModelConfig): ReadoutScratch {
  const N = c.nodes;
  return {
    positions: new Float64Array(readoutHistory(c) * N * 3), prior: new Float64Array(c.forecast * N * 3), back: new Float64Array(READOUT_BACKCAST * N * 3),
    features: new Float64Array(N * readoutFeaturesPerNode(c)), standardised: new Float64Array(N * readoutFeaturesPerNode(c)), knots: new Float64Array(N * readoutKnots(c).length * 3),
    jitter: null, robust: false,
  };
}

/**
 * Writes the features of a window's causal history (historySteps × N × 6, window frame) into
 * scratch.features (nodes × features per node) and returns it, or null when the history is shorter than
 * the model's full history. Reads nothing after the last observed step.
 */
export function readoutFeatures(c: ModelConfig, history: ArrayLike<number>, historySteps: number, scratch: ReadoutScratch): Float64Array | null {
  const N = c.nodes, H = historySteps, W = N * STATE_SIZE, need = readoutHistory(c);
  if (H !== need || history.length < H * W) return null;
  const pos = scratch.positions;
  for (let t = 0; t < H; t++) for (let n = 0; n < N; n++) for (let a = 0; a < 3; a++) pos[(t * N + n) * 3 + a] = history[t * W + n * STATE_SIZE + a]!;
  return readoutFeaturesOfPositions(c, scratch);
}

/**
 * Writes the features of the full history's node positions held in scratch.positions (history × N × 3,
 * window frame) into scratch.features and returns it (readoutFeatures after its copy; augmentation calls
 * it on jittered positions).
 */
export function readoutFeaturesOfPositions(c: ModelConfig, scratch: ReadoutScratch): Float64Array {
  const N = c.nodes, H = readoutHistory(c), pos = scratch.positions;
  const stride = c.priorRegistration ? registeredStrideForecast : strideForecast;
  const e = H - 1, b = e - READOUT_BACKCAST, steps = readoutPriorSteps(c);
  stride(pos, N, c.rate, e, c.forecast, 3, scratch.prior);
  stride(pos, N, c.rate, b, READOUT_BACKCAST, 3, scratch.back);
  const per = readoutFeaturesPerNode(c), f = scratch.features;
  for (let n = 0; n < N; n++) {
    let o = n * per;
    for (const l of READOUT_LAGS) for (let a = 0; a < 3; a++) f[o++] = pos[((e - l) * N + n) * 3 + a]!;
    for (const k of steps) for (let a = 0; a < 3; a++) f[o++] = scratch.prior[(k * N + n) * 3 + a]!;
    for (const k of READOUT_BACKCAST_STEPS) for (let a = 0; a < 3; a++) f[o++] = pos[((b + k) * N + n) * 3 + a]! - scratch.back[((k - 1) * N + n) * 3 + a]!;
  }
  return f;
}

/** Writes the readout's correction at the knots (nodes × knots × 3) of raw features into out (`z`: scratch for the standardised features). */
export function readoutKnotValues(r: PairReadout, features: Float64Array, nodes: number, out: Float64Array, z: Float64Array = new Float64Array(features.length)): Float64Array {
  const per = features.length / nodes, K3 = r.knots.length * 3;
  for (let j = 0; j < z.length; j++) z[j] = (features[j]! - r.featureMean[j]!) / r.featureSd[j]!;
  out.set(r.targetMean);
  if (r.senders === 'all') {
    const m = nodes * K3;
    for (let j = 0; j < z.length; j++) {
      const zj = z[j]!, row = j * m;
      for (let o = 0; o < m; o++) out[o] = out[o]! + r.weights[row + o]! * zj;
    }
  } else {
    for (let n = 0; n < nodes; n++)
      for (let j = 0; j < per; j++) {
        const zj = z[n * per + j]!, row = (n * per + j) * K3;
        for (let o = 0; o < K3; o++) out[n * K3 + o] = out[n * K3 + o]! + r.weights[row + o]! * zj;
      }
  }
  return out;
}

/** Writes the correction at every forecast step (forecast × N × 3, window frame, leg lengths) from knot values (nodes × knots × 3). */
export function spreadKnots(knots: readonly number[], values: Float64Array, nodes: number, forecast: number, out: Float64Array): Float64Array {
  const K = knots.length;
  for (let s = 0; s < forecast; s++) {
    // The knots around step s; before the first the correction grows linearly from 0 at the last observed step.
    let hi = 0;
    while (hi < K - 1 && knots[hi]! < s) hi++;
    const lo = hi - 1, kHi = knots[hi]!, kLo = lo >= 0 ? knots[lo]! : -1;
    const w = s >= kHi ? 1 : (s - kLo) / (kHi - kLo);
    for (let n = 0; n < nodes; n++)
      for (let a = 0; a < 3; a++) {
        const vHi = values[(n * K + hi) * 3 + a]!, vLo = lo >= 0 ? values[(n * K + lo) * 3 + a]! : 0;
        out[(s * nodes + n) * 3 + a] = vLo + w * (vHi - vLo);
      }
  }
  return out;
}

/** Writes into values (nodes × perNode, 3-vectors in the window frame) its left/right reflection: nodes swapped, y negated. */
export function mirrorNodeVectors(values: Float64Array, nodeMirror: Int32Array, out: Float64Array): Float64Array {
  const N = nodeMirror.length, per = values.length / N;
  for (let n = 0; n < N; n++) {
    const m = nodeMirror[n]!;
    for (let f = 0; f < per; f++) out[m * per + f] = f % 3 === 1 ? -values[n * per + f]! : values[n * per + f]!;
  }
  return out;
}

/**
 * Fitting data: features (nodes × perNode) and targets (nodes × knots × 3) per window; `copy` says which
 * window is an augmented copy (−1: the clean window, k ≥ 0: its k-th jittered copy; absent: all clean),
 * `jitter` holds each window's captureJitter (absent: 0), `window` the index of the window an entry
 * came from (its mirror image and jittered copies share it).
 */
export interface ReadoutData { features: Float64Array[]; targets: Float64Array[]; jitter?: number[]; copy?: number[]; window?: number[] }

/** Result of fitReadout: the readout and the held-out error of every ridge weight tried. */
export interface ReadoutFit {
  readout: PairReadout;
  /** Mean over held-out windows, nodes and knots of the distance left after the correction (leg lengths), per weight; before it under `none`. */
  validError: { lambda: number; error: number }[];
  validNone: number;
  trainWindows: number;
  validWindows: number;
}

/** Returns the mean over windows, nodes and knots of the distance between target and prediction (null: no correction). */
export function knotError(r: PairReadout | null, data: ReadoutData, nodes: number): number {
  if (data.features.length === 0) return NaN;
  return knotErrors(r, data, nodes).reduce((a, b) => a + b, 0) / data.features.length;
}

/** Returns each window's mean over nodes and knots of the distance left after the correction (a switched readout picks per window by its jitter). */
export function knotErrors(r: PairReadout | null, data: ReadoutData, nodes: number): Float64Array {
  const out = new Float64Array(data.features.length);
  if (out.length === 0) return out;
  const pred = new Float64Array(data.targets[0]!.length), z = new Float64Array(data.features[0]!.length);
  data.features.forEach((f, i) => {
    const t = data.targets[i]!;
    if (r) readoutKnotValues(readoutFor(r, data.jitter?.[i] ?? 0), f, nodes, pred, z); else pred.fill(0);
    let sum = 0;
    for (let o = 0; o < t.length; o += 3) sum += Math.hypot(t[o]! - pred[o]!, t[o + 1]! - pred[o + 1]!, t[o + 2]! - pred[o + 2]!);
    out[i] = (3 * sum) / pred.length;
  });
  return out;
}

/** One block of the ridge system: its feature columns and output columns. */
interface GramBlock { cols: number; dim: number; outs: number; out: number }

/**
 * Adds every window's standardised features z and centred targets y to each block's lower-triangle
 * Gram matrix A (Σ z zᵀ) and cross-product B (Σ z yᵀ). Windows go four at a time, each entry taking
 * their four products in one expression evaluated left to right, (((A + p0) + p1) + p2) + p3: the same
 * sums, rounding for rounding, as one window after another, with a quarter of the passes over A (a few
 * MB: the pass, not the arithmetic, is the cost). A last group of fewer than four is padded with zero
 * features, whose products (±0) leave every sum's bits as they are: a sum that starts at +0 is never −0.
 */
function accumulateGrams(train: ReadoutData, blocks: readonly GramBlock[], grams: readonly { A: Float64Array; B: Float64Array }[], mean: Float64Array, sd: Float64Array, ym: Float64Array): void {
  const n = train.features.length, d = mean.length, m = ym.length;
  const z = [0, 1, 2, 3].map(() => new Float64Array(d)), y = [0, 1, 2, 3].map(() => new Float64Array(m));
  const load = (i: number, q: number) => {
    const zq = z[q]!, yq = y[q]!;
    if (i >= n) {
      zq.fill(0);
      return;
    }
    const f = train.features[i]!, t = train.targets[i]!;
    for (let j = 0; j < d; j++) zq[j] = (f[j]! - mean[j]!) / sd[j]!;
    for (let o = 0; o < m; o++) yq[o] = t[o]! - ym[o]!;
  };
  const [z0, z1, z2, z3] = z as [Float64Array, Float64Array, Float64Array, Float64Array];
  const [y0, y1, y2, y3] = y as [Float64Array, Float64Array, Float64Array, Float64Array];
  for (let i = 0; i < n; i += 4) {
    for (let q = 0; q < 4; q++) load(i + q, q);
    blocks.forEach((bl, bi) => {
      const { A, B } = grams[bi]!, D = bl.dim, M = bl.out, c = bl.cols, u = bl.outs;
      for (let a = 0; a < D; a++) {
        const a0 = z0[c + a]!, a1 = z1[c + a]!, a2 = z2[c + a]!, a3 = z3[c + a]!;
        // Adding a zero product leaves a sum's bits as they are (it starts at +0), so a row of zeros is skipped.
        if (a0 === 0 && a1 === 0 && a2 === 0 && a3 === 0) continue;
        const ra = a * D;
        for (let b2 = 0; b2 <= a; b2++) A[ra + b2] = A[ra + b2]! + a0 * z0[c + b2]! + a1 * z1[c + b2]! + a2 * z2[c + b2]! + a3 * z3[c + b2]!;
        const rb = a * M;
        for (let o = 0; o < M; o++) B[rb + o] = B[rb + o]! + a0 * y0[u + o]! + a1 * y1[u + o]! + a2 * y2[u + o]! + a3 * y3[u + o]!;
      }
    });
  }
}

/**
 * Returns the readout fitted on `train` by ridge regression on standardised features, the weight chosen
 * from `lambdas` by the held-out error on `valid` (READOUT_DEFAULT_LAMBDA when `valid` is empty).
 */
export function fitReadout(c: ModelConfig, senders: ReadoutSenders, train: ReadoutData, valid: ReadoutData, lambdas: readonly number[] = READOUT_LAMBDAS): ReadoutFit {
  const N = c.nodes, per = readoutFeaturesPerNode(c), knots = readoutKnots(c), K3 = knots.length * 3, n = train.features.length;
  if (n < 2) throw new RangeError(`the pair readout needs at least 2 training windows with full history (got ${n})`);
  const d = N * per, m = N * K3;
  const mean = new Float64Array(d), sd = new Float64Array(d), ym = new Float64Array(m);
  for (const f of train.features) for (let j = 0; j < d; j++) mean[j] = mean[j]! + f[j]! / n;
  for (const f of train.features) for (let j = 0; j < d; j++) sd[j] = sd[j]! + (f[j]! - mean[j]!) ** 2 / n;
  // A feature that never varies (e.g. the pelvis at the last observed step, the frame's origin) gets SD 1: its weight stays 0.
  for (let j = 0; j < d; j++) sd[j] = sd[j]! > 1e-18 ? Math.sqrt(sd[j]!) : 1;
  for (const t of train.targets) for (let o = 0; o < m; o++) ym[o] = ym[o]! + t[o]! / n;
  // Blocks: one over every feature ('all') or one per node over its own features ('self').
  const blocks = senders === 'all' ? [{ cols: 0, dim: d, outs: 0, out: m }] : Array.from({ length: N }, (_, b) => ({ cols: b * per, dim: per, outs: b * K3, out: K3 }));
  const grams = blocks.map((bl) => ({ A: new Float64Array(bl.dim * bl.dim), B: new Float64Array(bl.dim * bl.out) }));
  accumulateGrams(train, blocks, grams, mean, sd, ym);
  const solve = (lambda: number): PairReadout => {
    const weights = new Float64Array(senders === 'all' ? d * m : N * per * K3);
    blocks.forEach((bl, bi) => {
      const { A, B } = grams[bi]!, D = bl.dim, M = bl.out;
      const S = new Float64Array(D * D);
      for (let a = 0; a < D; a++) for (let b2 = 0; b2 <= a; b2++) { S[a * D + b2] = A[a * D + b2]!; S[b2 * D + a] = A[a * D + b2]!; }
      for (let a = 0; a < D; a++) S[a * D + a] = S[a * D + a]! + lambda * n;
      const L = choleskyFactor(S, D, 'the pair readout');
      const w = choleskySolveMany(L, D, B, M);
      // 'all': row = feature, column = output; 'self': node blocks of perNode × K3.
      for (let a = 0; a < D; a++) for (let o = 0; o < M; o++) weights[senders === 'all' ? a * m + o : (bl.cols + a) * K3 + o] = w[a * M + o]!;
    });
    return { senders, lambda, knots, priorSteps: readoutPriorSteps(c), featureMean: mean, featureSd: sd, targetMean: ym, weights };
  };
  const validNone = knotError(null, valid, N);
  if (valid.features.length === 0) return { readout: solve(READOUT_DEFAULT_LAMBDA), validError: [], validNone, trainWindows: n, validWindows: 0 };
  let best: PairReadout | null = null, bestE = Infinity;
  const validError: { lambda: number; error: number }[] = [];
  for (const lambda of lambdas) {
    const r = solve(lambda), e = knotError(r, valid, N);
    validError.push({ lambda, error: e });
    if (e < bestE) { bestE = e; best = r; }
  }
  return { readout: best!, validError, validNone, trainWindows: n, validWindows: valid.features.length };
}

/**
 * Returns the correction of every forecast step (forecast × N × 3, window frame, leg lengths) of a
 * window's history, or null without full history; with a jitter switch, a window of high captureJitter
 * gets the robust readout's (scratch.jitter and scratch.robust record which).
 */
export function readoutCorrection(c: ModelConfig, r: PairReadout, history: ArrayLike<number>, historySteps: number, scratch: ReadoutScratch, out: Float64Array): Float64Array | null {
  scratch.jitter = null;
  scratch.robust = false;
  const f = readoutFeatures(c, history, historySteps, scratch);
  if (!f) return null;
  scratch.jitter = r.jitter ? captureJitter(scratch.positions, historySteps, c.nodes) : null;
  const use = scratch.jitter === null ? r : readoutFor(r, scratch.jitter);
  scratch.robust = use !== r;
  readoutKnotValues(use, f, c.nodes, scratch.knots, scratch.standardised);
  return spreadKnots(r.knots, scratch.knots, c.nodes, c.forecast, out);
}
