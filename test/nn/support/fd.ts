// Central finite differences for the gradient tests, run on Float64Array buffers through the same kernels
// training uses on Float32Array. With step h = 1e-5 the truncation error is O(h²·f''') ≈ 1e-10 and the
// rounding error O(ε_64·|f|/h) ≈ 1e-10 for the O(1) losses used, so agreement to 1e-6 relative is a
// strict check of the analytic backward passes.
import { expect } from 'vitest';
import { Pcg32 } from '../../../src/nn/prng.js';

/** Returns a Float64Array of n standard normal values scaled by `scale`, from a seeded generator. */
export function randn(rng: Pcg32, n: number, scale = 1): Float64Array {
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) a[i] = scale * rng.gauss();
  return a;
}

/** Returns the largest |numeric − analytic| / (1 + |analytic|) over every entry of every input buffer. */
export function fdWorst(inputs: Float64Array[], analytic: Float64Array[], loss: () => number, h = 1e-5): number {
  let worst = 0;
  for (let b = 0; b < inputs.length; b++) {
    const x = inputs[b]!, g = analytic[b]!;
    for (let i = 0; i < x.length; i++) {
      const keep = x[i]!;
      x[i] = keep + h;
      const up = loss();
      x[i] = keep - h;
      const down = loss();
      x[i] = keep;
      const num = (up - down) / (2 * h);
      worst = Math.max(worst, Math.abs(num - g[i]!) / (1 + Math.abs(g[i]!)));
    }
  }
  return worst;
}

/** Asserts the finite-difference check within 1e-6 (see the header for why that bound). */
export function expectGradients(inputs: Float64Array[], analytic: Float64Array[], loss: () => number): void {
  expect(fdWorst(inputs, analytic, loss)).toBeLessThan(1e-6);
}

/** Returns Σ w·y, the scalar probe loss whose gradient on y is w. */
export function dot(w: ArrayLike<number>, y: ArrayLike<number>, n = w.length): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += w[i]! * y[i]!;
  return s;
}

/** Returns a fresh generator for a test (PCG32, seed and stream fixed per test). */
export function testRng(stream: number): Pcg32 {
  return new Pcg32(20240517, stream);
}
