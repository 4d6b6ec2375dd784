// Eigen-decomposition of a symmetric matrix by the cyclic Jacobi method, and the leading right singular
// vectors of a data matrix through its smaller Gram matrix. Small, self-contained, deterministic.
//
// Jacobi: each rotation zeroes one off-diagonal pair; sweeps repeat until the off-diagonal mass is negligible
// (Golub and Van Loan, Matrix Computations, the cyclic Jacobi algorithm; recalled from memory).

/** Eigenvalues (descending) and eigenvectors (rows of `vectors`, n × n, row k for value k) of a symmetric matrix. */
export interface SymmetricEigen {
  n: number;
  values: Float64Array;
  /** Row-major n × n; row k is the unit eigenvector of values[k]. */
  vectors: Float64Array;
}

/** Returns the eigenvalues (descending) and unit eigenvectors of the symmetric n × n matrix `a` (row-major; not modified). */
export function symmetricEigen(a: Float64Array, n: number, maxSweeps = 60): SymmetricEigen {
  const A = Float64Array.from(a);
  const V = new Float64Array(n * n);
  for (let i = 0; i < n; i++) V[i * n + i] = 1;
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale += A[i]! * A[i]!;
  const tol = 1e-22 * scale;
  for (let sweep = 0; sweep < maxSweeps; sweep++) {
    let off = 0;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off += A[p * n + q]! * A[p * n + q]!;
    if (off <= tol) break;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = A[p * n + q]!;
        if (apq === 0) continue;
        const app = A[p * n + p]!, aqq = A[q * n + q]!;
        // t = tan θ with cot 2θ = (aqq − app) / (2 apq), the smaller root (stable form).
        const theta = (aqq - app) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1), s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = A[k * n + p]!, akq = A[k * n + q]!;
          A[k * n + p] = c * akp - s * akq;
          A[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = A[p * n + k]!, aqk = A[q * n + k]!;
          A[p * n + k] = c * apk - s * aqk;
          A[q * n + k] = s * apk + c * aqk;
        }
        A[p * n + q] = 0;
        A[q * n + p] = 0;
        for (let k = 0; k < n; k++) {
          const vkp = V[k * n + p]!, vkq = V[k * n + q]!;
          V[k * n + p] = c * vkp - s * vkq;
          V[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => A[j * n + j]! - A[i * n + i]! || i - j);
  const values = new Float64Array(n), vectors = new Float64Array(n * n);
  order.forEach((col, k) => {
    values[k] = A[col * n + col]!;
    // Fix the sign: the largest-magnitude component is positive, so the result does not depend on rotation history.
    let big = 0;
    for (let i = 0; i < n; i++) if (Math.abs(V[i * n + col]!) > Math.abs(big)) big = V[i * n + col]!;
    const sg = big < 0 ? -1 : 1;
    for (let i = 0; i < n; i++) vectors[k * n + i] = sg * V[i * n + col]!;
  });
  return { n, values, vectors };
}

/** The leading right singular vectors of a rows × cols data matrix. */
export interface SingularBasis {
  /** How many vectors were kept. */
  k: number;
  cols: number;
  /** Singular values, descending (k of them). */
  singular: Float64Array;
  /** Row-major k × cols; each row a unit right singular vector. */
  basis: Float64Array;
  /** Share of the matrix's total sum of squares held by the kept vectors, 0..1. */
  retained: number;
}

/**
 * Returns the k leading right singular vectors of the rows × cols matrix `x` (row-major), from the eigenvectors of
 * the smaller of XᵀX (cols × cols) and XXᵀ (rows × rows; then v = Xᵀu / σ).
 */
export function leadingRightSingular(x: Float64Array, rows: number, cols: number, k: number): SingularBasis {
  const kk = Math.min(k, rows, cols);
  const basis = new Float64Array(kk * cols), singular = new Float64Array(kk);
  let total = 0;
  for (let i = 0; i < rows * cols; i++) total += x[i]! * x[i]!;
  if (cols <= rows) {
    const g = new Float64Array(cols * cols);
    for (let r = 0; r < rows; r++) {
      const o = r * cols;
      for (let i = 0; i < cols; i++) {
        const xi = x[o + i]!;
        if (xi === 0) continue;
        for (let j = i; j < cols; j++) g[i * cols + j] += xi * x[o + j]!;
      }
    }
    for (let i = 0; i < cols; i++) for (let j = 0; j < i; j++) g[i * cols + j] = g[j * cols + i]!;
    const e = symmetricEigen(g, cols);
    for (let q = 0; q < kk; q++) {
      singular[q] = Math.sqrt(Math.max(0, e.values[q]!));
      basis.set(e.vectors.subarray(q * cols, (q + 1) * cols), q * cols);
    }
  } else {
    const g = new Float64Array(rows * rows);
    for (let i = 0; i < rows; i++)
      for (let j = i; j < rows; j++) {
        let s = 0;
        for (let c = 0; c < cols; c++) s += x[i * cols + c]! * x[j * cols + c]!;
        g[i * rows + j] = s;
        g[j * rows + i] = s;
      }
    const e = symmetricEigen(g, rows);
    for (let q = 0; q < kk; q++) {
      const sv = Math.sqrt(Math.max(0, e.values[q]!));
      singular[q] = sv;
      if (sv === 0) continue;
      for (let c = 0; c < cols; c++) {
        let s = 0;
        for (let r = 0; r < rows; r++) s += e.vectors[q * rows + r]! * x[r * cols + c]!;
        basis[q * cols + c] = s / sv;
      }
      // Same sign rule as symmetricEigen.
      let big = 0;
      for (let c = 0; c < cols; c++) if (Math.abs(basis[q * cols + c]!) > Math.abs(big)) big = basis[q * cols + c]!;
      if (big < 0) for (let c = 0; c < cols; c++) basis[q * cols + c] = -basis[q * cols + c]!;
    }
  }
  let kept = 0;
  for (let q = 0; q < kk; q++) kept += singular[q]! * singular[q]!;
  return { k: kk, cols, singular, basis, retained: total > 0 ? kept / total : 0 };
}
