// The eigen-decomposition and the singular basis behind the deviation index, against hand-computed matrices.
import { describe, expect, it } from 'vitest';
import { leadingRightSingular, symmetricEigen } from '../../src/norms/eigen.js';

describe('symmetricEigen', () => {
  it('[[2,1],[1,2]] has eigenvalues 3 and 1 with vectors (1,1)/√2 and (1,−1)/√2 (hand-computed)', () => {
    const e = symmetricEigen(new Float64Array([2, 1, 1, 2]), 2);
    expect(e.values[0]).toBeCloseTo(3, 12);
    expect(e.values[1]).toBeCloseTo(1, 12);
    expect(e.vectors[0]).toBeCloseTo(Math.SQRT1_2, 12);
    expect(e.vectors[1]).toBeCloseTo(Math.SQRT1_2, 12);
    // Sign rule: the largest-magnitude component is positive; (1, −1)/√2 has a tie, so check |.| and orthogonality.
    expect(Math.abs(e.vectors[2]!)).toBeCloseTo(Math.SQRT1_2, 12);
    expect(e.vectors[2]! + e.vectors[3]!).toBeCloseTo(0, 12);
  });

  it('a diagonal matrix returns its diagonal, sorted descending, with unit axis vectors', () => {
    const e = symmetricEigen(new Float64Array([1, 0, 0, 0, 5, 0, 0, 0, 3]), 3);
    expect(Array.from(e.values)).toEqual([5, 3, 1]);
    expect(Array.from(e.vectors)).toEqual([0, 1, 0, 0, 0, 1, 1, 0, 0]);
  });

  it('a 12 × 12 symmetric matrix: A v = λ v and the vectors are orthonormal (the definition)', () => {
    const n = 12, a = new Float64Array(n * n);
    let s = 1;
    for (let i = 0; i < n; i++) for (let j = i; j < n; j++) { s = (s * 16807) % 2147483647; a[i * n + j] = a[j * n + i] = (s / 2147483647) * 2 - 1; }
    const e = symmetricEigen(a, n);
    for (let k = 0; k < n; k++) {
      for (let i = 0; i < n; i++) {
        let av = 0;
        for (let j = 0; j < n; j++) av += a[i * n + j]! * e.vectors[k * n + j]!;
        expect(av).toBeCloseTo(e.values[k]! * e.vectors[k * n + i]!, 10);
      }
      for (let q = 0; q < n; q++) {
        let dot = 0;
        for (let i = 0; i < n; i++) dot += e.vectors[k * n + i]! * e.vectors[q * n + i]!;
        expect(dot).toBeCloseTo(k === q ? 1 : 0, 10);
      }
    }
  });
});

describe('leadingRightSingular', () => {
  it('[[3,0],[0,4],[0,0]]: singular values 4 and 3, right vectors (0,1) and (1,0) (hand-computed)', () => {
    const b = leadingRightSingular(new Float64Array([3, 0, 0, 4, 0, 0]), 3, 2, 2);
    expect(Array.from(b.singular)).toEqual([4, 3]);
    expect(Array.from(b.basis)).toEqual([0, 1, 1, 0]);
    expect(b.retained).toBe(1);
  });

  it('fewer rows than columns goes through XXᵀ: [[1,1,0]] gives σ = √2 and v = (1,1,0)/√2', () => {
    const b = leadingRightSingular(new Float64Array([1, 1, 0]), 1, 3, 5);
    expect(b.k).toBe(1);
    expect(b.singular[0]).toBeCloseTo(Math.SQRT2, 12);
    expect(b.basis[0]).toBeCloseTo(Math.SQRT1_2, 12);
    expect(b.basis[1]).toBeCloseTo(Math.SQRT1_2, 12);
    expect(b.basis[2]).toBeCloseTo(0, 12);
  });

  it('both routes agree: 2 rows × 3 columns (through XXᵀ) equals the same rows padded with zero rows (through XᵀX)', () => {
    const two = new Float64Array([2, 0.5, 0.1, 2.2, -0.5, 0.3]);
    const wide = leadingRightSingular(two, 2, 3, 2);
    const padded = leadingRightSingular(Float64Array.from([...two, 0, 0, 0, 0, 0, 0]), 4, 3, 2);
    for (let q = 0; q < 2; q++) expect(wide.singular[q]).toBeCloseTo(padded.singular[q]!, 10);
    for (let i = 0; i < 6; i++) expect(wide.basis[i]).toBeCloseTo(padded.basis[i]!, 9);
    expect(wide.retained).toBeCloseTo(1, 12); // rank 2: two vectors hold everything
  });
});
