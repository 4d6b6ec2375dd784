// Symmetry measures against hand-worked examples of their published formulas.
import { sampleCorrelation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { curveSymmetry, symmetryAngle, symmetryAngleFormula, symmetryIndex, symmetryRatio, valuesSymmetry } from '../../src/gait/symmetry.js';

describe('symmetry index (Robinson, Herzog and Nigg 1987)', () => {
  it('reproduces SI = (R − L) / (0.5 (R + L)) × 100 on a worked example', () => {
    // By hand: L = 50, R = 60: (60 − 50) / (0.5 × 110) × 100 = 10 / 55 × 100 = 18.1818...%.
    expect(symmetryIndex(50, 60).value).toBeCloseTo(18.181818, 5);
    // Swapping the sides flips the sign (positive means the right is larger): −18.1818...%.
    expect(symmetryIndex(60, 50).value).toBeCloseTo(-18.181818, 5);
    // Equal sides: 0.
    expect(symmetryIndex(1.1, 1.1).value).toBe(0);
  });
  it('refuses values that are not strictly positive, with a reason', () => {
    for (const [l, r] of [[0, 5], [5, -1], [-2, -3], [NaN, 1]] as const) {
      const s = symmetryIndex(l, r);
      expect(s.value).toBeNull();
      expect(s.reason).toMatch(/strictly positive/);
    }
  });
});

describe('symmetry ratio', () => {
  it('is R / L', () => {
    // By hand: 60 / 50 = 1.2; 0.9 / 1.2 = 0.75.
    expect(symmetryRatio(50, 60).value).toBeCloseTo(1.2, 12);
    expect(symmetryRatio(1.2, 0.9).value).toBeCloseTo(0.75, 12);
    expect(symmetryRatio(1, 0).value).toBeNull();
  });
});

describe('symmetry angle (Zifchock, Davis, Higginson and Royer 2008, form recalled from memory)', () => {
  it('reproduces SA = (45° − arctan(L / R)) / 90° × 100 % on a worked example', () => {
    // By hand: arctan(50 / 60) = arctan(0.8333) = 39.80557°; 45° − 39.80557° = 5.19443°; / 90° × 100 = 5.77159 %.
    expect(symmetryAngle(50, 60).value).toBeCloseTo(5.771588, 5);
    // Mirror: arctan(60 / 50) = 50.19443°, 45° − 50.19443° = −5.19443° → −5.77159 %.
    expect(symmetryAngle(60, 50).value).toBeCloseTo(-5.771588, 5);
    // Perfect symmetry: arctan(1) = 45° → 0 %.
    expect(symmetryAngle(3, 3).value).toBeCloseTo(0, 12);
  });
  it('applies the published correction when 45° − arctan(L / R) exceeds 90°', () => {
    // By hand: L = −3, R = 1: arctan(−3) = −71.56505°, 45° + 71.56505° = 116.56505° > 90°, so
    // SA = (116.56505° − 180°) / 90° × 100 = −70.48328 %.
    expect(symmetryAngleFormula(-3, 1)).toBeCloseTo(-70.483276, 5);
    // Without the correction branch (L / R ≥ −1) the plain formula: L = −1, R = 2: arctan(−0.5) = −26.56505°,
    // 45° + 26.56505° = 71.56505° → 79.51672 %.
    expect(symmetryAngleFormula(-1, 2)).toBeCloseTo(79.516723, 5);
    // The public measure does not accept such values at all.
    expect(symmetryAngle(-3, 1).value).toBeNull();
  });
});

describe('per-cycle values', () => {
  it('uses the means of strictly positive per-cycle values', () => {
    // Means by hand: left (1.0 + 1.2) / 2 = 1.1, right (1.3 + 1.5) / 2 = 1.4; SI = 0.3 / 1.25 × 100 = 24 %.
    const s = valuesSymmetry([1.0, 1.2], [1.3, NaN, 1.5]);
    expect(s.leftMean).toBeCloseTo(1.1, 12);
    expect(s.rightMean).toBeCloseTo(1.4, 12);
    expect(s.index.value).toBeCloseTo(24, 10);
    expect(s.ratio.value).toBeCloseTo(1.4 / 1.1, 12);
  });
  it('returns null with a reason for values that cross zero', () => {
    // Peak hip extension angles, say: some cycles above zero, some below.
    const s = valuesSymmetry([2, -1, 3], [4, 5, 6]);
    for (const m of [s.index, s.ratio, s.angle]) {
      expect(m.value).toBeNull();
      expect(m.reason).toMatch(/zero/);
    }
  });
});

describe('curve symmetry (normalised cross-correlation over circular shifts)', () => {
  it('finds the shift of a shifted copy, in % of the cycle, with correlation 1', () => {
    // Left: one cycle of a two-harmonic curve over 100 samples plus the 100 % sample (= the 0 % phase).
    // Right: the same curve running 10 samples (10 % of the cycle) later: right(i) = left(i − 10).
    const n = 100;
    const f = (i: number) => Math.sin((2 * Math.PI * i) / n) + 0.4 * Math.cos((4 * Math.PI * i) / n);
    const left = Array.from({ length: n + 1 }, (_, i) => f(i));
    const right = Array.from({ length: n + 1 }, (_, i) => f(i - 10));
    const c = curveSymmetry(left, right);
    if (c.correlation === null) throw new Error('no correlation');
    expect(c.correlation).toBeCloseTo(1, 12);
    expect('lagPct' in c && c.lagPct).toBe(10);
    // Zero-lag value equals Pearson's r of the first 100 samples (simple-statistics as the reference).
    expect('zeroLagCorrelation' in c && c.zeroLagCorrelation).toBeCloseTo(sampleCorrelation(left.slice(0, n), right.slice(0, n)), 12);
    // And the other way round the lag is negative.
    const back = curveSymmetry(right, left);
    expect('lagPct' in back && back.lagPct).toBe(-10);
  });
  it('works on a four-sample open curve computed by hand', () => {
    // left = [1, 2, 3, 4], right = [4, 1, 2, 3] = left shifted one sample later (right(i + 1) = left(i)).
    // At k = 1 the pairs are (1,1), (2,2), (3,3), (4,4): r = 1; one sample of four is 25 % of the cycle.
    // At k = 0, by hand: deviations l = (−1.5, −0.5, 0.5, 1.5), r = (1.5, −1.5, −0.5, 0.5);
    // Σ l·r = −2.25 + 0.75 − 0.25 + 0.75 = −1, Σ l² = Σ r² = 5, so r = −0.2.
    const c = curveSymmetry([1, 2, 3, 4], [4, 1, 2, 3], false);
    if (c.correlation === null) throw new Error('no correlation');
    expect(c.correlation).toBeCloseTo(1, 12);
    expect('lagPct' in c && c.lagPct).toBe(25);
    expect('zeroLagCorrelation' in c && c.zeroLagCorrelation).toBeCloseTo(-0.2, 12);
  });
  it('returns null with a reason for flat, unequal or non-finite curves', () => {
    expect(curveSymmetry([1, 1, 1, 1, 1], [1, 2, 3, 4, 1]).correlation).toBeNull();
    expect(curveSymmetry([1, 2, 3], [1, 2, 3, 4]).correlation).toBeNull();
    const r = curveSymmetry([1, NaN, 3, 4, 1], [1, 2, 3, 4, 1]);
    expect(r.correlation).toBeNull();
    expect('reason' in r && r.reason).toMatch(/finite/);
  });
});
