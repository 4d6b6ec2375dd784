// Zero-lag Butterworth low-pass: a second-order section run forward and backward (fourth order in
// effect), with the cutoff corrected for the double pass as Winter describes (common practice).
import { UsageError } from '../errors/index.js';

/**
 * Returns the correction that keeps the -3 dB point at the asked cutoff when a second-order
 * Butterworth runs in `passes` passes: C = (2^(1/passes) - 1)^(1/4) (Winter 2009, "Biomechanics and
 * Motor Control of Human Movement", section 3.4.4.2; 0.802 for two passes).
 */
export function passCorrection(passes: number): number {
  return (2 ** (1 / passes) - 1) ** 0.25;
}

/** Second-order low-pass coefficients [b0, b1, b2, a1, a2] by the bilinear transform with pre-warping. */
export function butterworth2(cutoffHz: number, sampleHz: number, passes = 2): Float64Array {
  if (!(cutoffHz > 0) || !(cutoffHz < sampleHz / 2))
    throw new UsageError(`low-pass cutoff must lie between 0 and half the frame rate (${sampleHz / 2} Hz), got ${cutoffHz} Hz.`);
  const fc = cutoffHz / passCorrection(passes);
  if (fc >= sampleHz / 2) throw new UsageError(`low-pass cutoff ${cutoffHz} Hz is too close to half the frame rate (${sampleHz / 2} Hz) for a zero-lag filter.`);
  const w = Math.tan((Math.PI * fc) / sampleHz);
  const k1 = Math.SQRT2 * w;
  const k2 = w * w;
  const a0 = 1 + k1 + k2;
  return new Float64Array([k2 / a0, (2 * k2) / a0, k2 / a0, (2 * (k2 - 1)) / a0, (1 - k1 + k2) / a0]);
}

/** Runs the biquad over x[offset + i*stride] for i < n in place, forward (dir 1) or backward (dir -1). */
function biquadPass(x: Float64Array, offset: number, stride: number, n: number, c: Float64Array, dir: 1 | -1): void {
  const b0 = c[0]!, b1 = c[1]!, b2 = c[2]!, a1 = c[3]!, a2 = c[4]!;
  let i = dir > 0 ? 0 : n - 1;
  // Start in the steady state of the first sample so the edge does not ring.
  const x0 = x[offset + i * stride]!;
  let x1 = x0, x2 = x0, y1 = x0, y2 = x0;
  for (let k = 0; k < n; k++, i += dir) {
    const idx = offset + i * stride;
    const xi = x[idx]!;
    const yi = b0 * xi + b1 * x1 + b2 * x2 - a1 * y1 - a2 * y2;
    x2 = x1; x1 = xi; y2 = y1; y1 = yi;
    x[idx] = yi;
  }
}

/**
 * Low-pass filters `channels` interleaved signals of `n` samples (x[i * channels + ch]) in place,
 * zero lag. Edges are padded by odd reflection over `pad` samples (default: one second) so that the
 * filter's start-up does not bend the first and last strides.
 */
export function lowpassInterleaved(x: Float64Array, n: number, channels: number, cutoffHz: number, sampleHz: number): Float64Array {
  if (n < 3) return x;
  const c = butterworth2(cutoffHz, sampleHz);
  const pad = Math.min(n - 1, Math.max(3, Math.round(sampleHz)));
  const m = n + 2 * pad;
  const work = new Float64Array(m);
  for (let ch = 0; ch < channels; ch++) {
    const first = x[ch]!;
    const last = x[(n - 1) * channels + ch]!;
    for (let i = 0; i < pad; i++) {
      work[pad - 1 - i] = 2 * first - x[(i + 1) * channels + ch]!;
      work[pad + n + i] = 2 * last - x[(n - 2 - i) * channels + ch]!;
    }
    for (let i = 0; i < n; i++) work[pad + i] = x[i * channels + ch]!;
    biquadPass(work, 0, 1, m, c, 1);
    biquadPass(work, 0, 1, m, c, -1);
    for (let i = 0; i < n; i++) x[i * channels + ch] = work[pad + i]!;
  }
  return x;
}
