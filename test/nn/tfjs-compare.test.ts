// The kernels against the same layers built from TensorFlow.js ops on the same weights (cpu backend,
// gradients by tf.grads): outputs and every gradient agree within 1e-3 relative error (‖Δ‖∞ / ‖ref‖∞),
// the bound the model's issue sets. Both sides run in float32.
import { beforeAll, describe, expect, it } from 'vitest';
import { sigmoid } from '../../src/nn/activations.js';
import { causalConvBackward, causalConvForward, createCausalConv } from '../../src/nn/causal-conv.js';
import {
  gaussianNll, gaussianNllBackward, gaussianReparam, gaussianReparamBackward,
  klGaussians, klGaussiansBackward, klStdNormal, klStdNormalBackward,
} from '../../src/nn/gaussian.js';
import { createGru, createGruCache, gruBackward, gruForward } from '../../src/nn/gru.js';
import { linearBackward, linearForward } from '../../src/nn/linear.js';
import { createMlp, mlpBackward, mlpForward } from '../../src/nn/mlp.js';
import {
  allOrderedPairs, nodeProjectPairs, nodeProjectPairsBackward, scatterAddToReceivers,
  scatterAddToReceiversBackward, tilePairs,
} from '../../src/nn/pairs.js';
import { ParamStore } from '../../src/nn/params.js';
import { Pcg32 } from '../../src/nn/prng.js';
import { relErr, tf, useCpu, values } from './support/tf.js';

const TOL = 1e-3;
const f32 = (rng: Pcg32, n: number, s = 1) => {
  const a = new Float32Array(n);
  for (let i = 0; i < n; i++) a[i] = s * rng.gauss();
  return a;
};

beforeAll(useCpu);

describe('kernels agree with TensorFlow.js', () => {
  it('linear layer', () => {
    const rng = new Pcg32(1, 100);
    const R = 7, I = 5, O = 6;
    const x = f32(rng, R * I), w = f32(rng, I * O), b = f32(rng, O), probe = f32(rng, R * O);
    const y = linearForward(x, w, b, new Float32Array(R * O), R, I, O);
    const dx = new Float32Array(R * I), dw = new Float32Array(I * O), db = new Float32Array(O);
    linearBackward(x, w, probe, dx, dw, db, R, I, O);
    const P = tf.tensor2d(probe, [R, O]);
    const f = (X: tf.Tensor, W: tf.Tensor, B: tf.Tensor) => tf.add(tf.matMul(X as tf.Tensor2D, W as tf.Tensor2D), B);
    const [gx, gw, gb] = tf.grads((X, W, B) => tf.sum(tf.mul(f(X, W, B), P)))([tf.tensor2d(x, [R, I]), tf.tensor2d(w, [I, O]), tf.tensor1d(b)]);
    expect(relErr(y, values(f(tf.tensor2d(x, [R, I]), tf.tensor2d(w, [I, O]), tf.tensor1d(b))))).toBeLessThan(TOL);
    expect(relErr(dx, values(gx!))).toBeLessThan(TOL);
    expect(relErr(dw, values(gw!))).toBeLessThan(TOL);
    expect(relErr(db, values(gb!))).toBeLessThan(TOL);
  });

  it('MLP (tanh, relu, sigmoid layers)', () => {
    const rng = new Pcg32(2, 100);
    const store = new ParamStore();
    const R = 9, dims = [4, 8, 6, 3];
    const acts = ['tanh', 'relu', 'sigmoid'] as const;
    const mlp = createMlp(store, 'm', dims, acts, R, rng);
    for (const p of store.params) if (p.name.endsWith('.b')) p.value.set(f32(rng, p.size, 0.2));
    const x = f32(rng, R * 4), probe = f32(rng, R * 3);
    const y = Float32Array.from(mlpForward(mlp, x, R).subarray(0, R * 3));
    const dx = new Float32Array(R * 4);
    mlpBackward(mlp, x, probe, dx, R);
    const ws = mlp.layers.map((L) => [tf.tensor2d(L.w.value as Float32Array, [L.inDim, L.outDim]), tf.tensor1d(L.b.value as Float32Array)] as const);
    const fn = (X: tf.Tensor, ...flat: tf.Tensor[]) => {
      let h = X as tf.Tensor2D;
      for (let i = 0; i < 3; i++) {
        const pre = tf.add(tf.matMul(h, flat[2 * i] as tf.Tensor2D), flat[2 * i + 1]!) as tf.Tensor2D;
        h = (acts[i] === 'tanh' ? tf.tanh(pre) : acts[i] === 'relu' ? tf.relu(pre) : tf.sigmoid(pre)) as tf.Tensor2D;
      }
      return h;
    };
    const X = tf.tensor2d(x, [R, 4]), P = tf.tensor2d(probe, [R, 3]);
    const inputs = [X, ...ws.flat()];
    const g = tf.grads((...a: tf.Tensor[]) => tf.sum(tf.mul(fn(a[0]!, ...a.slice(1)), P)))(inputs);
    expect(relErr(y, values(fn(X, ...ws.flat())))).toBeLessThan(TOL);
    expect(relErr(dx, values(g[0]!))).toBeLessThan(TOL);
    mlp.layers.forEach((L, i) => {
      expect(relErr(L.w.grad, values(g[1 + 2 * i]!))).toBeLessThan(TOL);
      expect(relErr(L.b.grad, values(g[2 + 2 * i]!))).toBeLessThan(TOL);
    });
  });

  it('GRU over six steps (reset-after form written out in TensorFlow.js ops)', () => {
    const rng = new Pcg32(3, 100);
    const store = new ParamStore();
    const R = 5, I = 3, H = 4, T = 6;
    const gru = createGru(store, 'g', I, H, rng);
    gru.bx.value.set(f32(rng, 3 * H, 0.2));
    gru.bh.value.set(f32(rng, 3 * H, 0.2));
    const cache = createGruCache(store, gru, R, T);
    const x = f32(rng, T * R * I), probe = f32(rng, T * R * H);
    const hs = Float32Array.from(gruForward(gru, x, null, cache));
    const dx = new Float32Array(T * R * I);
    gruBackward(gru, x, cache, probe, dx, null);
    // Reference: the same equations (see src/nn/gru.ts) from TensorFlow.js primitives.
    const fn = (X: tf.Tensor, Wx: tf.Tensor, Bx: tf.Tensor, Uh: tf.Tensor, Bh: tf.Tensor) => {
      let h = tf.zeros([R, H]) as tf.Tensor2D;
      const outs: tf.Tensor[] = [];
      const xs = tf.unstack(tf.reshape(X, [T, R, I]));
      for (let t = 0; t < T; t++) {
        const xp = tf.add(tf.matMul(xs[t] as tf.Tensor2D, Wx as tf.Tensor2D), Bx);
        const hu = tf.add(tf.matMul(h, Uh as tf.Tensor2D), Bh);
        const [xz, xr, xn] = tf.split(xp, 3, 1);
        const [uz, ur, un] = tf.split(hu, 3, 1);
        const z = tf.sigmoid(tf.add(xz!, uz!)), r = tf.sigmoid(tf.add(xr!, ur!));
        const n = tf.tanh(tf.add(xn!, tf.mul(r, un!)));
        h = tf.add(tf.mul(tf.sub(1, z), n), tf.mul(z, h)) as tf.Tensor2D;
        outs.push(h);
      }
      return tf.stack(outs);
    };
    const args = [tf.tensor1d(x), tf.tensor2d(gru.wx.value as Float32Array, [I, 3 * H]), tf.tensor1d(gru.bx.value as Float32Array),
      tf.tensor2d(gru.uh.value as Float32Array, [H, 3 * H]), tf.tensor1d(gru.bh.value as Float32Array)];
    const P = tf.tensor3d(probe, [T, R, H]);
    const g = tf.grads((a, b, c, d, e) => tf.sum(tf.mul(fn(a, b, c, d, e), P)))(args);
    expect(relErr(hs, values(fn(args[0]!, args[1]!, args[2]!, args[3]!, args[4]!)))).toBeLessThan(TOL);
    expect(relErr(dx, values(g[0]!))).toBeLessThan(TOL);
    expect(relErr(gru.wx.grad, values(g[1]!))).toBeLessThan(TOL);
    expect(relErr(gru.bx.grad, values(g[2]!))).toBeLessThan(TOL);
    expect(relErr(gru.uh.grad, values(g[3]!))).toBeLessThan(TOL);
    expect(relErr(gru.bh.grad, values(g[4]!))).toBeLessThan(TOL);
  });

  it('pair projection, gated message, scatter-add at receivers (tf.gather and tf.unsortedSegmentSum)', () => {
    const rng = new Pcg32(4, 100);
    const pairs = tilePairs(allOrderedPairs(6), 3);
    const N = pairs.nodes, Q = pairs.count, I = 4, D = 5;
    const h = f32(rng, N * I), wa = f32(rng, I * D), wb = f32(rng, I * D), bias = f32(rng, D), probe = f32(rng, N * D);
    const scratch = { a: new Float32Array(N * D), b: new Float32Array(N * D), da: new Float32Array(N * D), db: new Float32Array(N * D) };
    const pre = nodeProjectPairs(h, wa, wb, bias, pairs, I, D, scratch, new Float32Array(Q * D));
    const act = pre.map(Math.tanh);
    const out = scatterAddToReceivers(act, pairs, D, new Float32Array(N * D));
    const dAct = scatterAddToReceiversBackward(probe, pairs, D, new Float32Array(Q * D));
    const dPre = dAct.map((g, i) => g * (1 - act[i]! * act[i]!));
    const dh = new Float32Array(N * I), dwa = new Float32Array(I * D), dwb = new Float32Array(I * D), dbias = new Float32Array(D);
    nodeProjectPairsBackward(h, wa, wb, dPre, pairs, I, D, scratch, dh, dwa, dwb, dbias);
    const S = tf.tensor1d(pairs.senders, 'int32'), Rv = tf.tensor1d(pairs.receivers, 'int32');
    const fn = (H: tf.Tensor, Wa: tf.Tensor, Wb: tf.Tensor, B: tf.Tensor) => {
      const p = tf.add(tf.add(tf.gather(tf.matMul(H as tf.Tensor2D, Wa as tf.Tensor2D), S), tf.gather(tf.matMul(H as tf.Tensor2D, Wb as tf.Tensor2D), Rv)), B);
      return tf.unsortedSegmentSum(tf.tanh(p), Rv, N);
    };
    const args = [tf.tensor2d(h, [N, I]), tf.tensor2d(wa, [I, D]), tf.tensor2d(wb, [I, D]), tf.tensor1d(bias)];
    const P = tf.tensor2d(probe, [N, D]);
    const g = tf.grads((a, b, c, d) => tf.sum(tf.mul(fn(a, b, c, d), P)))(args);
    expect(relErr(out, values(fn(args[0]!, args[1]!, args[2]!, args[3]!)))).toBeLessThan(TOL);
    [dh, dwa, dwb, dbias].forEach((mine, i) => expect(relErr(mine, values(g[i]!))).toBeLessThan(TOL));
  });

  it('reparameterisation, both KL terms and the Gaussian NLL', () => {
    const rng = new Pcg32(5, 100);
    const R = 8, D = 3, n = R * D;
    const mu = f32(rng, n), lv = f32(rng, n, 0.5), eps = f32(rng, n), muP = f32(rng, n), lvP = f32(rng, n, 0.5), x = f32(rng, n), lvS = f32(rng, D, 0.5);
    const probe = f32(rng, n);
    // Mine: L = Σ probe·z + KL(q‖N(0,1)) + 0.5·KL(q‖p) + 0.25·NLL(x; z, shared lv).
    const z = gaussianReparam(mu, lv, eps, new Float32Array(n), n);
    const lossMine = probe.reduce((s, p, i) => s + p * z[i]!, 0) + klStdNormal(mu, lv, R, D, null) + 0.5 * klGaussians(mu, lv, muP, lvP, R, D, null)
      + 0.25 * gaussianNll(x, z, lvS, R, D, true, null);
    const dz = Float32Array.from(probe), dmu = new Float32Array(n), dlv = new Float32Array(n), dmuP = new Float32Array(n), dlvP = new Float32Array(n), dlvS = new Float32Array(D);
    gaussianNllBackward(x, z, lvS, R, D, true, 0.25, dz, dlvS, null);
    gaussianReparamBackward(lv, eps, dz, dmu, dlv, n);
    klStdNormalBackward(mu, lv, n, 1, dmu, dlv);
    klGaussiansBackward(mu, lv, muP, lvP, n, 0.5, dmu, dlv, dmuP, dlvP);
    const E = tf.tensor2d(eps, [R, D]), X = tf.tensor2d(x, [R, D]), Pr = tf.tensor2d(probe, [R, D]);
    const fn = (Mu: tf.Tensor, Lv: tf.Tensor, MuP: tf.Tensor, LvP: tf.Tensor, LvS: tf.Tensor) => {
      const Z = tf.add(Mu, tf.mul(tf.exp(tf.mul(0.5, Lv)), E));
      const kl0 = tf.mul(0.5, tf.sum(tf.sub(tf.sub(tf.add(tf.square(Mu), tf.exp(Lv)), 1), Lv)));
      const kl1 = tf.mul(0.5, tf.sum(tf.sub(tf.add(tf.sub(LvP, Lv), tf.div(tf.add(tf.exp(Lv), tf.square(tf.sub(Mu, MuP))), tf.exp(LvP))), 1)));
      const nll = tf.mul(0.5, tf.sum(tf.add(tf.add(Math.log(2 * Math.PI), LvS), tf.div(tf.square(tf.sub(X, Z)), tf.exp(LvS)))));
      return tf.addN([tf.sum(tf.mul(Pr, Z)), kl0, tf.mul(0.5, kl1), tf.mul(0.25, nll)]) as tf.Scalar;
    };
    const args = [tf.tensor2d(mu, [R, D]), tf.tensor2d(lv, [R, D]), tf.tensor2d(muP, [R, D]), tf.tensor2d(lvP, [R, D]), tf.tensor1d(lvS)];
    const g = tf.grads((a, b, c, d, e) => fn(a, b, c, d, e))(args);
    expect(relErr([lossMine], values(fn(args[0]!, args[1]!, args[2]!, args[3]!, args[4]!)))).toBeLessThan(TOL);
    [dmu, dlv, dmuP, dlvP, dlvS].forEach((mine, i) => expect(relErr(mine, values(g[i]!))).toBeLessThan(TOL));
  });

  for (const dil of [1, 2]) {
    it(`causal convolution, dilation ${dil} (${dil === 1 ? 'tf.conv1d on the left-padded sequence' : 'shifted slices times tap weights'})`, () => {
      const rng = new Pcg32(6 + dil, 100);
      const store = new ParamStore();
      const T = 9, R = 4, I = 3, O = 5, K = 3;
      const conv = createCausalConv(store, 'c', I, O, K, dil, rng);
      conv.b.value.set(f32(rng, O, 0.2));
      const x = f32(rng, T * R * I), probe = f32(rng, T * R * O);
      const y = Float32Array.from(causalConvForward(conv, x, new Float32Array(T * R * O), T, R));
      const dx = new Float32Array(T * R * I);
      causalConvBackward(conv, x, probe, dx, T, R);
      const fn = (X: tf.Tensor, W: tf.Tensor, B: tf.Tensor) => {
        const xs = tf.reshape(X, [T, R, I]);
        const padded = tf.pad(xs, [[(K - 1) * dil, 0], [0, 0], [0, 0]]);
        if (dil === 1) {
          // tf.conv1d cross-correlates, out[t] = Σ_j in[t + j]·f[j], so on the padded input f[j] = W_{K−1−j}.
          const f = tf.reverse(tf.reshape(W, [K, I, O]), 0) as tf.Tensor3D;
          const out = tf.conv1d(tf.transpose(padded, [1, 0, 2]) as tf.Tensor3D, f, 1, 'valid');
          return tf.add(tf.transpose(out, [1, 0, 2]), B);
        }
        // (TF.js has no gradient for dilated convolutions.) Tap k reads x[t − k·dil] = padded[t + (K − 1 − k)·dil].
        let out: tf.Tensor = tf.zeros([T * R, O]);
        for (let k = 0; k < K; k++) {
          const xk = tf.reshape(tf.slice(padded, [(K - 1 - k) * dil, 0, 0], [T, R, I]), [T * R, I]);
          out = tf.add(out, tf.matMul(xk, tf.slice(W, [k * I, 0], [I, O]) as tf.Tensor2D));
        }
        return tf.reshape(tf.add(out, B), [T, R, O]);
      };
      const args = [tf.tensor1d(x), tf.tensor2d(conv.w.value as Float32Array, [K * I, O]), tf.tensor1d(conv.b.value as Float32Array)];
      const P = tf.tensor3d(probe, [T, R, O]);
      const g = tf.grads((a, b, c) => tf.sum(tf.mul(fn(a, b, c), P)))(args);
      expect(relErr(y, values(fn(args[0]!, args[1]!, args[2]!)))).toBeLessThan(TOL);
      expect(relErr(dx, values(g[0]!))).toBeLessThan(TOL);
      expect(relErr(conv.w.grad, values(g[1]!))).toBeLessThan(TOL);
      expect(relErr(conv.b.grad, values(g[2]!))).toBeLessThan(TOL);
    });
  }

  it('sigmoid helper matches tf.sigmoid at extreme inputs (no overflow)', () => {
    const xs = [-100, -20, -1, 0, 1, 20, 100];
    const ref = values(tf.sigmoid(tf.tensor1d(xs)));
    expect(relErr(xs.map(sigmoid), ref)).toBeLessThan(TOL);
  });
});
