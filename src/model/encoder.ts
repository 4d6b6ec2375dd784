// The encoder: a GRU per node over the observed steps (input: normalised state and the node one-hot),
// then per ordered pair the static factor posterior q(s_ij) from the time-pooled node states and the
// dynamic factor posteriors q(d_ij(t)) at every dynamic point, both through the split first layer
// (Wa h_i + Wb h_j once per node, then gather-add over pairs), softsign, and mean / log-variance heads.
// Samples are drawn by reparameterisation; matched windows (same group) average their static posteriors
// before sampling and share the noise. Future dynamic points are rolled forward with the learned prior.
import { STATE_SIZE } from '../motion/reflect.js';
import { gruBackward, gruForward } from '../nn/gru.js';
import { linearBackward, linearForward } from '../nn/linear.js';
import { nodeProjectPairs, nodeProjectPairsBackward, type PairList, type PairProjectionScratch } from '../nn/pairs.js';
import { meanPoolTime, meanPoolTimeBackward } from '../nn/pool.js';
import { gaussianReparam, gaussianReparamBackward } from '../nn/gaussian.js';
import type { Pcg32 } from '../nn/prng.js';
import type { Buf } from '../nn/types.js';
import { observedPoints, pointStep, totalPoints } from './config.js';
import { encoderInputDim, type CouplingModel, type FactorHead } from './model.js';
import { softsign, softsignBackward } from './softsign.js';
import type { Workspace } from './workspace.js';

/** A batch of windows ready for the model. */
export interface Batch {
  size: number;
  /** (observe + forecast) × size × N × 6, normalised, time-major (the forecast part may be unused). */
  state: Buf;
  /** Windows with equal group share static factors under match pairing. */
  group: Int32Array;
  /** Gait phase (radians) at each observed dynamic point, size × K; NaN where unknown. */
  phase: Float64Array;
  /**
   * With the stride prior: the baseline's change of state per forecast step, forecast × size × N × 6
   * (time-major like `state`, normalised units); absent otherwise.
   */
  prior?: Buf;
  /** With the stride prior: its one-step changes of the teacher-forced transitions, reconSteps × size × N × 6. */
  priorRecon?: Buf;
  /** Standardised take signature of each window's take, size × P × SIGNATURE_FEATURES (NaN: none); absent: no signature term. */
  signature?: Float64Array;
}

/** How the encoder draws its samples. */
export interface EncodeOptions {
  /** Draw posterior samples (true) or use the posterior means (false). */
  sample: boolean;
  /** Add the prior's noise when rolling the dynamic factors forward (forecast sampling). */
  priorNoise: boolean;
}

function headForward(h: FactorHead, x: Buf, pairs: PairList, inDim: number, E: number, scratch: PairProjectionScratch, pre: Buf, mu: Buf, lv: Buf): void {
  nodeProjectPairs(x, h.wa.value, h.wb.value, h.b.value, pairs, inDim, E, scratch, pre);
  softsign(pre, pre, pairs.count * E);
  linearForward(pre, h.wMu.value, h.bMu.value, mu, pairs.count, E, h.dims);
  linearForward(pre, h.wLv.value, h.bLv.value, lv, pairs.count, E, h.dims);
}

function headBackward(h: FactorHead, x: Buf, pairs: PairList, inDim: number, E: number, scratch: PairProjectionScratch, pre: Buf, dPre: Buf, dMu: Buf, dLv: Buf, dx: Buf): void {
  const rows = pairs.count;
  linearBackward(pre, h.wMu.value, dMu, dPre, h.wMu.grad, h.bMu.grad, rows, E, h.dims, false);
  linearBackward(pre, h.wLv.value, dLv, dPre, h.wLv.grad, h.bLv.grad, rows, E, h.dims, true);
  softsignBackward(pre, dPre, dPre, rows * E);
  nodeProjectPairsBackward(x, h.wa.value, h.wb.value, dPre, pairs, inDim, E, scratch, dx, h.wa.grad, h.wb.grad, h.b.grad);
}

/** Fills the encoder input (observed steps × B·N × (6 + N)): the normalised state and the node one-hot. */
function fillEncoderInput(model: CouplingModel, ws: Workspace, batch: Batch): void {
  const c = model.config, N = c.nodes, I = encoderInputDim(c), rows = batch.size * N;
  const x = ws.encIn, s = batch.state;
  x.fill(0, 0, c.observe * rows * I);
  for (let t = 0; t < c.observe; t++)
    for (let r = 0; r < rows; r++) {
      const o = (t * rows + r) * I, i = (t * rows + r) * STATE_SIZE;
      for (let k = 0; k < STATE_SIZE; k++) x[o + k] = s[i + k]!;
      x[o + STATE_SIZE + (r % N)] = 1;
    }
}

/**
 * Runs the encoder on a batch: fills the posteriors (ws.muS/lvS, ws.muD/lvD), the static sample ws.sS,
 * the dynamic samples of every point ws.d (observed points from the posterior, later ones from the
 * prior) and the prior means ws.muP of points 1 … K − 1. Returns the workspace.
 */
export function encoderForward(model: CouplingModel, ws: Workspace, batch: Batch, rng: Pcg32, options: EncodeOptions): Workspace {
  const c = model.config, p = model.params, B = batch.size, N = c.nodes, T = c.observe;
  const H = c.hidden, E = c.pairHidden, S = c.staticDims, D = c.dynamicDims;
  const K = observedPoints(c), Kt = totalPoints(c), P = ws.pairs.count, BP = B * P, BN = B * N;
  if (B !== ws.batch) throw new RangeError(`workspace sized for ${ws.batch} windows, batch has ${B}`);
  fillEncoderInput(model, ws, batch);
  const hs = gruForward(p.gru, ws.encIn, null, ws.gru);
  // Static posterior from the time-pooled node states.
  meanPoolTime(hs, T, BN * H, ws.hbar);
  headForward(p.staticHead, ws.hbar, ws.pairsB, H, E, ws.scratchS, ws.preS, ws.muS, ws.lvS);
  groupAverage(c.matchPairing ? batch.group : null, ws.muS, ws.muSg, B, BP * S / B);
  groupAverage(c.matchPairing ? batch.group : null, ws.lvS, ws.lvSg, B, BP * S / B);
  const per = P * S;
  for (let b = 0; b < B; b++) {
    const lead = c.matchPairing ? groupLead(batch.group, b) : b;
    if (lead === b) {
      if (options.sample) rng.fillGauss(ws.epsS.subarray(b * per, (b + 1) * per));
      else ws.epsS.fill(0, b * per, (b + 1) * per);
    } else ws.epsS.copyWithin(b * per, lead * per, (lead + 1) * per);
  }
  gaussianReparam(ws.muSg, ws.lvSg, ws.epsS, ws.sS, BP * S);
  // Dynamic posteriors at the end of each point's interval.
  for (let j = 0; j < K; j++) ws.hd.set(hs.subarray(pointStep(c, j) * BN * H, (pointStep(c, j) + 1) * BN * H) as never, j * BN * H);
  headForward(p.dynamicHead, ws.hd, ws.pairsKB, H, E, ws.scratchD, ws.preD, ws.muD, ws.lvD);
  const nD = K * BP * D;
  if (options.sample) rng.fillGauss(ws.epsD, nD);
  else ws.epsD.fill(0, 0, nD);
  gaussianReparam(ws.muD, ws.lvD, ws.epsD, ws.d, nD);
  // Prior means of observed points 1 … K − 1 and the rolled-forward points K … Kt − 1.
  const blk = BP * D, A = p.priorA.value, cc = p.priorC.value, lv = p.priorLv.value;
  if (K > 1) linearForward(ws.d, A, cc, ws.muP.subarray(blk), (K - 1) * BP, D, D);
  for (let i = 0; i < (K - 1) * BP; i++) for (let k = 0; k < D; k++) ws.lvP[blk + i * D + k] = lv[k]!;
  if (options.priorNoise) rng.fillGauss(ws.epsPrior, (Kt - K) * blk);
  for (let j = K; j < Kt; j++) {
    const prev = ws.d.subarray((j - 1) * blk, j * blk), cur = ws.d.subarray(j * blk, (j + 1) * blk);
    linearForward(prev, A, cc, cur, BP, D, D);
    if (options.priorNoise) {
      const e = (j - K) * blk;
      for (let i = 0; i < BP; i++) for (let k = 0; k < D; k++) cur[i * D + k] = cur[i * D + k]! + Math.exp(0.5 * lv[k]!) * ws.epsPrior[e + i * D + k]!;
    }
  }
  // Decoder factor input [s, d] per pair and point.
  const Z = S + D;
  for (let j = 0; j < Kt; j++)
    for (let i = 0; i < BP; i++) {
      const o = (j * BP + i) * Z;
      for (let k = 0; k < S; k++) ws.zin[o + k] = ws.sS[i * S + k]!;
      for (let k = 0; k < D; k++) ws.zin[o + S + k] = ws.d[(j * BP + i) * D + k]!;
    }
  return ws;
}

/** Returns the first window index of b's group. */
function groupLead(group: Int32Array, b: number): number {
  for (let i = 0; i < b; i++) if (group[i] === group[b]) return i;
  return b;
}

/** Writes out[b] = mean of x over b's group (blocks of `width`); copies when group is null. */
function groupAverage(group: Int32Array | null, x: Buf, out: Buf, B: number, width: number): void {
  if (!group) {
    out.set(x.subarray(0, B * width) as never, 0);
    return;
  }
  for (let b = 0; b < B; b++) {
    const o = b * width;
    out.fill(0, o, o + width);
    let n = 0;
    for (let m = 0; m < B; m++) {
      if (group[m] !== group[b]) continue;
      n++;
      const q = m * width;
      for (let i = 0; i < width; i++) out[o + i] = out[o + i]! + x[q + i]!;
    }
    const inv = 1 / n;
    for (let i = 0; i < width; i++) out[o + i] = out[o + i]! * inv;
  }
}

/** Adds to dx[m] the backward pass of groupAverage: Σ over b in m's group of dOut[b] / |group|. */
function groupAverageBackward(group: Int32Array | null, dOut: Buf, dx: Buf, B: number, width: number): void {
  if (!group) {
    for (let i = 0; i < B * width; i++) dx[i] = dx[i]! + dOut[i]!;
    return;
  }
  for (let b = 0; b < B; b++) {
    let n = 0;
    for (let m = 0; m < B; m++) if (group[m] === group[b]) n++;
    const inv = 1 / n, o = b * width;
    for (let m = 0; m < B; m++) {
      if (group[m] !== group[b]) continue;
      const q = m * width;
      for (let i = 0; i < width; i++) dx[q + i] = dx[q + i]! + dOut[o + i]! * inv;
    }
  }
}

/**
 * Backward pass of encoderForward. On entry ws.dzin holds the gradient on the decoder's factor input,
 * ws.dmuD/dlvD and ws.dmuSg/dlvSg the KL and labeling gradients on the posteriors, and ws.dmuP/dlvP the
 * KL gradients on the prior of points 1 … K − 1, and dStaticExtra (may be null) a further gradient on the
 * static samples (the signature term's). Accumulates every encoder and prior parameter gradient.
 */
export function encoderBackward(model: CouplingModel, ws: Workspace, batch: Batch, dStaticExtra: Buf | null = null): void {
  const c = model.config, p = model.params, B = batch.size, N = c.nodes, T = c.observe;
  const H = c.hidden, E = c.pairHidden, S = c.staticDims, D = c.dynamicDims, Z = S + D;
  const K = observedPoints(c), Kt = totalPoints(c), P = ws.pairs.count, BP = B * P, BN = B * N, blk = BP * D;
  // Split the factor-input gradient into the static sample and each point's dynamic sample.
  ws.dsS.fill(0, 0, BP * S);
  ws.dd.fill(0, 0, Kt * blk);
  for (let j = 0; j < Kt; j++)
    for (let i = 0; i < BP; i++) {
      const o = (j * BP + i) * Z;
      for (let k = 0; k < S; k++) ws.dsS[i * S + k] = ws.dsS[i * S + k]! + ws.dzin[o + k]!;
      for (let k = 0; k < D; k++) ws.dd[(j * BP + i) * D + k] = ws.dzin[o + S + k]!;
    }
  if (dStaticExtra) for (let i = 0; i < BP * S; i++) ws.dsS[i] = ws.dsS[i]! + dStaticExtra[i]!;
  // Rolled-forward points, last first: d_j = d_{j−1}·A + c.
  const A = p.priorA.value;
  for (let j = Kt - 1; j >= K; j--)
    linearBackward(ws.d.subarray((j - 1) * blk, j * blk), A, ws.dd.subarray(j * blk, (j + 1) * blk), ws.dd.subarray((j - 1) * blk, j * blk), p.priorA.grad, p.priorC.grad, BP, D, D, true);
  // KL of points 1 … K − 1 against the prior reaches the previous samples through the prior mean.
  if (K > 1) {
    linearBackward(ws.d, A, ws.dmuP.subarray(blk), ws.dd, p.priorA.grad, p.priorC.grad, (K - 1) * BP, D, D, true);
    const g = p.priorLv.grad;
    for (let i = 0; i < (K - 1) * BP; i++) for (let k = 0; k < D; k++) g[k] = g[k]! + ws.dlvP[blk + i * D + k]!;
  }
  gaussianReparamBackward(ws.lvD, ws.epsD, ws.dd, ws.dmuD, ws.dlvD, K * blk);
  ws.dhd.fill(0, 0, K * BN * H);
  headBackward(p.dynamicHead, ws.hd, ws.pairsKB, H, E, ws.scratchD, ws.preD, ws.dPreD, ws.dmuD, ws.dlvD, ws.dhd);
  ws.dHs.fill(0, 0, T * BN * H);
  for (let j = 0; j < K; j++) {
    const o = pointStep(c, j) * BN * H, q = j * BN * H;
    for (let i = 0; i < BN * H; i++) ws.dHs[o + i] = ws.dHs[o + i]! + ws.dhd[q + i]!;
  }
  // Static: sample → group average → heads → pooled node states.
  gaussianReparamBackward(ws.lvSg, ws.epsS, ws.dsS, ws.dmuSg, ws.dlvSg, BP * S);
  ws.dmuS.fill(0, 0, BP * S);
  ws.dlvS.fill(0, 0, BP * S);
  const group = c.matchPairing ? batch.group : null;
  groupAverageBackward(group, ws.dmuSg, ws.dmuS, B, P * S);
  groupAverageBackward(group, ws.dlvSg, ws.dlvS, B, P * S);
  ws.dhbar.fill(0, 0, BN * H);
  headBackward(p.staticHead, ws.hbar, ws.pairsB, H, E, ws.scratchS, ws.preS, ws.dPreS, ws.dmuS, ws.dlvS, ws.dhbar);
  meanPoolTimeBackward(ws.dhbar, T, BN * H, ws.dHs);
  gruBackward(p.gru, ws.encIn, ws.gru, ws.dHs, null, null);
}
