// Cholesky factorisation and solves for small dense symmetric positive-definite systems (row-major
// Float64Array), shared by the joint discriminant (src/analysis/joint-profiles.ts) and the evaluation's
// ridge probe (scripts/eval-stats.ts).

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
