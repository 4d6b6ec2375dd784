// Continuous relative phase (Lamb and Stöckl 2014: centre on the range midpoint, Hilbert phase, distal minus
// proximal) on sinusoids with a known phase relation, where the relative phase is the phase offset itself at
// every instant (hand-derived: the Hilbert phase of A sin(ωt + θ) + c, centred, is ωt + θ − 90°).
import { describe, expect, it } from 'vitest';
import { circularSdFromR } from '../../src/analysis/circular.js';
import { centreOnRange, continuousRelativePhase, relativePhaseCycles, summariseCrp } from '../../src/analysis/crp.js';

const fps = 100, T = 1.13, F = 1200; // a cycle of 113 frames: not a power of two, not dividing the take
const wave = (amp: number, offset: number, lagDeg: number) =>
  Float64Array.from({ length: F }, (_, f) => amp * Math.sin((2 * Math.PI * f) / (fps * T) + (lagDeg * Math.PI) / 180) + offset);
const cycles = () => {
  const out = [];
  for (let s = 0.37 * fps; s + T * fps < F - 1; s += T * fps) out.push({ start: s, end: s + T * fps });
  return out;
};

describe('relativePhaseCycles', () => {
  it('gives +90° at every point when the distal signal leads by 90°, and MARP 90', () => {
    const r = relativePhaseCycles(wave(20, 10, 0), wave(40, -5, 90), cycles());
    expect(r.cycles).toBe(10);
    for (let i = 0; i < r.curves.length; i++) expect(Math.abs(r.curves[i]! - 90)).toBeLessThan(0.5);
    expect(r.marp).toBeCloseTo(90, 1);
    expect(r.dp).toBeLessThan(0.1);
  });
  it('gives −90° when the distal signal lags by 90°', () => {
    const r = relativePhaseCycles(wave(20, 0, 0), wave(5, 30, -90), cycles());
    for (let i = 0; i < r.mean.length; i++) expect(Math.abs(r.mean[i]! + 90)).toBeLessThan(0.5);
    expect(r.marp).toBeCloseTo(90, 1);
  });
  it('gives 0 for identical signals and 180 for opposite ones', () => {
    const x = wave(20, 10, 0);
    const same = relativePhaseCycles(x, x, cycles());
    for (let i = 0; i < same.curves.length; i++) expect(same.curves[i]).toBe(0);
    expect(same.marp).toBe(0);
    const opp = relativePhaseCycles(x, wave(20, 10, 180), cycles());
    for (let i = 0; i < opp.mean.length; i++) expect(Math.abs(Math.abs(opp.mean[i]!) - 180)).toBeLessThan(0.5);
  });
  it('does not depend on amplitude or offset (the Hilbert phase of a·x is that of x)', () => {
    const a = relativePhaseCycles(wave(20, 10, 0), wave(40, -5, 37), cycles());
    const b = relativePhaseCycles(wave(1, 0, 0), wave(1, 0, 37), cycles());
    for (let i = 0; i < a.mean.length; i++) expect(a.mean[i]).toBeCloseTo(b.mean[i]!, 6);
  });
  it('leaves a cycle with missing frames out', () => {
    const x = wave(20, 0, 0), y = wave(20, 0, 45);
    const cs = cycles();
    x[Math.round(cs[4]!.start + 20)] = NaN;
    const r = relativePhaseCycles(x, y, cs);
    expect(Number.isNaN(r.curves[4 * 101])).toBe(true);
    expect(r.marp).toBeCloseTo(45, 1);
  });
});

describe('continuousRelativePhase over a whole signal', () => {
  it('gives the phase offset away from the edges', () => {
    const c = continuousRelativePhase(wave(20, 10, 0), wave(40, -5, 60));
    for (let f = 0.25 * F; f < 0.75 * F; f++) expect(Math.abs(c[f]! - 60)).toBeLessThan(3);
  });
  it('centres on the midpoint of the range (Lamb and Stöckl 2014, eq. 11 as recalled from memory)', () => {
    // Range 2..10: midpoint 6 (hand-computed).
    expect(Array.from(centreOnRange([2, 10, 4], new Float64Array(3)))).toEqual([-4, 4, -2]);
  });
});

describe('summariseCrp', () => {
  it('gives the circular mean, circular SD, MARP and DP of constructed curves', () => {
    // Two cycles of 3 points: 80° and 100° everywhere → mean 90, SD √(−2 ln cos 10°) (hand-derived).
    const curves = Float64Array.from([80, 80, 80, 100, 100, 100]);
    const s = summariseCrp(curves, 2, 3);
    for (let i = 0; i < 3; i++) expect(s.mean[i]).toBeCloseTo(90, 10);
    expect(s.marp).toBeCloseTo(90, 10);
    expect(s.dp).toBeCloseTo(circularSdFromR(Math.cos(Math.PI / 18)), 10);
    expect(s.dp).toBeCloseTo(10.04, 1);
  });
  it('averages across ±180 (170 and −170 give 180, MARP 180)', () => {
    const s = summariseCrp(Float64Array.from([170, -170]), 2, 1);
    expect(s.mean[0]).toBeCloseTo(180, 10);
    expect(s.marp).toBeCloseTo(180, 10);
  });
});
