// The deviation index (Schwartz and Rozumalski 2008: GDI = 100 − 10 (ln d − mean ln d_controls) / SD(ln d_controls),
// recalled from memory) on control sets whose structure is known by construction.
import { describe, expect, it } from 'vitest';
import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { deviationIndex, fitDeviationModel, gaitVector, gdiFromDistance } from '../../src/norms/deviation.js';

/** Controls in 6 dimensions: a fixed mean plus seeded variation along 3 directions, with 3 features kept. */
function controls(rows = 120) {
  const p = 6, x = new Float64Array(rows * p);
  let s = 7;
  const rnd = () => { s = (s * 48271) % 2147483647; return s / 2147483647 - 0.5; };
  for (let r = 0; r < rows; r++) {
    const a = 3 * rnd(), b = 2 * rnd(), c = rnd();
    const v = [20 + a, 10 + b, 5 + c, -4 + 0.5 * a, 2 + 0.3 * b, 1];
    x.set(v, r * p);
  }
  return { x, rows, p, model: fitDeviationModel(x, rows, p, 3, ['a', 'b'], 3) };
}

describe('deviation index', () => {
  it('the controls themselves average 100 with an SD of 10 (the scaling; simple-statistics as the reference)', () => {
    const { x, rows, p, model } = controls();
    const g = Array.from({ length: rows }, (_, r) => deviationIndex(model, x.subarray(r * p, (r + 1) * p)).gdi);
    expect(ssMean(g)).toBeCloseTo(100, 9);
    expect(sampleStandardDeviation(g)).toBeCloseTo(10, 9);
  });

  it('falls by 10 points per SD of ln d along a feature direction: d = exp(μ + kσ) → 100 − 10k', () => {
    const { p, model } = controls();
    const { mean: mu, sd } = model.ln_distance;
    for (let q = 0; q < model.features; q++) {
      const f = model.basis.slice(q * p, (q + 1) * p);
      for (const k of [-1, 0, 1, 2, 3]) {
        const t = Math.exp(mu + k * sd);
        const x = model.vector_mean.map((m, i) => m + t * f[i]!);
        const r = deviationIndex(model, x);
        expect(r.distance).toBeCloseTo(t, 9);
        expect(r.gdi).toBeCloseTo(100 - 10 * k, 8);
        expect(r.coverage).toBeCloseTo(1, 9);
      }
    }
    expect(gdiFromDistance(model, Math.exp(mu))).toBe(100);
  });

  it('a departure half along a feature and half outside every feature has coverage 1/2', () => {
    const { p, model } = controls();
    // A unit vector orthogonal to the 3 features (Gram-Schmidt from e6).
    const g = Array.from({ length: p }, (_, i) => (i === 5 ? 1 : 0));
    for (let q = 0; q < 3; q++) {
      const f = model.basis.slice(q * p, (q + 1) * p);
      const dot = f.reduce((s, v, i) => s + v * g[i]!, 0);
      for (let i = 0; i < p; i++) g[i] -= dot * f[i]!;
    }
    const n = Math.hypot(...g);
    const f0 = model.basis.slice(0, p);
    const x = model.vector_mean.map((m, i) => m + f0[i]! + g[i]! / n);
    expect(deviationIndex(model, x).coverage).toBeCloseTo(0.5, 9);
  });

  it('a gait vector reads each 101-sample curve every 2 %: sample 2i', () => {
    const a = Float64Array.from({ length: 101 }, (_, i) => i * i), b = Float64Array.from({ length: 101 }, (_, i) => -i);
    const out = new Float64Array(102);
    expect(gaitVector([a, b], 0, 101, out)).toBe(true);
    for (let i = 0; i < 51; i++) { expect(out[i]).toBe((2 * i) ** 2); expect(out[51 + i]).toBe(-2 * i); }
    b[40] = NaN;
    expect(gaitVector([a, b], 0, 101, out)).toBe(false);
  });
});
