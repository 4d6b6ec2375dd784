// A representative coupling model built from the src/nn kernels, for the training-step bench and the
// determinism and TensorFlow.js-equivalence tests. It follows DESIGN §4 in shape and cost: a GRU per node
// over the observed window, pair embeddings from split per-node projections and gather-add, a static
// factor posterior pooled over time, a dynamic factor posterior per step with an autoregressive prior, and
// a gated message-passing decoder (messages summed at receivers, the linear layer after the sum) that
// predicts each step's change of state under a Gaussian likelihood. The real model lives in src/model.
//
// Layout: node rows are (window, node) within a step and steps are outermost, so x is T × B × N × F;
// pair rows are (window, pair) within a step. The decoder is teacher-forced over the last Td steps of the
// window (x_t → x_{t+1} − x_t, with the factors of step t), so it batches over time like the encoder's pairs.
import { Adam, clipGlobalNorm } from '../../../src/nn/adam.js';
import { activate, activateBackward } from '../../../src/nn/activations.js';
import { addColumns, copyColumns, scaleRows, scaleRowsBackward } from '../../../src/nn/elementwise.js';
import {
  gaussianNll, gaussianNllBackward, gaussianReparam, gaussianReparamBackward,
  klGaussians, klGaussiansBackward, klStdNormal, klStdNormalBackward,
} from '../../../src/nn/gaussian.js';
import { createGru, createGruCache, gruBackward, gruForward, type GruCache, type GruParams } from '../../../src/nn/gru.js';
import { linearBackward, linearForward } from '../../../src/nn/linear.js';
import {
  allOrderedPairs, nodeProjectPairs, nodeProjectPairsBackward, scatterAddToReceivers,
  scatterAddToReceiversBackward, tilePairs, type PairList, type PairProjectionScratch,
} from '../../../src/nn/pairs.js';
import { ParamStore, type Param } from '../../../src/nn/params.js';
import { meanPoolTime, meanPoolTimeBackward } from '../../../src/nn/pool.js';
import { Pcg32 } from '../../../src/nn/prng.js';

/** Sizes of the step model. */
export interface StepConfig {
  windows: number;
  nodes: number;
  features: number;
  hidden: number;
  steps: number;
  decoderSteps: number;
  staticDims: number;
  dynamicDims: number;
  beta: number;
}

/** The bench's default: 19 nodes, all 342 ordered pairs, hidden 32, 60 observed steps, 30 decoded, 16 windows. */
export const BENCH_CONFIG: StepConfig = {
  windows: 16, nodes: 19, features: 6, hidden: 32, steps: 60, decoderSteps: 30, staticDims: 4, dynamicDims: 4, beta: 1,
};

function scratch(store: ParamStore, n: number): PairProjectionScratch {
  return { a: store.alloc(n), b: store.alloc(n), da: store.alloc(n), db: store.alloc(n) };
}

/** The model, its buffers, its optimiser and its noise generator. */
export class StepModel {
  readonly store: ParamStore;
  readonly cfg: StepConfig;
  readonly rng: Pcg32;
  readonly adam: Adam;
  readonly basePairs: PairList;
  readonly gru: GruParams;
  readonly p: Record<string, Param>;
  lastKlStatic = 0;
  lastKlDynamic = 0;
  lastNll = 0;
  private readonly gc: GruCache;
  private readonly encPairs: PairList;
  private readonly decPairs: PairList;
  private readonly b: Record<string, Float32Array>;
  private readonly encScr: PairProjectionScratch;
  private readonly decScr: PairProjectionScratch;
  private x: Float32Array = new Float32Array(0);

  /** A model with Xavier weights drawn from PCG32(seed, 1) and training noise from PCG32(seed, 2). */
  constructor(cfg: StepConfig, seed: number, lr = 1e-3) {
    this.cfg = cfg;
    const { windows: B, nodes: N, features: F, hidden: H, steps: T, decoderSteps: Td, staticDims: ds, dynamicDims: dd } = cfg;
    if (Td > T - 1) throw new Error('decoder steps must leave one observed step for the first target');
    const init = new Pcg32(seed, 1);
    this.rng = new Pcg32(seed, 2);
    const s = (this.store = new ParamStore());
    const C = ds + dd;
    this.gru = createGru(s, 'enc.gru', F, H, init);
    const add = (name: string, shape: number[], kind: 'xavier' | 'zeros') => s.add(name, shape, kind, init);
    this.p = {
      encWa: add('enc.pair.wa', [H, H], 'xavier'), encWb: add('enc.pair.wb', [H, H], 'xavier'), encB: add('enc.pair.b', [H], 'zeros'),
      dMuW: add('enc.dyn.mu.w', [H, dd], 'xavier'), dMuB: add('enc.dyn.mu.b', [dd], 'zeros'),
      dLvW: add('enc.dyn.lv.w', [H, dd], 'xavier'), dLvB: add('enc.dyn.lv.b', [dd], 'zeros'),
      sMuW: add('enc.sta.mu.w', [H, ds], 'xavier'), sMuB: add('enc.sta.mu.b', [ds], 'zeros'),
      sLvW: add('enc.sta.lv.w', [H, ds], 'xavier'), sLvB: add('enc.sta.lv.b', [ds], 'zeros'),
      pMuW: add('prior.mu.w', [dd, dd], 'xavier'), pMuB: add('prior.mu.b', [dd], 'zeros'),
      pLvW: add('prior.lv.w', [dd, dd], 'xavier'), pLvB: add('prior.lv.b', [dd], 'zeros'),
      decWa: add('dec.pair.wa', [F, H], 'xavier'), decWb: add('dec.pair.wb', [F, H], 'xavier'), decB: add('dec.pair.b', [H], 'zeros'),
      decWc: add('dec.pair.wc', [C, H], 'xavier'),
      gateW: add('dec.gate.w', [C, 1], 'xavier'), gateB: add('dec.gate.b', [1], 'zeros'),
      n1x: add('dec.node.wx', [F, H], 'xavier'), n1m: add('dec.node.wm', [H, H], 'xavier'), n1b: add('dec.node.b', [H], 'zeros'),
      n2w: add('dec.out.w', [H, F], 'xavier'), n2b: add('dec.out.b', [F], 'zeros'),
      lv: add('dec.logvar', [F], 'zeros'),
    };
    this.adam = new Adam(s.size, { lr });
    this.basePairs = allOrderedPairs(N);
    const P = this.basePairs.count;
    this.encPairs = tilePairs(this.basePairs, T * B);
    this.decPairs = tilePairs(this.basePairs, Td * B);
    const R = B * N, Q = B * P, RT = T * R, QT = T * Q, RD = Td * R, QD = Td * Q;
    this.gc = createGruCache(s, this.gru, R, T);
    this.encScr = scratch(s, RT * H);
    this.decScr = scratch(s, RD * H);
    const f = (n: number) => new Float32Array(n);
    this.b = {
      u: f(QT * H), dU: f(QT * H), dHs: f(RT * H),
      muD: f(QT * dd), lvD: f(QT * dd), epsD: f(QT * dd), d: f(QT * dd), dMuD: f(QT * dd), dLvD: f(QT * dd), dD: f(QT * dd),
      uPool: f(Q * H), dUPool: f(Q * H),
      muS: f(Q * ds), lvS: f(Q * ds), epsS: f(Q * ds), sS: f(Q * ds), dMuS: f(Q * ds), dLvS: f(Q * ds), dS: f(Q * ds),
      muP: f((T - 1) * Q * dd), lvP: f((T - 1) * Q * dd), dMuP: f((T - 1) * Q * dd), dLvP: f((T - 1) * Q * dd),
      c: f(QD * C), dC: f(QD * C), fm: f(QD * H), dF: f(QD * H), gate: f(QD), dG: f(QD), m: f(QD * H), dM: f(QD * H),
      agg: f(RD * H), dAgg: f(RD * H), hid: f(RD * H), dHid: f(RD * H), mean: f(RD * F), dMean: f(RD * F), target: f(RD * F),
    };
  }

  /** Returns the noise buffers (static Q × ds, dynamic T × Q × dd) the next forward pass will read. */
  noise(): { epsS: Float32Array; epsD: Float32Array } {
    return { epsS: this.b['epsS']!, epsD: this.b['epsD']! };
  }

  /** Returns the loss, (NLL + β·(KL_static + KL_dynamic)) / windows, for x (T × B × N × F) and the current noise. */
  forward(x: Float32Array): number {
    const { windows: B, features: F, hidden: H, steps: T, decoderSteps: Td, staticDims: ds, dynamicDims: dd, beta } = this.cfg;
    const b = this.b, p = this.p;
    const N = this.cfg.nodes, P = this.basePairs.count, R = B * N, Q = B * P, QT = T * Q, C = ds + dd;
    const RD = Td * R, QD = Td * Q, t0 = T - 1 - Td;
    this.x = x;
    const hs = gruForward(this.gru, x, null, this.gc);
    nodeProjectPairs(hs, p['encWa']!.value, p['encWb']!.value, p['encB']!.value, this.encPairs, H, H, this.encScr, b['u']!);
    activate('tanh', b['u']!, b['u']!, QT * H);
    linearForward(b['u']!, p['dMuW']!.value, p['dMuB']!.value, b['muD']!, QT, H, dd);
    linearForward(b['u']!, p['dLvW']!.value, p['dLvB']!.value, b['lvD']!, QT, H, dd);
    meanPoolTime(b['u']!, T, Q * H, b['uPool']!);
    linearForward(b['uPool']!, p['sMuW']!.value, p['sMuB']!.value, b['muS']!, Q, H, ds);
    linearForward(b['uPool']!, p['sLvW']!.value, p['sLvB']!.value, b['lvS']!, Q, H, ds);
    gaussianReparam(b['muS']!, b['lvS']!, b['epsS']!, b['sS']!, Q * ds);
    gaussianReparam(b['muD']!, b['lvD']!, b['epsD']!, b['d']!, QT * dd);
    const klS = klStdNormal(b['muS']!, b['lvS']!, Q, ds, null);
    // Autoregressive prior: p(d_t | d_{t−1}) = N(d_{t−1}·Wμ + bμ, exp(d_{t−1}·Wλ + bλ)); the first step against N(0, 1).
    const QP = (T - 1) * Q, first = Q * dd;
    linearForward(b['d']!, p['pMuW']!.value, p['pMuB']!.value, b['muP']!, QP, dd, dd);
    linearForward(b['d']!, p['pLvW']!.value, p['pLvB']!.value, b['lvP']!, QP, dd, dd);
    const klD = klStdNormal(b['muD']!, b['lvD']!, Q, dd, null)
      + klGaussians(b['muD']!.subarray(first), b['lvD']!.subarray(first), b['muP']!, b['lvP']!, QP, dd, null);
    // Decoder inputs: factors [s, d_t] per pair and step, node states x_t, targets x_{t+1} − x_t.
    for (let k = 0; k < Td; k++) {
      const ck = b['c']!.subarray(k * Q * C);
      copyColumns(b['sS']!, ds, 0, ck, C, 0, Q, ds);
      copyColumns(b['d']!.subarray((t0 + k) * Q * dd), dd, 0, ck, C, ds, Q, dd);
    }
    const xDec = x.subarray(t0 * R * F, (t0 + Td) * R * F), next = (t0 + 1) * R * F, tg = b['target']!;
    for (let i = 0; i < RD * F; i++) tg[i] = x[next + i]! - xDec[i]!;
    nodeProjectPairs(xDec, p['decWa']!.value, p['decWb']!.value, p['decB']!.value, this.decPairs, F, H, this.decScr, b['fm']!);
    linearForward(b['c']!, p['decWc']!.value, null, b['fm']!, QD, C, H, true);
    activate('tanh', b['fm']!, b['fm']!, QD * H);
    linearForward(b['c']!, p['gateW']!.value, p['gateB']!.value, b['gate']!, QD, C, 1);
    activate('sigmoid', b['gate']!, b['gate']!, QD);
    scaleRows(b['fm']!, b['gate']!, b['m']!, QD, H);
    scatterAddToReceivers(b['m']!, this.decPairs, H, b['agg']!);
    linearForward(xDec, p['n1x']!.value, p['n1b']!.value, b['hid']!, RD, F, H);
    linearForward(b['agg']!, p['n1m']!.value, null, b['hid']!, RD, H, H, true);
    activate('tanh', b['hid']!, b['hid']!, RD * H);
    linearForward(b['hid']!, p['n2w']!.value, p['n2b']!.value, b['mean']!, RD, H, F);
    const nll = gaussianNll(tg, b['mean']!, p['lv']!.value, RD, F, true, null);
    this.lastNll = nll;
    this.lastKlStatic = klS;
    this.lastKlDynamic = klD;
    return (nll + beta * (klS + klD)) / B;
  }

  /** Returns the gradient buffer after backpropagating the last forward pass (gradients are overwritten). */
  backward(): Float32Array {
    const { windows: B, features: F, hidden: H, steps: T, decoderSteps: Td, staticDims: ds, dynamicDims: dd, beta } = this.cfg;
    const b = this.b, p = this.p, x = this.x;
    const N = this.cfg.nodes, P = this.basePairs.count, R = B * N, Q = B * P, QT = T * Q, C = ds + dd;
    const RD = Td * R, QD = Td * Q, t0 = T - 1 - Td, QP = (T - 1) * Q, first = Q * dd;
    const sc = 1 / B, kb = beta / B;
    this.store.zeroGrads();
    for (const k of ['dMuD', 'dLvD', 'dD', 'dMuS', 'dLvS', 'dS', 'dMuP', 'dLvP', 'dC', 'dMean', 'dM', 'dHs']) b[k]!.fill(0);
    const xDec = x.subarray(t0 * R * F, (t0 + Td) * R * F);
    // Decoder.
    gaussianNllBackward(b['target']!, b['mean']!, p['lv']!.value, RD, F, true, sc, b['dMean']!, p['lv']!.grad, null);
    linearBackward(b['hid']!, p['n2w']!.value, b['dMean']!, b['dHid']!, p['n2w']!.grad, p['n2b']!.grad, RD, H, F, false);
    activateBackward('tanh', b['hid']!, b['hid']!, b['dHid']!, b['dHid']!, RD * H);
    linearBackward(xDec, p['n1x']!.value, b['dHid']!, null, p['n1x']!.grad, p['n1b']!.grad, RD, F, H);
    linearBackward(b['agg']!, p['n1m']!.value, b['dHid']!, b['dAgg']!, p['n1m']!.grad, null, RD, H, H, false);
    scatterAddToReceiversBackward(b['dAgg']!, this.decPairs, H, b['dM']!);
    b['dG']!.fill(0);
    b['dF']!.fill(0);
    scaleRowsBackward(b['fm']!, b['gate']!, b['dM']!, b['dF']!, b['dG']!, QD, H);
    activateBackward('sigmoid', b['gate']!, b['gate']!, b['dG']!, b['dG']!, QD);
    linearBackward(b['c']!, p['gateW']!.value, b['dG']!, b['dC']!, p['gateW']!.grad, p['gateB']!.grad, QD, C, 1);
    activateBackward('tanh', b['fm']!, b['fm']!, b['dF']!, b['dF']!, QD * H);
    linearBackward(b['c']!, p['decWc']!.value, b['dF']!, b['dC']!, p['decWc']!.grad, null, QD, C, H);
    nodeProjectPairsBackward(xDec, p['decWa']!.value, p['decWb']!.value, b['dF']!, this.decPairs, F, H, this.decScr,
      null, p['decWa']!.grad, p['decWb']!.grad, p['decB']!.grad);
    for (let k = 0; k < Td; k++) {
      const ck = b['dC']!.subarray(k * Q * C);
      addColumns(ck, C, 0, b['dS']!, ds, 0, Q, ds);
      addColumns(ck, C, ds, b['dD']!.subarray((t0 + k) * Q * dd), dd, 0, Q, dd);
    }
    // KL terms and the prior.
    klStdNormalBackward(b['muS']!, b['lvS']!, Q * ds, kb, b['dMuS']!, b['dLvS']!);
    klStdNormalBackward(b['muD']!, b['lvD']!, first, kb, b['dMuD']!, b['dLvD']!);
    klGaussiansBackward(b['muD']!.subarray(first), b['lvD']!.subarray(first), b['muP']!, b['lvP']!, QP * dd, kb,
      b['dMuD']!.subarray(first), b['dLvD']!.subarray(first), b['dMuP']!, b['dLvP']!);
    linearBackward(b['d']!, p['pMuW']!.value, b['dMuP']!, b['dD']!, p['pMuW']!.grad, p['pMuB']!.grad, QP, dd, dd);
    linearBackward(b['d']!, p['pLvW']!.value, b['dLvP']!, b['dD']!, p['pLvW']!.grad, p['pLvB']!.grad, QP, dd, dd);
    gaussianReparamBackward(b['lvD']!, b['epsD']!, b['dD']!, b['dMuD']!, b['dLvD']!, QT * dd);
    gaussianReparamBackward(b['lvS']!, b['epsS']!, b['dS']!, b['dMuS']!, b['dLvS']!, Q * ds);
    // Encoder.
    linearBackward(b['uPool']!, p['sMuW']!.value, b['dMuS']!, b['dUPool']!, p['sMuW']!.grad, p['sMuB']!.grad, Q, H, ds, false);
    linearBackward(b['uPool']!, p['sLvW']!.value, b['dLvS']!, b['dUPool']!, p['sLvW']!.grad, p['sLvB']!.grad, Q, H, ds, true);
    linearBackward(b['u']!, p['dMuW']!.value, b['dMuD']!, b['dU']!, p['dMuW']!.grad, p['dMuB']!.grad, QT, H, dd, false);
    linearBackward(b['u']!, p['dLvW']!.value, b['dLvD']!, b['dU']!, p['dLvW']!.grad, p['dLvB']!.grad, QT, H, dd, true);
    meanPoolTimeBackward(b['dUPool']!, T, Q * H, b['dU']!);
    activateBackward('tanh', b['u']!, b['u']!, b['dU']!, b['dU']!, QT * H);
    const hs = this.gc.h.subarray(R * H);
    nodeProjectPairsBackward(hs, p['encWa']!.value, p['encWb']!.value, b['dU']!, this.encPairs, H, H, this.encScr,
      b['dHs']!, p['encWa']!.grad, p['encWb']!.grad, p['encB']!.grad);
    gruBackward(this.gru, x, this.gc, b['dHs']!, null, null);
    return this.store.gradView() as Float32Array;
  }

  /** Returns the loss of one training step on x: fresh noise, forward, backward, clipping at maxNorm, Adam. */
  trainStep(x: Float32Array, maxNorm = 5): number {
    this.rng.fillGauss(this.b['epsS']!);
    this.rng.fillGauss(this.b['epsD']!);
    const loss = this.forward(x);
    this.backward();
    clipGlobalNorm(this.store.gradView(), maxNorm);
    this.adam.step(this.store.valueView(), this.store.gradView());
    return loss;
  }
}

/** Returns a smooth synthetic batch x (T × B × N × F): positions on phase-shifted sinusoids, velocities their differences. */
export function syntheticBatch(cfg: StepConfig, seed: number): Float32Array {
  const { windows: B, nodes: N, features: F, steps: T } = cfg;
  const rng = new Pcg32(seed, 3);
  const phase = Float64Array.from({ length: B * N * F }, () => rng.next() * 2 * Math.PI);
  const amp = Float64Array.from({ length: B * N * F }, () => 0.2 + 0.3 * rng.next());
  const x = new Float32Array(T * B * N * F);
  for (let t = 0; t < T; t++)
    for (let i = 0; i < B * N * F; i++) {
      const f = i % F, w = 2 * Math.PI * (1 + 0.1 * (i % 7)) / 30;
      const pos = (k: number) => amp[i]! * Math.sin(w * k + phase[i]!);
      x[t * B * N * F + i] = f < F / 2 ? pos(t) : (pos(t) - pos(t - 1)) * 10 + 0.01 * rng.gauss();
    }
  return x;
}
