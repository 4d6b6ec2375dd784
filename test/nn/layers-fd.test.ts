// Finite-difference checks of every backward pass in src/nn, in float64 through the same kernels (see
// support/fd.ts for the step and the tolerance). The probe loss is Σ w·output with fixed random w.
import { describe, expect, it } from 'vitest';
import { activate, activateBackward, tanh, type Activation } from '../../src/nn/activations.js';
import { scaleRows, scaleRowsBackward } from '../../src/nn/elementwise.js';
import {
  gaussianNll, gaussianNllBackward, gaussianReparam, gaussianReparamBackward,
  klGaussians, klGaussiansBackward, klStdNormal, klStdNormalBackward,
} from '../../src/nn/gaussian.js';
import { linearBackward, linearForward } from '../../src/nn/linear.js';
import { matmul, matmulABt, matmulAtB } from '../../src/nn/matmul.js';
import {
  allOrderedPairs, nodeProjectPairs, nodeProjectPairsBackward, scatterAddToReceivers,
  scatterAddToReceiversBackward, tilePairs,
} from '../../src/nn/pairs.js';
import { meanPoolTime, meanPoolTimeBackward } from '../../src/nn/pool.js';
import { dot, expectGradients, randn, testRng } from './support/fd.js';

describe('matrix products', () => {
  it('equal the textbook triple sum for odd and even sizes', () => {
    const rng = testRng(1);
    for (const [m, k, n] of [[3, 5, 4], [4, 4, 4], [1, 7, 3], [5, 1, 2]] as const) {
      const a = randn(rng, m * k), b = randn(rng, k * n), bt = randn(rng, n * k), am = randn(rng, m * n);
      const c = new Float64Array(m * n), ct = new Float64Array(k * n), cb = new Float64Array(m * k);
      matmul(a, b, c, m, k, n);
      matmulAtB(a, am, ct, m, k, n, false);
      matmulABt(am, bt, cb, m, n, k);
      for (let i = 0; i < m; i++)
        for (let j = 0; j < n; j++) {
          let s = 0;
          for (let p = 0; p < k; p++) s += a[i * k + p]! * b[p * n + j]!;
          expect(c[i * n + j]).toBeCloseTo(s, 12);
        }
      for (let p = 0; p < k; p++)
        for (let j = 0; j < n; j++) {
          let s = 0;
          for (let i = 0; i < m; i++) s += a[i * k + p]! * am[i * n + j]!;
          expect(ct[p * n + j]).toBeCloseTo(s, 12);
        }
      for (let i = 0; i < m; i++)
        for (let p = 0; p < k; p++) {
          let s = 0;
          for (let j = 0; j < n; j++) s += am[i * n + j]! * bt[p * n + j]!;
          expect(cb[i * k + p]).toBeCloseTo(s, 12);
        }
    }
  });
});

describe('matrix products, blocked paths', () => {
  it('accumulate and cover the 2 × 4 blocks, their remainders and the row chunks of Aᵀ·B', () => {
    const rng = testRng(12);
    // m = 150 spans three 64-row chunks of matmulAtB; n = 6 and k = 9 leave column and row remainders.
    for (const [m, k, n] of [[7, 9, 6], [150, 9, 6], [150, 4, 1], [2, 3, 8]] as const) {
      const a = randn(rng, m * k), b = randn(rng, k * n), am = randn(rng, m * n), bt = randn(rng, n * k);
      const c0 = randn(rng, m * n), ct0 = randn(rng, k * n), cb0 = randn(rng, m * k);
      const c = Float64Array.from(c0), ct = Float64Array.from(ct0), cb = Float64Array.from(cb0);
      matmul(a, b, c, m, k, n, true);
      matmulAtB(a, am, ct, m, k, n, true);
      matmulABt(am, bt, cb, m, n, k, true);
      for (let i = 0; i < m; i++)
        for (let j = 0; j < n; j++) {
          let s = c0[i * n + j]!;
          for (let p = 0; p < k; p++) s += a[i * k + p]! * b[p * n + j]!;
          expect(c[i * n + j]).toBeCloseTo(s, 11);
        }
      for (let p = 0; p < k; p++)
        for (let j = 0; j < n; j++) {
          let s = ct0[p * n + j]!;
          for (let i = 0; i < m; i++) s += a[i * k + p]! * am[i * n + j]!;
          expect(ct[p * n + j]).toBeCloseTo(s, 10);
        }
      for (let i = 0; i < m; i++)
        for (let p = 0; p < k; p++) {
          let s = cb0[i * k + p]!;
          for (let j = 0; j < n; j++) s += am[i * n + j]! * bt[p * n + j]!;
          expect(cb[i * k + p]).toBeCloseTo(s, 11);
        }
    }
  });

  it('tanh through expm1 equals Math.tanh to a few ulps, saturates and keeps NaN', () => {
    let worst = 0;
    for (let i = -4000; i <= 4000; i++) {
      const v = i === 0 ? 0 : Math.sign(i) * Math.pow(10, Math.abs(i) / 1000 - 2.5); // |v| from 3e-3 to 3e1.5
      const ref = Math.tanh(v);
      worst = Math.max(worst, ref === 0 ? Math.abs(tanh(v)) : Math.abs(tanh(v) - ref) / Math.abs(ref));
    }
    expect(worst).toBeLessThan(1e-15);
    expect(tanh(1e-12)).toBeCloseTo(1e-12, 25);
    expect(tanh(Infinity)).toBe(1);
    expect(tanh(-Infinity)).toBe(-1);
    expect(tanh(NaN)).toBeNaN();
  });
});

describe('finite differences', () => {
  it('linear: dX, dW, db', () => {
    const rng = testRng(2);
    const R = 5, I = 4, O = 3;
    const x = randn(rng, R * I), w = randn(rng, I * O), b = randn(rng, O), probe = randn(rng, R * O);
    const y = new Float64Array(R * O);
    const loss = () => dot(probe, linearForward(x, w, b, y, R, I, O));
    const dx = new Float64Array(R * I), dw = new Float64Array(I * O), db = new Float64Array(O);
    linearBackward(x, w, probe, dx, dw, db, R, I, O);
    expectGradients([x, w, b], [dx, dw, db], loss);
  });

  for (const kind of ['tanh', 'relu', 'leaky', 'sigmoid', 'softplus', 'linear'] as Activation[]) {
    it(`activation ${kind}`, () => {
      const rng = testRng(3);
      const n = 40;
      const x = randn(rng, n, 2);
      // Keep the rectifiers' inputs away from the kink at 0, where the derivative does not exist.
      for (let i = 0; i < n; i++) if (Math.abs(x[i]!) < 1e-2) x[i] = 0.5;
      const probe = randn(rng, n), y = new Float64Array(n);
      const loss = () => dot(probe, activate(kind, x, y, n));
      loss();
      const dx = activateBackward(kind, x, y, probe, new Float64Array(n), n) as Float64Array;
      expectGradients([x], [dx], loss);
    });
  }

  it('row gate: scaleRows', () => {
    const rng = testRng(4);
    const R = 6, D = 5;
    const m = randn(rng, R * D), g = randn(rng, R), probe = randn(rng, R * D), out = new Float64Array(R * D);
    const loss = () => dot(probe, scaleRows(m, g, out, R, D));
    const dm = new Float64Array(R * D), dg = new Float64Array(R);
    scaleRowsBackward(m, g, probe, dm, dg, R, D);
    expectGradients([m, g], [dm, dg], loss);
  });

  it('per-node projections with gather-add over pairs, batched over two graphs', () => {
    const rng = testRng(5);
    const pairs = tilePairs(allOrderedPairs(4), 2);
    const N = pairs.nodes, I = 3, D = 5;
    const h = randn(rng, N * I), wa = randn(rng, I * D), wb = randn(rng, I * D), bias = randn(rng, D);
    const probe = randn(rng, pairs.count * D), out = new Float64Array(pairs.count * D);
    const scratch = { a: new Float64Array(N * D), b: new Float64Array(N * D), da: new Float64Array(N * D), db: new Float64Array(N * D) };
    const loss = () => dot(probe, nodeProjectPairs(h, wa, wb, bias, pairs, I, D, scratch, out));
    const dh = new Float64Array(N * I), dwa = new Float64Array(I * D), dwb = new Float64Array(I * D), dbias = new Float64Array(D);
    nodeProjectPairsBackward(h, wa, wb, probe, pairs, I, D, scratch, dh, dwa, dwb, dbias);
    expectGradients([h, wa, wb, bias], [dh, dwa, dwb, dbias], loss);
    // Hand check of one entry: pair 0 of graph 0 is 0 → 1, so out[0] = h0·Wa[:,0] + h1·Wb[:,0] + bias0.
    loss();
    let e = bias[0]!;
    for (let i = 0; i < I; i++) e += h[i]! * wa[i * D]! + h[I + i]! * wb[i * D]!;
    expect(out[0]).toBeCloseTo(e, 12);
  });

  it('scatter-add at receivers', () => {
    const rng = testRng(6);
    const pairs = allOrderedPairs(5), D = 3;
    const m = randn(rng, pairs.count * D), probe = randn(rng, pairs.nodes * D), out = new Float64Array(pairs.nodes * D);
    const loss = () => dot(probe, scatterAddToReceivers(m, pairs, D, out));
    const dm = new Float64Array(pairs.count * D);
    scatterAddToReceiversBackward(probe, pairs, D, dm);
    expectGradients([m], [dm], loss);
    // Hand check: node 0 receives from senders 1..4, which are pairs 4, 8, 12, 16 in sender-major order.
    loss();
    expect(out[0]).toBeCloseTo(m[4 * D]! + m[8 * D]! + m[12 * D]! + m[16 * D]!, 12);
  });

  it('Gaussian reparameterisation', () => {
    const rng = testRng(7);
    const n = 12;
    const mu = randn(rng, n), lv = randn(rng, n, 0.5), eps = randn(rng, n), probe = randn(rng, n), z = new Float64Array(n);
    const loss = () => dot(probe, gaussianReparam(mu, lv, eps, z, n));
    const dmu = new Float64Array(n), dlv = new Float64Array(n);
    gaussianReparamBackward(lv, eps, probe, dmu, dlv, n);
    expectGradients([mu, lv], [dmu, dlv], loss);
  });

  it('KL against the standard normal, with per-dimension sums', () => {
    const rng = testRng(8);
    const R = 4, D = 3, n = R * D;
    const mu = randn(rng, n), lv = randn(rng, n, 0.5);
    const loss = () => 1.7 * klStdNormal(mu, lv, R, D, null);
    const dmu = new Float64Array(n), dlv = new Float64Array(n);
    klStdNormalBackward(mu, lv, n, 1.7, dmu, dlv);
    expectGradients([mu, lv], [dmu, dlv], loss);
    const per = new Float64Array(D);
    const total = klStdNormal(mu, lv, R, D, per);
    expect(per[0]! + per[1]! + per[2]!).toBeCloseTo(total, 12);
    // Closed form at one point: KL(N(1, e^0) ‖ N(0, 1)) = ½·(1 + 1 − 1 − 0) = ½.
    expect(klStdNormal(new Float64Array([1]), new Float64Array([0]), 1, 1, null)).toBeCloseTo(0.5, 15);
  });

  it('KL between two diagonal Gaussians', () => {
    const rng = testRng(9);
    const R = 3, D = 4, n = R * D;
    const mq = randn(rng, n), lq = randn(rng, n, 0.5), mp = randn(rng, n), lp = randn(rng, n, 0.5);
    const loss = () => 0.3 * klGaussians(mq, lq, mp, lp, R, D, null);
    const g = [new Float64Array(n), new Float64Array(n), new Float64Array(n), new Float64Array(n)];
    klGaussiansBackward(mq, lq, mp, lp, n, 0.3, g[0]!, g[1]!, g[2]!, g[3]!);
    expectGradients([mq, lq, mp, lp], g, loss);
    // Against the standard normal it reduces to klStdNormal; for 1-D N(0, 1) ‖ N(0, 4):
    // ½·(ln 4 + 1/4 − 1) (the textbook univariate formula ln(σp/σq) + (σq² + Δμ²)/(2σp²) − ½).
    expect(klGaussians(mq, lq, new Float64Array(n), new Float64Array(n), R, D, null)).toBeCloseTo(klStdNormal(mq, lq, R, D, null), 12);
    expect(klGaussians(new Float64Array([0]), new Float64Array([0]), new Float64Array([0]), new Float64Array([Math.log(4)]), 1, 1, null))
      .toBeCloseTo(Math.log(2) + 1 / 8 - 0.5, 14);
  });

  it('Gaussian negative log-likelihood, per entry and with a shared per-dimension log-variance', () => {
    const rng = testRng(10);
    const R = 5, D = 3, n = R * D;
    const x = randn(rng, n), mu = randn(rng, n), lv = randn(rng, n, 0.5), lvShared = randn(rng, D, 0.5);
    for (const shared of [false, true]) {
      const l = shared ? lvShared : lv;
      const loss = () => 0.7 * gaussianNll(x, mu, l, R, D, shared, null);
      const dmu = new Float64Array(n), dl = new Float64Array(l.length), dx = new Float64Array(n);
      gaussianNllBackward(x, mu, l, R, D, shared, 0.7, dmu, dl, dx);
      expectGradients([mu, l, x], [dmu, dl, dx], loss);
    }
    // −log N(0; 0, 1) = ½ ln 2π (the standard normal density at its mean is 1/√(2π)).
    expect(gaussianNll(new Float64Array([0]), new Float64Array([0]), new Float64Array([0]), 1, 1, false, null)).toBeCloseTo(0.5 * Math.log(2 * Math.PI), 15);
  });

  it('mean over time', () => {
    const rng = testRng(11);
    const T = 4, W = 6;
    const x = randn(rng, T * W), probe = randn(rng, W), out = new Float64Array(W);
    const loss = () => dot(probe, meanPoolTime(x, T, W, out));
    const dx = new Float64Array(T * W);
    meanPoolTimeBackward(probe, T, W, dx);
    expectGradients([x], [dx], loss);
  });
});
