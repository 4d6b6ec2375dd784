// The bench's step model: the kernel version and its TensorFlow.js twin compute the same loss and the same
// gradients on the same weights and noise (1e-3 relative, cpu backend), so the bench times the same work;
// training from a seed is bit-reproducible, and so is a gradient reduced from two workers in fixed order.
import { beforeAll, describe, expect, it } from 'vitest';
import { reduceInOrder } from '../../src/nn/params.js';
import { StepModel, syntheticBatch, type StepConfig } from './support/step-model.js';
import { TfStepModel, toTfLayout } from './support/step-model-tf.js';
import { relErr, tf, useCpu, values } from './support/tf.js';

const SMALL: StepConfig = { windows: 3, nodes: 5, features: 6, hidden: 8, steps: 9, decoderSteps: 4, staticDims: 2, dynamicDims: 3, beta: 0.7 };

beforeAll(useCpu);

describe('step model', () => {
  it('agrees with the same model in TensorFlow.js: loss and every gradient within 1e-3', () => {
    const mine = new StepModel(SMALL, 11);
    // Non-zero biases, so that every path (including bias gradients through gathers) carries signal.
    for (const p of mine.store.params) if (p.shape.length === 1) for (let i = 0; i < p.size; i++) p.value[i] = 0.1 * mine.rng.gauss();
    const x = syntheticBatch(SMALL, 12);
    const { epsS, epsD } = mine.noise();
    mine.rng.fillGauss(epsS);
    mine.rng.fillGauss(epsD);
    const loss = mine.forward(x);
    const grads = Float32Array.from(mine.backward());
    const twin = new TfStepModel(SMALL, mine.store, mine.basePairs);
    const inp = toTfLayout(SMALL, x, epsS, epsD);
    const { value, grads: g } = tf.variableGrads(() => twin.loss(inp.x, inp.epsS, inp.epsD), twin.varList());
    expect(relErr([loss], values(value))).toBeLessThan(1e-3);
    for (const p of mine.store.params) {
      const ref = values(g[twin.vars[p.name]!.name]!);
      expect(relErr(grads.subarray(p.offset, p.offset + p.size), ref), p.name).toBeLessThan(1e-3);
    }
  });

  it('trains bit-identically from the same seed and differently from another', () => {
    const x = syntheticBatch(SMALL, 13);
    const run = (seed: number) => {
      const m = new StepModel(SMALL, seed, 1e-2);
      const losses = Array.from({ length: 4 }, () => m.trainStep(x));
      return { losses, w: Float32Array.from(m.store.valueView()) };
    };
    const a = run(5), b = run(5), c = run(6);
    expect(a.losses).toEqual(b.losses);
    expect(Buffer.from(a.w.buffer).equals(Buffer.from(b.w.buffer))).toBe(true);
    expect(Buffer.from(a.w.buffer).equals(Buffer.from(c.w.buffer))).toBe(false);
    expect(a.losses[3]!).toBeLessThan(a.losses[0]!); // Adam at 1e-2 lowers the loss on a fixed batch
  });

  it('reduces two workers\' gradients (half the windows each) in fixed order, bit-identically on every run', () => {
    const half: StepConfig = { ...SMALL, windows: 2 };
    const grad = (seed: number) => {
      const m = new StepModel(half, 21);
      m.rng.fillGauss(m.noise().epsS);
      m.rng.fillGauss(m.noise().epsD);
      m.forward(syntheticBatch(half, seed));
      return Float32Array.from(m.backward());
    };
    const g1 = grad(31), g2 = grad(32);
    const r1 = reduceInOrder([g1, g2], new Float32Array(g1.length));
    const r2 = reduceInOrder([grad(31), grad(32)], new Float32Array(g1.length));
    expect(Buffer.from(r1.buffer).equals(Buffer.from(r2.buffer))).toBe(true);
    for (let i = 0; i < g1.length; i += 97) expect(r1[i]).toBe(Math.fround(g1[i]! + g2[i]!));
  });
});
