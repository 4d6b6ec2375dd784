// The Hilbert transform of a finite real signal by the FFT: the analytic signal x + i·H(x) keeps the
// positive frequencies doubled, the DC and Nyquist terms once, and drops the negative ones (Marple 1999,
// "Computing the discrete-time analytic signal via FFT", recalled from memory; the same construction as
// scipy.signal.hilbert). To tame the end effects the signal is extended at both ends by even reflection
// about each end sample (x[−k] = x[k], x[n−1+k] = x[n−1−k]; the reflection padding studied by Ippersiel et al.
// 2019) and the rest of the power-of-two buffer is zero. Even reflection keeps the padded signal centred (an odd
// reflection about a non-zero end value adds a large slow bump whose Hilbert tail reaches the middle: measured
// 10× worse); it is exact where the signal ends at an extremum and leaves a slope kink elsewhere, whose error
// decays into the signal. For a quasi-periodic signal, give its period: the pads then continue the signal
// periodically (their outer halves tapered to zero), with no kink at the joins. Callers that have real data
// around the stretch of interest (crp.ts takes one whole cycle either side) should pass it too. The phase angle is atan2(H(x), x)
// (Lamb and Stöckl 2014).
import { InputError } from '../errors/index.js';
import { fftInPlace, nextPowerOfTwo } from './fft.js';

/** Scratch buffers of the transform; reuse one across calls to avoid allocating. */
export class HilbertWorkspace {
  re = new Float64Array(0);
  im = new Float64Array(0);
  /** Returns buffers of at least n entries (grown when needed). */
  ensure(n: number): void {
    if (this.re.length < n) { this.re = new Float64Array(n); this.im = new Float64Array(n); }
  }
}

/** Writes H(x) of x[start .. start + n) into `out` and returns it; pads n − 1 samples each side (periodically when `period` > 1). */
export function hilbertTransform(x: ArrayLike<number>, out: Float64Array = new Float64Array(x.length), ws = new HilbertWorkspace(), start = 0, n = x.length - start, period = 0): Float64Array {
  if (n < 2) throw new InputError(`the Hilbert transform needs at least 2 samples (got ${n})`);
  const pad = n - 1;
  const N = nextPowerOfTwo(n + 2 * pad);
  ws.ensure(N);
  const re = ws.re, im = ws.im;
  re.fill(0, 0, N); im.fill(0, 0, N);
  for (let i = 0; i < n; i++) {
    const v = x[start + i]!;
    if (!Number.isFinite(v)) throw new InputError('the Hilbert transform needs finite samples');
    re[pad + i] = v;
  }
  if (period > 1 && period <= n - 1) {
    // Periodic continuation: x[−k] = x[P − k], x[n − 1 + k] = x[n − 1 + k − P] (P fractional: interpolated),
    // repeated as far as the pad reaches; the outer half of each pad is tapered to zero by a half cosine.
    const P = period;
    for (let k = 1; k <= pad; k++) {
      const w = k <= pad / 2 ? 1 : 0.5 * (1 + Math.cos((Math.PI * (k - pad / 2)) / (pad / 2 + 1)));
      let u = -k; while (u < 0) u += P;
      let v = n - 1 + k; while (v > n - 1) v -= P;
      re[pad - k] = w * at(re, pad, n, u);
      re[pad + n - 1 + k] = w * at(re, pad, n, v);
    }
  } else for (let k = 1; k <= pad; k++) { re[pad - k] = re[pad + k]!; re[pad + n - 1 + k] = re[pad + n - 1 - k]!; }
  fftInPlace(re, im, false, N);
  // Analytic-signal weights: 1 at DC and Nyquist, 2 on positive frequencies, 0 on negative ones.
  for (let k = 1; k < N / 2; k++) { re[k] = 2 * re[k]!; im[k] = 2 * im[k]!; }
  for (let k = N / 2 + 1; k < N; k++) { re[k] = 0; im[k] = 0; }
  fftInPlace(re, im, true, N);
  for (let i = 0; i < n; i++) out[i] = im[pad + i]!;
  return out;
}

/** Writes the Hilbert phase angle atan2(H(x), x) in radians, (−π, π], into `out` and returns it. */
export function hilbertPhase(x: ArrayLike<number>, out: Float64Array = new Float64Array(x.length), ws = new HilbertWorkspace(), start = 0, n = x.length - start, period = 0): Float64Array {
  hilbertTransform(x, out, ws, start, n, period);
  for (let i = 0; i < n; i++) out[i] = Math.atan2(out[i]!, x[start + i]!);
  return out;
}

/** Returns the data sample at fractional position u (0 ≤ u ≤ n − 1) of the block stored from `o` in `re`. */
function at(re: Float64Array, o: number, n: number, u: number): number {
  const i = Math.min(n - 1, Math.max(0, Math.floor(u))), t = u - i, j = Math.min(n - 1, i + 1);
  return re[o + i]! + t * (re[o + j]! - re[o + i]!);
}
