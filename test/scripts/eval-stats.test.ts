// The validation statistics against references outside the project: simple-statistics (rank sum,
// rank correlation, linear regression) and hand-computed examples; the ICC against Shrout and Fleiss
// (1979), whose one-way formula is applied by hand to a small table below.
import { sampleRankCorrelation, wilcoxonRankSum, linearRegression } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { aucInterval, groupFolds, icc1, proportionInterval, quantile, ranks, ridgePredict, ridgeProbeR2, rocAuc, rSquared, spearman } from '../../scripts/eval-stats.js';
import { Pcg32 } from '../../src/nn/prng.js';

describe('validation statistics', () => {
  it('ranks ties by their mean rank (hand-computed)', () => {
    expect(ranks([10, 20, 20, 5])).toEqual([2, 3.5, 3.5, 1]);
  });

  it('ROC AUC: hand-computed cases and the Mann-Whitney identity with simple-statistics\' rank sum', () => {
    expect(rocAuc([3, 4], [1, 2])).toBe(1);
    expect(rocAuc([1, 2], [3, 4])).toBe(0);
    // Pairs (pos, neg): (2,1) win, (2,2) tie, (2,3) loss, (4,*) three wins -> (4 + 0.5) / 6.
    expect(rocAuc([2, 4], [1, 2, 3])).toBeCloseTo(4.5 / 6, 12);
    const rng = new Pcg32(5, 1);
    const pos = Array.from({ length: 30 }, () => rng.next() + 0.3), neg = Array.from({ length: 40 }, () => rng.next());
    const R = wilcoxonRankSum(pos, neg); // rank sum of the first sample (simple-statistics)
    expect(rocAuc(pos, neg)).toBeCloseTo((R - (30 * 31) / 2) / (30 * 40), 12);
  });

  it('bootstrap intervals bracket the point value and narrow with more data', () => {
    const rng = new Pcg32(9, 1);
    const mk = (n: number, shift: number) => Array.from({ length: n }, () => rng.next() + shift);
    const small = aucInterval(mk(20, 0.3), mk(20, 0), 500, 3), large = aucInterval(mk(400, 0.3), mk(400, 0), 500, 3);
    expect(small[0]).toBeLessThan(small[1]);
    expect(large[1] - large[0]).toBeLessThan(small[1] - small[0]);
    const hits = Array.from({ length: 100 }, (_, i) => i < 90);
    const [lo, hi] = proportionInterval(hits, 1000, 2);
    expect(lo).toBeLessThan(0.9);
    expect(hi).toBeGreaterThan(0.9);
  });

  it('quantile interpolates between order statistics (hand-computed)', () => {
    expect(quantile([4, 1, 3, 2], 0.5)).toBe(2.5);
    expect(quantile([4, 1, 3, 2], 0.9)).toBeCloseTo(3.7, 12);
  });

  it('Spearman agrees with simple-statistics\' sampleRankCorrelation, ties included', () => {
    const x = [1, 2, 2, 3, 5, 8, 8, 9], y = [2, 1, 4, 4, 3, 9, 7, 8];
    expect(spearman(x, y)).toBeCloseTo(sampleRankCorrelation(x, y), 12);
  });

  it('ridge with a tiny penalty reproduces simple-statistics\' least-squares line', () => {
    const xs = [0, 1, 2, 3, 4, 5, 6], ys = [1.1, 2.9, 5.2, 6.8, 9.1, 11.0, 12.8];
    const { m, b } = linearRegression(xs.map((x, i) => [x, ys[i]!]));
    const X = xs.map((x) => Float64Array.of(x));
    const all = xs.map((_, i) => i);
    const pred = ridgePredict(X, ys, all, [0, 6], 1e-9);
    expect(pred[0]).toBeCloseTo(b, 6);
    expect(pred[1]).toBeCloseTo(m * 6 + b, 6);
  });

  it('the probe finds a linear signal among many features and none in noise (out of fold, grouped)', () => {
    const rng = new Pcg32(21, 1);
    const n = 120, p = 60;
    const X = Array.from({ length: n }, () => Float64Array.from({ length: p }, () => rng.next() - 0.5));
    const y = X.map((r) => 3 * r[0]! - 2 * r[5]! + 0.05 * (rng.next() - 0.5));
    const noise = X.map(() => rng.next());
    const groups = X.map((_, i) => `s${Math.floor(i / 2)}`);
    expect(ridgeProbeR2(X, y, groups).r2).toBeGreaterThan(0.5);
    expect(ridgeProbeR2(X, noise, groups).r2).toBeLessThan(0.1);
    // Grouped folds keep each subject's rows together.
    const folds = groupFolds(groups, 5);
    for (const f of folds) for (const i of f) expect(f).toContain(i % 2 === 0 ? i + 1 : i - 1);
    expect(rSquared([1, 2, 3], [1, 2, 3])).toBe(1);
  });

  it('ICC(1) by the one-way formula (Shrout and Fleiss 1979), hand-computed on a balanced table', () => {
    // Groups [1,2,3], [4,5,6], [7,8,9]: group means 2, 5, 8, grand mean 5, MSB = 3·(9+0+9)/2 = 27,
    // MSW = (2+2+2)/(9−3) = 1, k = 3: ICC(1) = (27 − 1) / (27 + 2·1) = 26/29.
    expect(icc1([[1, 2, 3], [4, 5, 6], [7, 8, 9]])).toBeCloseTo(26 / 29, 12);
    // Identical groups carry no between-group signal.
    expect(icc1([[1, 2, 3], [1, 2, 3]])).toBeLessThan(0);
  });
});
