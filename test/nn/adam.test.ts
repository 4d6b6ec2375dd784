// Adam against a hand computation of Kingma and Ba 2015 (Algorithm 1) and against tf.train.adam on the same
// gradients; clipping by global norm against a hand computation; the parameter store and ordered reduction.
import { beforeAll, describe, expect, it } from 'vitest';
import { Adam, clipGlobalNorm, globalNorm } from '../../src/nn/adam.js';
import { ParamStore, reduceInOrder } from '../../src/nn/params.js';
import { Pcg32 } from '../../src/nn/prng.js';
import { fdWorst } from './support/fd.js';
import { relErr, tf, useCpu } from './support/tf.js';

beforeAll(useCpu);

describe('Adam', () => {
  it('matches two steps computed by hand from Algorithm 1 of Kingma and Ba 2015', () => {
    // θ0 = 1, lr 0.1, β1 0.9, β2 0.999, ε 1e-8, gradients 0.5 then −0.25. By hand:
    // step 1: m = 0.05, v = 0.00025, m̂ = 0.5, v̂ = 0.25, θ = 1 − 0.1·0.5/(0.5 + 1e-8) = 0.900000002
    // step 2: m = 0.045 − 0.025 = 0.02, v = 0.00024975 + 0.0000625 = 0.00031225,
    //         m̂ = 0.02/0.19 = 0.1052631579, v̂ = 0.00031225/0.001999 = 0.1562031016,
    //         θ = 0.900000002 − 0.1·0.1052631579/0.3952253810 = 0.8733662987
    const theta = new Float64Array([1]);
    const opt = new Adam(1, { lr: 0.1, beta1: 0.9, beta2: 0.999, eps: 1e-8 }, theta);
    opt.step(theta, new Float64Array([0.5]));
    expect(theta[0]).toBeCloseTo(0.900000002, 12);
    expect(opt.m[0]).toBeCloseTo(0.05, 15);
    expect(opt.v[0]).toBeCloseTo(0.00025, 15);
    opt.step(theta, new Float64Array([-0.25]));
    expect(opt.m[0]).toBeCloseTo(0.02, 15);
    expect(opt.v[0]).toBeCloseTo(0.00031225, 15);
    expect(theta[0]).toBeCloseTo(0.8733662987, 9);
  });

  it('applies decoupled weight decay as θ −= lr·λ·θ before the Adam update (Loshchilov and Hutter 2019)', () => {
    // With a zero gradient the moments stay 0, so only the decay acts: θ = 2·(1 − 0.1·0.5) = 1.9.
    const theta = new Float64Array([2]);
    new Adam(1, { lr: 0.1, weightDecay: 0.5 }, theta).step(theta, new Float64Array([0]));
    expect(theta[0]).toBeCloseTo(1.9, 12);
  });

  it('agrees with tf.train.adam over five steps on the same gradients', () => {
    const rng = new Pcg32(7, 200);
    const n = 50;
    const theta = new Float32Array(n).map(() => rng.gauss());
    const grads = Array.from({ length: 5 }, () => new Float32Array(n).map(() => rng.gauss()));
    const theta0 = Float32Array.from(theta);
    const v = tf.variable(tf.tensor1d(theta));
    // tf.train.adam(learningRate, beta1, beta2, epsilon)
    const ref = tf.train.adam(0.01, 0.9, 0.999, 1e-7);
    const mine = new Adam(n, { lr: 0.01, beta1: 0.9, beta2: 0.999, eps: 1e-7 });
    for (const g of grads) {
      ref.applyGradients([{ name: v.name, tensor: tf.tensor1d(g) }]);
      mine.step(theta, g);
    }
    const refValues = v.dataSync();
    // Compare the change from the start, which is what Adam computes (stricter than comparing θ itself).
    const mineDelta = theta.map((x, i) => x - theta0[i]!), refDelta = refValues.map((x, i) => x - theta0[i]!);
    expect(relErr(mineDelta, refDelta)).toBeLessThan(1e-3);
    expect(relErr(theta, refValues)).toBeLessThan(1e-5);
  });
});

describe('gradient clipping by global norm', () => {
  it('scales (3, 4, 12), norm 13, to norm 6.5 and leaves small gradients alone', () => {
    // Hand computation: √(9 + 16 + 144) = 13; scale 6.5/13 = 0.5 gives (1.5, 2, 6).
    const g = new Float32Array([3, 4, 12]);
    expect(clipGlobalNorm(g, 6.5)).toBeCloseTo(13, 6);
    expect(Array.from(g)).toEqual([1.5, 2, 6]);
    expect(globalNorm(g)).toBeCloseTo(6.5, 6);
    const small = new Float32Array([0.3, 0.4]);
    expect(clipGlobalNorm(small, 1)).toBeCloseTo(0.5, 6);
    expect(Array.from(small)).toEqual([Math.fround(0.3), Math.fround(0.4)]);
  });

  it('agrees with g · max / max(‖g‖, max) built on the norm TensorFlow.js computes', () => {
    const rng = new Pcg32(8, 200);
    const g = new Float32Array(100).map(() => rng.gauss());
    const refNorm = tf.norm(tf.tensor1d(g)).dataSync()[0]!;
    const expected = g.map((x) => (x * 2) / Math.max(refNorm, 2));
    expect(clipGlobalNorm(g, 2)).toBeCloseTo(refNorm, 3);
    expect(relErr(g, expected)).toBeLessThan(1e-6);
  });
});

describe('parameter store and reduction', () => {
  it('keeps views valid as it grows and initialises Xavier-uniform within ±√(6/(fanIn+fanOut))', () => {
    const rng = new Pcg32(9, 200);
    const s = new ParamStore();
    const a = s.add('a', [40, 60], 'xavier', rng);
    const b = s.add('b', [60], 'ones');
    const c = s.add('c', [200, 10], 'xavier', rng);
    expect(s.size).toBe(2400 + 60 + 2000);
    expect(a.value.buffer).toBe(s.values.buffer);
    expect(c.grad.buffer).toBe(s.grads.buffer);
    expect(s.values[a.offset]).toBe(a.value[0]);
    expect(Array.from(b.value).every((v) => v === 1)).toBe(true);
    // Glorot and Bengio 2010: U(−a, a) with a = √(6/(40 + 60)) ≈ 0.2449; the variance of U(−a, a) is a²/3 = 0.02.
    const lim = Math.sqrt(6 / 100);
    let sq = 0;
    for (const v of a.value) {
      expect(Math.abs(v)).toBeLessThanOrEqual(lim);
      sq += v * v;
    }
    expect(sq / a.size).toBeGreaterThan(0.018);
    expect(sq / a.size).toBeLessThan(0.022);
    expect(() => s.add('a', [1], 'zeros')).toThrow();
  });

  it('reduces worker gradients in index order, reproducibly, equal to the float64 sum within float32 rounding', () => {
    const rng = new Pcg32(10, 200);
    const parts = Array.from({ length: 3 }, () => new Float32Array(1000).map(() => rng.gauss()));
    const a = reduceInOrder(parts, new Float32Array(1000));
    const b = reduceInOrder(parts, new Float32Array(1000));
    expect(Array.from(a)).toEqual(Array.from(b));
    for (let i = 0; i < 1000; i++) expect(a[i]).toBeCloseTo(parts[0]![i]! + parts[1]![i]! + parts[2]![i]!, 5);
  });
});

describe('the finite-difference check itself', () => {
  it('flags a gradient that is off by one percent', () => {
    // Loss x², gradient 2x; a 1 % error at x = 3 gives |6.06 − 6|/7 ≈ 0.0086, far above the 1e-6 bound.
    const x = new Float64Array([3]);
    expect(fdWorst([x], [new Float64Array([6 * 1.01])], () => x[0]! * x[0]!)).toBeGreaterThan(1e-3);
    expect(fdWorst([x], [new Float64Array([6])], () => x[0]! * x[0]!)).toBeLessThan(1e-8);
  });
});
