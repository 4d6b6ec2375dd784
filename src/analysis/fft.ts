// The discrete Fourier transform of a power-of-two length, in place: iterative radix-2 decimation in time
// (Cooley and Tukey 1965), bit-reversed reordering first, then log2(n) butterfly passes. Forward is
// X[k] = Σ x[t] e^(−2πi kt/n); the inverse uses e^(+2πi kt/n) and divides by n.
import { InputError } from '../errors/index.js';

/** Returns true when n is a power of two (1, 2, 4, ...). */
export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n >= 1 && (n & (n - 1)) === 0;
}

/** Returns the smallest power of two at least n. */
export function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/** Transforms (re, im) in place; returns nothing. `inverse` gives the inverse transform (divided by n). */
export function fftInPlace(re: Float64Array, im: Float64Array, inverse = false, n = re.length): void {
  if (!isPowerOfTwo(n) || re.length < n || im.length < n) throw new InputError(`the FFT needs a power-of-two length (got ${n})`);
  // Bit-reversal permutation.
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      const tr = re[i]!; re[i] = re[j]!; re[j] = tr;
      const ti = im[i]!; im[i] = im[j]!; im[j] = ti;
    }
  }
  const sign = inverse ? 1 : -1;
  for (let len = 2; len <= n; len <<= 1) {
    const half = len >> 1;
    const ang = (sign * 2 * Math.PI) / len;
    const wr = Math.cos(ang), wi = Math.sin(ang);
    for (let start = 0; start < n; start += len) {
      let cr = 1, ci = 0;
      for (let k = 0; k < half; k++) {
        const a = start + k, b = a + half;
        const xr = re[b]! * cr - im[b]! * ci;
        const xi = re[b]! * ci + im[b]! * cr;
        re[b] = re[a]! - xr; im[b] = im[a]! - xi;
        re[a] = re[a]! + xr; im[a] = im[a]! + xi;
        // Twiddle by recurrence, re-anchored every 64 steps to keep rounding small.
        if ((k & 63) === 63) { cr = Math.cos(ang * (k + 1)); ci = Math.sin(ang * (k + 1)); }
        else { const t = cr * wr - ci * wi; ci = cr * wi + ci * wr; cr = t; }
      }
    }
  }
  if (inverse) for (let i = 0; i < n; i++) { re[i] = re[i]! / n; im[i] = im[i]! / n; }
}
