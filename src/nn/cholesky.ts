// Cholesky factorisation and solves for small dense symmetric positive-definite systems (row-major
// Float64Array), shared by the joint discriminant (src/analysis/joint-profiles.ts), the pair readout's
// ridge fit (src/model/readout.ts) and the evaluation's ridge probe (scripts/eval-stats.ts).

/** Overwrites the lower triangle of A (n × n) with its Cholesky factor L (A = L Lᵀ) and returns A; throws RangeError when A is not positive definite. */
export function choleskyFactor(A: Float64Array, n: number, what = 'the system'): Float64Array {
  for (let j = 0; j < n; j++) {
    let d = A[j * n + j]!;
    for (let k = 0; k < j; k++) d -= A[j * n + k]! ** 2;
    if (!(d > 0)) throw new RangeError(`${what} is not positive definite`);
    const l = Math.sqrt(d);
    A[j * n + j] = l;
    for (let i = j + 1; i < n; i++) {
      let s = A[i * n + j]!;
      for (let k = 0; k < j; k++) s -= A[i * n + k]! * A[j * n + k]!;
      A[i * n + j] = s / l;
    }
  }
  return A;
}

/** Returns x solving (L Lᵀ) x = b, with L the lower triangle of a factor from choleskyFactor. */
export function choleskySolveFactored(L: Float64Array, n: number, b: ArrayLike<number>): Float64Array {
  const x = Float64Array.from(b);
  for (let i = 0; i < n; i++) { let s = x[i]!; for (let k = 0; k < i; k++) s -= L[i * n + k]! * x[k]!; x[i] = s / L[i * n + i]!; }
  for (let i = n - 1; i >= 0; i--) { let s = x[i]!; for (let k = i + 1; k < n; k++) s -= L[k * n + i]! * x[k]!; x[i] = s / L[i * n + i]!; }
  return x;
}

/**
 * Returns X (n × m, row-major) solving (L Lᵀ) X = B for the m columns of B (n × m, row-major) at once:
 * each column gets the very operations of choleskySolveFactored in the same order (the same bits), but
 * each entry of L is read once for all columns instead of once per column (in the back substitution, a
 * strided read down L's column).
 */
export function choleskySolveMany(L: Float64Array, n: number, B: ArrayLike<number>, m: number): Float64Array {
  const X = Float64Array.from(B), acc = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    const xi = i * m;
    for (let c = 0; c < m; c++) acc[c] = X[xi + c]!;
    for (let k = 0; k < i; k++) {
      const l = L[i * n + k]!, xk = k * m;
      for (let c = 0; c < m; c++) acc[c] = acc[c]! - l * X[xk + c]!;
    }
    const d = L[i * n + i]!;
    for (let c = 0; c < m; c++) X[xi + c] = acc[c]! / d;
  }
  for (let i = n - 1; i >= 0; i--) {
    const xi = i * m;
    for (let c = 0; c < m; c++) acc[c] = X[xi + c]!;
    for (let k = i + 1; k < n; k++) {
      const l = L[k * n + i]!, xk = k * m;
      for (let c = 0; c < m; c++) acc[c] = acc[c]! - l * X[xk + c]!;
    }
    const d = L[i * n + i]!;
    for (let c = 0; c < m; c++) X[xi + c] = acc[c]! / d;
  }
  return X;
}
