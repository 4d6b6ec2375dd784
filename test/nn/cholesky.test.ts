// Cholesky factor and solve (src/nn/cholesky.ts) against a hand-computed 2 × 2 case:
// A = [[4, 2], [2, 3]] = L Lᵀ with L = [[2, 0], [1, √2]]; A⁻¹ = [[3, −2], [−2, 4]] / 8, so b = (2, 1) gives x = (0.5, 0).
import { describe, expect, it } from 'vitest';
import { choleskyFactor, choleskySolveFactored } from '../../src/nn/cholesky.js';

describe('cholesky', () => {
  it('factors and solves a hand-computed system', () => {
    const L = choleskyFactor(Float64Array.of(4, 2, 2, 3), 2);
    expect(L[0]).toBe(2);
    expect(L[2]).toBe(1);
    expect(L[3]).toBeCloseTo(Math.SQRT2, 14);
    const x = choleskySolveFactored(L, 2, [2, 1]);
    expect(x[0]).toBeCloseTo(0.5, 14);
    expect(x[1]).toBeCloseTo(0, 14);
  });

  it('refuses a matrix that is not positive definite, naming it', () => {
    expect(() => choleskyFactor(Float64Array.of(1, 2, 2, 1), 2, 'the test matrix')).toThrow(/the test matrix is not positive definite/);
  });
});
