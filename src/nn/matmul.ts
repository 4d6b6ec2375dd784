// Dense row-major matrix products, the hot spot of training. The kernels are register-blocked: each
// inner loop keeps a 2 × 4 block of outputs in local (double precision) accumulators, so an output is
// stored once per block instead of once per multiply-add, and every operand load feeds several products.
// A·Bᵀ transposes the (small, weight-sized) B into scratch and runs the A·B kernel; Aᵀ·B walks A and B in
// cache-sized chunks of rows. All loops run in a fixed order, so results are deterministic.
import type { Buf } from './types.js';

let scratch32 = new Float32Array(0);
let scratch64 = new Float64Array(0);

function scratchLike(b: Buf, n: number): Buf {
  if (b instanceof Float64Array) {
    if (scratch64.length < n) scratch64 = new Float64Array(n);
    return scratch64;
  }
  if (scratch32.length < n) scratch32 = new Float32Array(n);
  return scratch32;
}

/** Returns c after c[m×n] = a[m×k]·b[k×n] (or c += a·b when accumulate). */
export function matmul(a: Buf, b: Buf, c: Buf, m: number, k: number, n: number, accumulate = false): Buf {
  const n4 = n - (n % 4);
  let i = 0;
  for (; i + 1 < m; i += 2) {
    const a0r = i * k, a1r = a0r + k, c0 = i * n, c1 = c0 + n;
    for (let j = 0; j < n4; j += 4) {
      let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s10 = 0, s11 = 0, s12 = 0, s13 = 0;
      for (let p = 0, bp = j; p < k; p++, bp += n) {
        const x0 = a[a0r + p]!, x1 = a[a1r + p]!;
        const b0 = b[bp]!, b1 = b[bp + 1]!, b2 = b[bp + 2]!, b3 = b[bp + 3]!;
        s00 += x0 * b0; s01 += x0 * b1; s02 += x0 * b2; s03 += x0 * b3;
        s10 += x1 * b0; s11 += x1 * b1; s12 += x1 * b2; s13 += x1 * b3;
      }
      if (accumulate) {
        c[c0 + j] = c[c0 + j]! + s00; c[c0 + j + 1] = c[c0 + j + 1]! + s01; c[c0 + j + 2] = c[c0 + j + 2]! + s02; c[c0 + j + 3] = c[c0 + j + 3]! + s03;
        c[c1 + j] = c[c1 + j]! + s10; c[c1 + j + 1] = c[c1 + j + 1]! + s11; c[c1 + j + 2] = c[c1 + j + 2]! + s12; c[c1 + j + 3] = c[c1 + j + 3]! + s13;
      } else {
        c[c0 + j] = s00; c[c0 + j + 1] = s01; c[c0 + j + 2] = s02; c[c0 + j + 3] = s03;
        c[c1 + j] = s10; c[c1 + j + 1] = s11; c[c1 + j + 2] = s12; c[c1 + j + 3] = s13;
      }
    }
    for (let j = n4; j < n; j++) {
      let s0 = 0, s1 = 0;
      for (let p = 0, bp = j; p < k; p++, bp += n) {
        const bv = b[bp]!;
        s0 += a[a0r + p]! * bv;
        s1 += a[a1r + p]! * bv;
      }
      c[c0 + j] = accumulate ? c[c0 + j]! + s0 : s0;
      c[c1 + j] = accumulate ? c[c1 + j]! + s1 : s1;
    }
  }
  if (i < m) {
    const ar = i * k, cr = i * n;
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let p = 0, bp = j; p < k; p++, bp += n) s += a[ar + p]! * b[bp]!;
      c[cr + j] = accumulate ? c[cr + j]! + s : s;
    }
  }
  return c;
}

/** Rows of A and B walked per chunk in matmulAtB (a chunk of both stays in the first-level cache). */
const AT_CHUNK = 64;

/** Returns c after c[k×n] += a[m×k]ᵀ·b[m×n] (c = … when accumulate is false); the weight-gradient product. */
export function matmulAtB(a: Buf, b: Buf, c: Buf, m: number, k: number, n: number, accumulate = true): Buf {
  if (!accumulate) c.fill(0, 0, k * n);
  const n4 = n - (n % 4), k2 = k - (k % 2);
  for (let i0 = 0; i0 < m; i0 += AT_CHUNK) {
    const i1 = Math.min(m, i0 + AT_CHUNK);
    for (let p = 0; p < k2; p += 2) {
      const c0 = p * n, c1 = c0 + n;
      for (let j = 0; j < n4; j += 4) {
        let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s10 = 0, s11 = 0, s12 = 0, s13 = 0;
        for (let i = i0; i < i1; i++) {
          const ai = i * k + p, bi = i * n + j;
          const x0 = a[ai]!, x1 = a[ai + 1]!;
          const b0 = b[bi]!, b1 = b[bi + 1]!, b2 = b[bi + 2]!, b3 = b[bi + 3]!;
          s00 += x0 * b0; s01 += x0 * b1; s02 += x0 * b2; s03 += x0 * b3;
          s10 += x1 * b0; s11 += x1 * b1; s12 += x1 * b2; s13 += x1 * b3;
        }
        c[c0 + j] = c[c0 + j]! + s00; c[c0 + j + 1] = c[c0 + j + 1]! + s01; c[c0 + j + 2] = c[c0 + j + 2]! + s02; c[c0 + j + 3] = c[c0 + j + 3]! + s03;
        c[c1 + j] = c[c1 + j]! + s10; c[c1 + j + 1] = c[c1 + j + 1]! + s11; c[c1 + j + 2] = c[c1 + j + 2]! + s12; c[c1 + j + 3] = c[c1 + j + 3]! + s13;
      }
      for (let j = n4; j < n; j++) {
        let s0 = 0, s1 = 0;
        for (let i = i0; i < i1; i++) {
          const bv = b[i * n + j]!, ai = i * k + p;
          s0 += a[ai]! * bv;
          s1 += a[ai + 1]! * bv;
        }
        c[c0 + j] = c[c0 + j]! + s0;
        c[c1 + j] = c[c1 + j]! + s1;
      }
    }
    for (let p = k2; p < k; p++) {
      const cp = p * n;
      for (let j = 0; j < n; j++) {
        let s = 0;
        for (let i = i0; i < i1; i++) s += a[i * k + p]! * b[i * n + j]!;
        c[cp + j] = c[cp + j]! + s;
      }
    }
  }
  return c;
}

/** Returns c after c[m×k] = a[m×n]·b[k×n]ᵀ (or c += … when accumulate); the input-gradient product. */
export function matmulABt(a: Buf, b: Buf, c: Buf, m: number, n: number, k: number, accumulate = false): Buf {
  const bt = scratchLike(b, n * k);
  for (let p = 0; p < k; p++) for (let j = 0; j < n; j++) bt[j * k + p] = b[p * n + j]!;
  return matmul(a, bt, c, m, n, k, accumulate);
}

/** Returns out after out[n] += the column sums of a[m×n] (the bias gradient). */
export function addColumnSums(a: Buf, out: Buf, m: number, n: number): Buf {
  for (let i = 0; i < m; i++) {
    const ai = i * n;
    for (let j = 0; j < n; j++) out[j] = out[j]! + a[ai + j]!;
  }
  return out;
}
