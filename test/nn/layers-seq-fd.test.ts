// Finite-difference checks of the composite layers: the MLP helper and the GRU through time, in float64
// through the same code as training (tolerance justified in support/fd.ts).
import { describe, expect, it } from 'vitest';
import { causalConvBackward, causalConvForward, createCausalConv } from '../../src/nn/causal-conv.js';
import { createGru, createGruCache, gruBackward, gruForward } from '../../src/nn/gru.js';
import { createMlp, mlpBackward, mlpForward } from '../../src/nn/mlp.js';
import { ParamStore } from '../../src/nn/params.js';
import { dot, expectGradients, randn, testRng } from './support/fd.js';

describe('finite differences, composite layers', () => {
  it('MLP of three layers (tanh, leaky, linear): every weight and the input', () => {
    const rng = testRng(20);
    const store = new ParamStore({ precision: 64 });
    const R = 4, dims = [3, 5, 4, 2];
    const mlp = createMlp(store, 'm', dims, ['tanh', 'leaky', 'linear'], R, rng);
    // Non-zero biases so that their gradients are exercised away from the initial state.
    for (const p of store.params) if (p.name.endsWith('.b')) p.value.set(randn(rng, p.size, 0.3));
    const x = randn(rng, R * 3), probe = randn(rng, R * 2);
    const loss = () => dot(probe, mlpForward(mlp, x, R), R * 2);
    loss();
    store.zeroGrads();
    const dx = new Float64Array(R * 3);
    mlpBackward(mlp, x, probe, dx, R);
    expectGradients([store.values as Float64Array, x], [store.grads as Float64Array, dx], loss);
  });

  it('GRU over five steps with an initial state: weights, inputs, h0', () => {
    const rng = testRng(21);
    const store = new ParamStore({ precision: 64 });
    const R = 3, I = 2, H = 4, T = 5;
    const gru = createGru(store, 'g', I, H, rng);
    for (const p of [gru.bx, gru.bh]) p.value.set(randn(rng, p.size, 0.3));
    const cache = createGruCache(store, gru, R, T);
    const x = randn(rng, T * R * I), h0 = randn(rng, R * H, 0.5), probe = randn(rng, T * R * H);
    const loss = () => dot(probe, gruForward(gru, x, h0, cache));
    loss();
    store.zeroGrads();
    const dx = new Float64Array(T * R * I), dh0 = new Float64Array(R * H);
    gruBackward(gru, x, cache, probe, dx, dh0);
    expectGradients([store.values as Float64Array, x, h0], [store.grads as Float64Array, dx, dh0], loss);
  });
});

describe('finite differences, causal convolution', () => {
  it('kernel 3, dilation 2, over seven steps: weights, bias, input', () => {
    const rng = testRng(22);
    const store = new ParamStore({ precision: 64 });
    const T = 7, R = 3, I = 2, O = 4;
    const conv = createCausalConv(store, 'c', I, O, 3, 2, rng);
    conv.b.value.set(randn(rng, O, 0.3));
    const x = randn(rng, T * R * I), probe = randn(rng, T * R * O), y = new Float64Array(T * R * O);
    const loss = () => dot(probe, causalConvForward(conv, x, y, T, R));
    store.zeroGrads();
    const dx = new Float64Array(T * R * I);
    causalConvBackward(conv, x, probe, dx, T, R);
    expectGradients([store.values as Float64Array, x], [store.grads as Float64Array, dx], loss);
    // Hand check of causality: step 1 sees only taps 0 (itself), since tap 1 looks 2 steps back (before 0).
    loss();
    for (let o = 0; o < O; o++) {
      let e = conv.b.value[o]!;
      for (let i = 0; i < I; i++) e += x[1 * R * I + i]! * conv.w.value[i * O + o]!;
      expect(y[1 * R * O + o]).toBeCloseTo(e, 12);
    }
  });
});
