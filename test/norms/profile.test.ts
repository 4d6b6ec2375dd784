// Gait variable and profile scores (Baker et al. 2009: RMS difference from the reference mean over the cycle)
// against hand-computed examples, and the quantile used for the reference spread.
import { describe, expect, it } from 'vitest';
import { quantile as ssQuantile } from 'simple-statistics';
import type { CurveNorm } from '../../src/norms/format.js';
import { GPS_MCID_DEG, gaitVariableScore, profileScore, profileScores, quantile } from '../../src/norms/profile.js';

const ref = (mean: number[]): CurveNorm => ({ mean, sd: mean.map(() => 1), strides: 30 });

describe('gait variable score and gait profile score', () => {
  it('a take equal to the reference mean scores 0 on every curve and overall', () => {
    const m = [1, 5, -3, 10, 2];
    const s = profileScores({ left: { a: m, b: [0, 0, 0, 0, 0] }, right: { a: m, b: [0, 0, 0, 0, 0] } }, { a: ref(m), b: ref([0, 0, 0, 0, 0]) }, ['a', 'b']);
    expect(s.gvs.a).toEqual({ left: 0, right: 0 });
    expect(s.gps).toEqual({ left: 0, right: 0, overall: 0 });
  });

  it('GVS is the RMS of the differences: (1, −1, 3, 0, 1) → √(12/5) (hand-computed)', () => {
    expect(gaitVariableScore([11, 9, 13, 10, 11], [10, 10, 10, 10, 10])).toBeCloseTo(Math.sqrt(12 / 5), 14);
  });

  it('GPS is the RMS of the GVSs: GVSs 3 and 4 on one side → √(25/2); overall over 4 curve-sides with zeros → √(25/4) = 2.5 (hand-computed)', () => {
    const zero = [0, 0, 0];
    const s = profileScores(
      { left: { a: [3, 3, 3], b: [4, -4, 4] }, right: { a: zero, b: zero } },
      { a: ref(zero), b: ref(zero) }, ['a', 'b']);
    expect(s.gvs.a!.left).toBe(3);
    expect(s.gvs.b!.left).toBe(4);
    expect(s.gps.left).toBeCloseTo(Math.sqrt(12.5), 14);
    expect(s.gps.right).toBe(0);
    expect(s.gps.overall).toBe(2.5);
  });

  it('grows as the RMS of the differences when a take moves away from the mean: offset c on every sample gives GVS |c|', () => {
    const m = Array.from({ length: 101 }, (_, i) => 30 * Math.sin((2 * Math.PI * i) / 100));
    for (const c of [0.5, 1, 2, 5]) expect(gaitVariableScore(m.map((v) => v + c), m)).toBeCloseTo(c, 12);
    expect(profileScore([1, 1, 1, 1])).toBe(1);
  });

  it('skips samples that are not finite; the MCID is 1.6° (Baker et al. 2012, recalled from memory)', () => {
    expect(gaitVariableScore([NaN, 2, 4], [0, 0, 0])).toBeCloseTo(Math.sqrt(10), 14);
    expect(Number.isNaN(gaitVariableScore([NaN], [0]))).toBe(true);
    expect(GPS_MCID_DEG).toBe(1.6);
  });
});

describe('quantile', () => {
  it('type 7 (linear between order statistics): [1,2,3,4] at 0.95 → 3.85, median 2.5 (hand-computed)', () => {
    expect(quantile([4, 1, 3, 2], 0.95)).toBeCloseTo(3.85, 12);
    expect(quantile([4, 1, 3, 2], 0.5)).toBe(2.5);
    // simple-statistics' median agrees.
    expect(quantile([5, 1, 9, 3, 7], 0.5)).toBe(ssQuantile([5, 1, 9, 3, 7], 0.5));
  });
});
