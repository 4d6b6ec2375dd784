// Resampling to the model rate against hand-computed values: a linear signal (reproduced exactly by
// linear interpolation), a sinusoid (exact on whole-frame steps, within the interpolation error bound
// otherwise), the step count and the last source frame a step reads.
import { describe, expect, it } from 'vitest';
import { lastSourceFrame, resampleLinear, resampledLength, resamplePlan } from '../../src/motion/resample.js';

/** Samples g(t) at `fps` for `frames` frames into a width-1 signal. */
function sampled(frames: number, fps: number, g: (t: number) => number): Float64Array {
  return Float64Array.from({ length: frames }, (_, f) => g(f / fps));
}

describe('resampling', () => {
  it('counts the steps a take spans (hand-computed)', () => {
    // 121 frames at 120 Hz span 0..1 s: steps at 0, 1/30, ..., 30/30 → 31.
    expect(resampledLength(121, 1 / 120, 30)).toBe(31);
    // 100 frames at 100 Hz span 0..0.99 s: steps k/30 ≤ 0.99 → k ≤ 29.7 → 30 steps.
    expect(resampledLength(100, 1 / 100, 30)).toBe(30);
    // 25 frames at 24 Hz span 0..1 s: 31 steps when upsampling to 30 Hz.
    expect(resampledLength(25, 1 / 24, 30)).toBe(31);
  });

  it('picks every fourth frame exactly from 120 Hz to 30 Hz', () => {
    const plan = resamplePlan(121, 1 / 120, 30);
    // Step k at k/30 s is frame 4k with weight 0 (hand-computed: 120 / 30 = 4).
    for (let k = 0; k < plan.steps; k++) {
      expect(plan.index[k]).toBe(4 * k);
      expect(plan.weight[k]).toBe(0);
      expect(lastSourceFrame(k, 1 / 120, 30)).toBe(4 * k);
    }
  });

  it('blends the two neighbouring frames from 100 Hz to 30 Hz', () => {
    const plan = resamplePlan(100, 1 / 100, 30);
    // Hand-computed: step 1 at 1/30 s is frame 10/3 = 3 + 1/3; step 3 at 0.1 s is frame 10 exactly.
    expect(plan.index[1]).toBe(3);
    expect(plan.weight[1]).toBeCloseTo(1 / 3, 12);
    expect(lastSourceFrame(1, 1 / 100, 30)).toBe(4);
    expect(plan.index[3]).toBe(10);
    expect(plan.weight[3]).toBe(0);
    expect(lastSourceFrame(3, 1 / 100, 30)).toBe(10);
  });

  it('reproduces a linear signal (linear interpolation is exact on straight lines)', () => {
    const g = (t: number) => 2 + 0.5 * t;
    for (const fps of [120, 100, 24]) {
      const frames = fps * 2 + 1;
      const out = resampleLinear(sampled(frames, fps, g), frames, 1, 1 / fps, 30);
      expect(out.length).toBe(61);
      // Hand-computed: step k is at k/30 s, so its value is 2 + 0.5 k / 30.
      for (let k = 0; k < out.length; k++) expect(out[k]).toBeCloseTo(2 + (0.5 * k) / 30, 12);
    }
  });

  it('reproduces a 1 Hz sinusoid: exactly on whole frames, within h²/8·max|g″| between them', () => {
    const w = 2 * Math.PI;
    const g = (t: number) => Math.sin(w * t);
    // 120 → 30 Hz: every step falls on a frame, so the value is sin(2π k / 30) exactly.
    const a = resampleLinear(sampled(241, 120, g), 241, 1, 1 / 120, 30);
    for (let k = 0; k < a.length; k++) expect(a[k]).toBe(Math.sin(w * ((4 * k) / 120)));
    // 100 → 30 Hz, step 1: (2/3)·sin(2π·0.03) + (1/3)·sin(2π·0.04), by hand from i = 3, w = 1/3.
    const b = resampleLinear(sampled(201, 100, g), 201, 1, 1 / 100, 30);
    expect(b[1]).toBeCloseTo((2 / 3) * Math.sin(w * 0.03) + (1 / 3) * Math.sin(w * 0.04), 14);
    // Linear interpolation error bound |g − p₁| ≤ h²/8 · max|g″|: the Lagrange remainder
    // g″(ξ)/2 · (t − t₀)(t − t₁) with |(t − t₀)(t − t₁)| ≤ h²/4 (Burden & Faires, Numerical Analysis,
    // chapter 3; theorem number recalled from memory as 3.3): h = 0.01 s, max|g″| = (2π)² → 4.93e-4.
    const bound = (0.01 ** 2 / 8) * w * w;
    let worst = 0;
    for (let k = 0; k < b.length; k++) worst = Math.max(worst, Math.abs(b[k]! - g(k / 30)));
    expect(worst).toBeLessThanOrEqual(bound);
    expect(worst).toBeGreaterThan(0); // it interpolates; it does not just copy frames
  });

  it('resamples every column of an interleaved signal alike', () => {
    // Three columns: t, 2t, −t at 100 Hz; step 7 at 7/30 s (hand-computed).
    const frames = 101;
    const src = new Float64Array(frames * 3);
    for (let f = 0; f < frames; f++) { src[f * 3] = f / 100; src[f * 3 + 1] = (2 * f) / 100; src[f * 3 + 2] = -f / 100; }
    const out = resampleLinear(src, frames, 3, 1 / 100, 30);
    expect(out[21]).toBeCloseTo(7 / 30, 12);
    expect(out[22]).toBeCloseTo(14 / 30, 12);
    expect(out[23]).toBeCloseTo(-7 / 30, 12);
  });

  it('refuses a rate or frame time that is not positive', () => {
    expect(() => resamplePlan(10, 0, 30)).toThrow(RangeError);
    expect(() => resamplePlan(10, 0.01, -1)).toThrow(RangeError);
  });
});
