// Circular statistics against hand-computed values (Batschelet 1981 definitions: mean direction of the mean
// unit vector, R its length, circular SD √(−2 ln R), angular deviation √(2 (1 − R))) and, for a small
// spread, against the linear SD of simple-statistics.
import { describe, expect, it } from 'vitest';
import { standardDeviation } from 'simple-statistics';
import { angularDeviationFromR, circularColumns, circularMean, circularSd, circularSdFromR, resultantLength, wrap180, wrap360 } from '../../src/analysis/circular.js';

const DEG = 180 / Math.PI;

describe('circular statistics', () => {
  it('averages across the 0/360 seam', () => {
    // 350° and 10° are 20° apart about 0°: mean 0 (hand-computed), R = cos 10°.
    expect(circularMean([350, 10])).toBeCloseTo(0, 10);
    expect(resultantLength([350, 10])).toBeCloseTo(Math.cos(Math.PI / 18), 12);
    expect(circularMean([170, -170])).toBeCloseTo(180, 10);
  });
  it('gives R = 1 for equal angles and R = 0 for opposite ones', () => {
    expect(resultantLength([90, 90, 90])).toBeCloseTo(1, 14);
    expect(resultantLength([0, 180])).toBeCloseTo(0, 14);
    expect(circularMean([0, 180])).toBeNaN();
  });
  it('gives the hand-computed circular SD and angular deviation of ±60°', () => {
    // R = cos 60° = 0.5: circular SD = √(−2 ln 0.5) rad = 1.17741 rad; angular deviation = √(2 · 0.5) = 1 rad.
    expect(circularSd([-60, 60])).toBeCloseTo(Math.sqrt(-2 * Math.log(0.5)) * DEG, 10);
    expect(circularSdFromR(0.5)).toBeCloseTo(67.461, 3);
    expect(angularDeviationFromR(0.5)).toBeCloseTo(DEG, 10);
  });
  it('matches the linear SD for a small spread (simple-statistics)', () => {
    const a = [-2, -1, 0, 1, 2, 0.5, -0.5];
    expect(Math.abs(circularSd(a) - standardDeviation(a))).toBeLessThan(0.005);
  });
  it('wraps angles into (−180, 180] and [0, 360)', () => {
    expect(wrap180(190)).toBe(-170);
    expect(wrap180(-180)).toBe(180);
    expect(wrap180(540)).toBe(180);
    expect(wrap360(-10)).toBe(350);
    expect(wrap360(720)).toBe(0);
  });
  it('summarises the columns of a matrix over drawn rows', () => {
    // Rows: [10, 100], [30, 120], [350, 80]; column means by hand: 10 (of 10, 30, 350) and 100.
    const m = Float64Array.from([10, 100, 30, 120, 350, 80]);
    const mean = new Float64Array(2), R = new Float64Array(2);
    circularColumns(m, 3, 2, mean, R);
    expect(mean[0]).toBeCloseTo(circularMean([10, 30, 350]), 12);
    expect(mean[1]).toBeCloseTo(100, 10);
    circularColumns(m, 3, 2, mean, R, [1, 1]);
    expect(mean[0]).toBeCloseTo(30, 10);
    expect(R[0]).toBeCloseTo(1, 12);
  });
});
