// The step model of step-model.ts written in TensorFlow.js ops, for the bench's peer and the equivalence
// test. Same architecture, same equations, weights copied from the kernel model's store by name; only the
// layout differs: node rows are node-major (node, window) and pair rows (pair, step, window), so gathers
// over pairs and sums at receivers act on the first axis. The wasm backend has GatherV2 and
// SparseSegmentSum but no UnsortedSegmentSum (which tf.gather's built-in gradient needs), so both pair
// operations are custom-gradient ops built from those two kernels, usable on cpu and wasm alike.
import * as tf from '@tensorflow/tfjs';
import type { ParamStore } from '../../../src/nn/params.js';
import type { PairList } from '../../../src/nn/pairs.js';
import type { StepConfig } from './step-model.js';

type GatherFn = (a: tf.Tensor) => tf.Tensor;

/** The TensorFlow.js twin of StepModel. */
export class TfStepModel {
  readonly cfg: StepConfig;
  readonly vars: Record<string, tf.Variable>;
  private readonly gatherSend: GatherFn;
  private readonly gatherRecv: GatherFn;
  private readonly sumAtRecv: GatherFn;

  /** Variables named and valued as the store's parameters; pair index tensors from the base pair list. */
  constructor(cfg: StepConfig, store: ParamStore, pairs: PairList) {
    this.cfg = cfg;
    this.vars = {};
    for (const p of store.params) this.vars[p.name] = tf.variable(tf.tensor(Float32Array.from(p.value), [...p.shape]), true, `${p.name}#${Math.random()}`);
    const N = pairs.nodes, P = pairs.count;
    const send = tf.keep(tf.tensor1d(pairs.senders, 'int32')), recv = tf.keep(tf.tensor1d(pairs.receivers, 'int32'));
    const byRecv = Array.from({ length: P }, (_, k) => k).sort((a, b) => pairs.receivers[a]! - pairs.receivers[b]! || a - b);
    const perm = tf.keep(tf.tensor1d(byRecv, 'int32'));
    const recvSorted = tf.keep(tf.tensor1d(byRecv.map((k) => pairs.receivers[k]!), 'int32'));
    const sendOrder = Array.from({ length: P }, (_, k) => k).sort((a, b) => pairs.senders[a]! - pairs.senders[b]! || a - b);
    const sendPerm = tf.keep(tf.tensor1d(sendOrder, 'int32'));
    const sendSorted = tf.keep(tf.tensor1d(sendOrder.map((k) => pairs.senders[k]!), 'int32'));
    if (new Set(pairs.senders).size !== N || new Set(pairs.receivers).size !== N) throw new Error('every node must send and receive');
    // gather rows by index, gradient = sum of the gathered rows' gradients back at their source rows.
    const gatherWith = (idx: tf.Tensor1D, sortedPerm: tf.Tensor1D, sortedIds: tf.Tensor1D): GatherFn =>
      tf.customGrad((...args: Array<tf.Tensor | tf.GradSaveFunc>) => ({
        value: tf.gather(args[0] as tf.Tensor, idx),
        gradFunc: (dy: tf.Tensor) => [tf.sparse.sparseSegmentSum(dy, sortedPerm, sortedIds)],
      })) as GatherFn;
    this.gatherSend = gatherWith(send, sendPerm, sendSorted);
    this.gatherRecv = gatherWith(recv, perm, recvSorted);
    this.sumAtRecv = tf.customGrad((...args: Array<tf.Tensor | tf.GradSaveFunc>) => ({
      value: tf.sparse.sparseSegmentSum(args[0] as tf.Tensor, perm, recvSorted),
      gradFunc: (dy: tf.Tensor) => [tf.gather(dy, recv)],
    })) as GatherFn;
  }

  /** Returns the variables in store order. */
  varList(): tf.Variable[] {
    return Object.values(this.vars);
  }

  /** Returns the scalar loss for x (T × N·B × F, node-major rows), epsS (P·B × ds) and epsD (P·T·B × dd). */
  loss(x: tf.Tensor, epsS: tf.Tensor, epsD: tf.Tensor): tf.Scalar {
    const { windows: B, nodes: N, features: F, hidden: H, steps: T, decoderSteps: Td, staticDims: ds, dynamicDims: dd, beta } = this.cfg;
    const v = this.vars, P = N * (N - 1), t0 = T - 1 - Td;
    const w = (n: string) => v[n]!;
    const mm = (a: tf.Tensor, b: tf.Tensor) => tf.matMul(a as tf.Tensor2D, b as tf.Tensor2D);
    // GRU over the window, gates [z | r | n], reset after.
    const xp = tf.unstack(tf.reshape(tf.add(mm(tf.reshape(x, [T * N * B, F]), w('enc.gru.wx')), w('enc.gru.bx')), [T, N * B, 3 * H]));
    let h: tf.Tensor = tf.zeros([N * B, H]);
    const hs: tf.Tensor[] = [];
    for (let t = 0; t < T; t++) {
      const hu = tf.add(mm(h, w('enc.gru.uh')), w('enc.gru.bh'));
      const [xz, xr, xn] = tf.split(xp[t]!, 3, 1);
      const [uz, ur, un] = tf.split(hu, 3, 1);
      const z = tf.sigmoid(tf.add(xz!, uz!)), r = tf.sigmoid(tf.add(xr!, ur!));
      const n = tf.tanh(tf.add(xn!, tf.mul(r, un!)));
      h = tf.add(tf.mul(tf.sub(1, z), n), tf.mul(z, h));
      hs.push(h);
    }
    // Node-major hidden states [N, T, B, H], split first layer of the pair MLP, gather-add over pairs.
    const hsN = tf.reshape(tf.transpose(tf.reshape(tf.stack(hs), [T, N, B * H]), [1, 0, 2]), [N * T * B, H]);
    const pa = tf.reshape(mm(hsN, w('enc.pair.wa')), [N, T * B * H]), pb = tf.reshape(mm(hsN, w('enc.pair.wb')), [N, T * B * H]);
    const u = tf.tanh(tf.add(tf.reshape(tf.add(this.gatherSend(pa), this.gatherRecv(pb)), [P * T * B, H]), w('enc.pair.b')));
    const muD = tf.add(mm(u, w('enc.dyn.mu.w')), w('enc.dyn.mu.b')), lvD = tf.add(mm(u, w('enc.dyn.lv.w')), w('enc.dyn.lv.b'));
    const pool = tf.reshape(tf.mean(tf.reshape(u, [P, T, B * H]), 1), [P * B, H]);
    const muS = tf.add(mm(pool, w('enc.sta.mu.w')), w('enc.sta.mu.b')), lvS = tf.add(mm(pool, w('enc.sta.lv.w')), w('enc.sta.lv.b'));
    const sample = (mu: tf.Tensor, lv: tf.Tensor, eps: tf.Tensor) => tf.add(mu, tf.mul(tf.exp(tf.mul(0.5, lv)), eps));
    const s = sample(muS, lvS, epsS), d = sample(muD, lvD, epsD);
    const klStd = (mu: tf.Tensor, lv: tf.Tensor) => tf.mul(0.5, tf.sum(tf.sub(tf.sub(tf.add(tf.square(mu), tf.exp(lv)), 1), lv)));
    const klS = klStd(muS, lvS);
    const d4 = tf.reshape(d, [P, T, B, dd]), muD4 = tf.reshape(muD, [P, T, B, dd]), lvD4 = tf.reshape(lvD, [P, T, B, dd]);
    const dPrev = tf.reshape(tf.slice(d4, [0, 0, 0, 0], [P, T - 1, B, dd]), [P * (T - 1) * B, dd]);
    const muP = tf.add(mm(dPrev, w('prior.mu.w')), w('prior.mu.b')), lvP = tf.add(mm(dPrev, w('prior.lv.w')), w('prior.lv.b'));
    const rest = (a: tf.Tensor) => tf.reshape(tf.slice(a, [0, 1, 0, 0], [P, T - 1, B, dd]), [P * (T - 1) * B, dd]);
    const firstStep = (a: tf.Tensor) => tf.slice(a, [0, 0, 0, 0], [P, 1, B, dd]);
    const mq = rest(muD4), lq = rest(lvD4);
    const klAr = tf.mul(0.5, tf.sum(tf.sub(tf.add(tf.sub(lvP, lq), tf.div(tf.add(tf.exp(lq), tf.square(tf.sub(mq, muP))), tf.exp(lvP))), 1)));
    const klD = tf.add(klStd(firstStep(muD4), firstStep(lvD4)), klAr);
    // Decoder, teacher-forced over steps t0 … t0 + Td − 1.
    const nodeMajor = (a: tf.Tensor) => tf.reshape(tf.transpose(tf.reshape(a, [Td, N, B * F]), [1, 0, 2]), [N * Td * B, F]);
    const xDec = nodeMajor(tf.slice(x, [t0, 0, 0], [Td, N * B, F]));
    const target = tf.sub(nodeMajor(tf.slice(x, [t0 + 1, 0, 0], [Td, N * B, F])), xDec);
    const xa = tf.reshape(mm(xDec, w('dec.pair.wa')), [N, Td * B * H]), xb = tf.reshape(mm(xDec, w('dec.pair.wb')), [N, Td * B * H]);
    const dDec = tf.reshape(tf.slice(d4, [0, t0, 0, 0], [P, Td, B, dd]), [P * Td * B, dd]);
    const wc = w('dec.pair.wc'), wg = w('dec.gate.w');
    const wcS = tf.slice(wc, [0, 0], [ds, H]), wcD = tf.slice(wc, [ds, 0], [dd, H]);
    const wgS = tf.slice(wg, [0, 0], [ds, 1]), wgD = tf.slice(wg, [ds, 0], [dd, 1]);
    const pre = tf.add(
      tf.add(tf.reshape(tf.add(this.gatherSend(xa), this.gatherRecv(xb)), [P, Td, B, H]), tf.reshape(mm(dDec, wcD), [P, Td, B, H])),
      tf.reshape(mm(s, wcS), [P, 1, B, H]), // the static factors broadcast over the decoded steps
    );
    const f = tf.tanh(tf.add(pre, w('dec.pair.b')));
    const gate = tf.sigmoid(tf.add(tf.add(tf.reshape(mm(s, wgS), [P, 1, B, 1]), tf.reshape(mm(dDec, wgD), [P, Td, B, 1])), w('dec.gate.b')));
    const agg = tf.reshape(this.sumAtRecv(tf.reshape(tf.mul(f, gate), [P, Td * B * H])), [N * Td * B, H]);
    const hid = tf.tanh(tf.add(tf.add(mm(xDec, w('dec.node.wx')), mm(agg, w('dec.node.wm'))), w('dec.node.b')));
    const mean = tf.add(mm(hid, w('dec.out.w')), w('dec.out.b'));
    const lv = w('dec.logvar');
    const nll = tf.mul(0.5, tf.sum(tf.add(tf.add(Math.log(2 * Math.PI), lv), tf.div(tf.square(tf.sub(target, mean)), tf.exp(lv)))));
    return tf.div(tf.add(nll, tf.mul(beta, tf.add(klS, klD))), B) as tf.Scalar;
  }
}

/** Returns the kernel model's inputs (x T×B×N×F, epsS B·P×ds, epsD T×B·P×dd) in the TensorFlow.js layout. */
export function toTfLayout(cfg: StepConfig, x: Float32Array, epsS: Float32Array, epsD: Float32Array): { x: tf.Tensor; epsS: tf.Tensor; epsD: tf.Tensor } {
  const { windows: B, nodes: N, features: F, steps: T, staticDims: ds, dynamicDims: dd } = cfg, P = N * (N - 1);
  return tf.tidy(() => ({
    x: tf.reshape(tf.transpose(tf.tensor4d(x, [T, B, N, F]), [0, 2, 1, 3]), [T, N * B, F]),
    epsS: tf.reshape(tf.transpose(tf.tensor3d(epsS, [B, P, ds]), [1, 0, 2]), [P * B, ds]),
    epsD: tf.reshape(tf.transpose(tf.tensor4d(epsD, [T, B, P, dd]), [2, 0, 1, 3]), [P * T * B, dd]),
  }));
}
