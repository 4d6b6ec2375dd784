// Cholesky factor and solve (src/nn/cholesky.ts) against a hand-computed 2 × 2 case:
// A = [[4, 2], [2, 3]] = L Lᵀ with L = [[2, 0], [1, √2]]; A⁻¹ = [[3, −2], [−2, 4]] / 8, so b = (2, 1) gives x = (0.5, 0).
import { describe, expect, it } from 'vitest';
import { choleskyFactor, choleskySolveFactored, choleskySolveMany } from '../../src/nn/cholesky.js';
import { Pcg32 } from '../../src/nn/prng.js';

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

  it('solves many right-hand sides at once with the same bits as one at a time', () => {
    // The hand-computed system first: columns b = (2, 1) and (4, 2) give x = (0.5, 0) and (1, 0).
    const L2 = choleskyFactor(Float64Array.of(4, 2, 2, 3), 2);
    const X2 = choleskySolveMany(L2, 2, [2, 4, 1, 2], 2);
    expect([X2[0], X2[1], X2[2], X2[3]]).toEqual([expect.closeTo(0.5, 14), expect.closeTo(1, 14), expect.closeTo(0, 14), expect.closeTo(0, 14)]);
    // A random SPD system (A = G Gᵀ + n I) with 7 columns, each against choleskySolveFactored.
    const rng = new Pcg32(8, 1), n = 23, m = 7, G = Float64Array.from({ length: n * n }, () => rng.gauss());
    const A = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) { let s = i === j ? n : 0; for (let k = 0; k < n; k++) s += G[i * n + k]! * G[j * n + k]!; A[i * n + j] = s; }
    const L = choleskyFactor(A, n), B = Float64Array.from({ length: n * m }, () => rng.gauss());
    const X = choleskySolveMany(L, n, B, m);
    for (let c = 0; c < m; c++) {
      const x = choleskySolveFactored(L, n, Array.from({ length: n }, (_, i) => B[i * m + c]!));
      for (let i = 0; i < n; i++) expect(Object.is(X[i * m + c], x[i])).toBe(true);
    }
  });

  it('refuses a matrix that is not positive definite, naming it', () => {
    expect(() => choleskyFactor(Float64Array.of(1, 2, 2, 1), 2, 'the test matrix')).toThrow(/the test matrix is not positive definite/);
  });
});
