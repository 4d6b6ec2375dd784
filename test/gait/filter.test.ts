// The zero-lag Butterworth low-pass against its published properties (Winter 2009, "Biomechanics and
// Motor Control of Human Movement", 4th ed., section 3.4.4: second-order sections run forward and
// backward, cutoff corrected by C = (2^(1/n) - 1)^(1/4) = 0.802 for n = 2 passes).
import { describe, expect, it } from 'vitest';
import { butterworth2, lowpassInterleaved, passCorrection } from '../../src/gait/filter.js';

/** Returns the amplitude of a sine of `hz` after filtering, measured over the middle half of 10 s. */
function gainAt(hz: number, fc: number, fs: number): { gain: number; lagSamples: number } {
  const n = Math.round(10 * fs);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = Math.sin((2 * Math.PI * hz * i) / fs);
  const y = lowpassInterleaved(Float64Array.from(x), n, 1, fc, fs);
  let num = 0, den = 0, best = -Infinity, lag = 0;
  for (let i = n / 4; i < (3 * n) / 4; i++) { num += y[i]! * x[i]!; den += x[i]! * x[i]!; }
  // Lag: the shift (within ±5 samples) of greatest correlation.
  for (let s = -5; s <= 5; s++) {
    let c = 0;
    for (let i = n / 4; i < (3 * n) / 4; i++) c += y[i]! * x[i + s]!;
    if (c > best) { best = c; lag = s; }
  }
  return { gain: num / den, lagSamples: lag };
}

describe('zero-lag Butterworth low-pass', () => {
  it('pass correction for two passes is 0.802 (Winter 2009)', () => {
    expect(passCorrection(2)).toBeCloseTo(0.8022, 4);
    expect(passCorrection(1)).toBe(1);
  });

  it('second-order coefficients have unit gain at DC (sum of b over 1 + sum of a)', () => {
    const c = butterworth2(6, 120);
    expect((c[0]! + c[1]! + c[2]!) / (1 + c[3]! + c[4]!)).toBeCloseTo(1, 12);
  });

  it('gain is 1/sqrt(2) at the cutoff after the double pass, about 1 well below, small well above', () => {
    // -3 dB at the cutoff is the definition the correction is built to keep (Winter 2009).
    expect(gainAt(6, 6, 120).gain).toBeCloseTo(Math.SQRT1_2, 1);
    expect(gainAt(1, 6, 120).gain).toBeGreaterThan(0.99);
    // A fourth-order response falls about 24 dB per octave: at 24 Hz (two octaves up) below 0.02.
    expect(gainAt(24, 6, 120).gain).toBeLessThan(0.02);
  });

  it('has no phase lag (forward-backward pass)', () => {
    expect(gainAt(3, 6, 120).lagSamples).toBe(0);
    expect(gainAt(5, 6, 100).lagSamples).toBe(0);
  });

  it('leaves a straight line unchanged, edges included (odd reflection padding)', () => {
    const n = 300;
    const x = Float64Array.from({ length: n }, (_, i) => 0.5 + 0.01 * i);
    const y = lowpassInterleaved(Float64Array.from(x), n, 1, 6, 120);
    for (let i = 0; i < n; i++) expect(y[i]!).toBeCloseTo(x[i]!, 9);
  });

  it('filters interleaved channels independently', () => {
    const n = 200;
    const x = new Float64Array(n * 2);
    for (let i = 0; i < n; i++) { x[i * 2] = 1; x[i * 2 + 1] = i % 2 ? 1 : -1; }
    lowpassInterleaved(x, n, 2, 6, 120);
    expect(x[100 * 2]!).toBeCloseTo(1, 9);
    expect(Math.abs(x[100 * 2 + 1]!)).toBeLessThan(1e-3);
  });

  it('refuses a cutoff at or above half the frame rate', () => {
    expect(() => butterworth2(60, 120)).toThrow(/half the frame rate/);
    expect(() => butterworth2(0, 120)).toThrow(/cutoff/);
  });
});
