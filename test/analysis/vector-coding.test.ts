// Vector coding (Needham et al. 2014, 2015): coupling angle atan2(Δdistal, Δproximal) in degrees on [0, 360),
// and the four 45° coordination bins as listed there (recalled from memory). Expected angles are hand-derived.
import { describe, expect, it } from 'vitest';
import { angularDeviationFromR } from '../../src/analysis/circular.js';
import { couplingAngle, couplingAngles, couplingPattern, patternShares, summariseVectorCoding, vectorCodingCycles } from '../../src/analysis/vector-coding.js';

const ramp = (n: number, f: (t: number) => number) => Float64Array.from({ length: n }, (_, t) => f(t));

describe('coupling angle', () => {
  it('is 45° for x = t, y = t (in-phase)', () => {
    for (const g of couplingAngles(ramp(10, (t) => t), ramp(10, (t) => t))) { expect(g).toBeCloseTo(45, 12); expect(couplingPattern(g)).toBe('in_phase'); }
    // both decreasing: 225°, still in-phase
    expect(couplingAngle(-1, -1)).toBeCloseTo(225, 12);
    expect(couplingPattern(225)).toBe('in_phase');
  });
  it('is 315° for x = t, y = −t and 135° for x = −t, y = t (anti-phase)', () => {
    for (const g of couplingAngles(ramp(10, (t) => t), ramp(10, (t) => -t))) { expect(g).toBeCloseTo(315, 12); expect(couplingPattern(g)).toBe('anti_phase'); }
    for (const g of couplingAngles(ramp(10, (t) => -t), ramp(10, (t) => t))) { expect(g).toBeCloseTo(135, 12); expect(couplingPattern(g)).toBe('anti_phase'); }
  });
  it('is 0° or 180° when only the proximal signal moves, 90° or 270° when only the distal does', () => {
    expect(couplingAngle(1, 0)).toBe(0);
    expect(couplingAngle(-1, 0)).toBeCloseTo(180, 12);
    expect(couplingPattern(0)).toBe('proximal');
    expect(couplingPattern(180)).toBe('proximal');
    for (const g of couplingAngles(ramp(5, () => 3), ramp(5, (t) => 2 * t))) { expect(g).toBeCloseTo(90, 12); expect(couplingPattern(g)).toBe('distal'); }
    expect(couplingAngle(0, -1)).toBeCloseTo(270, 12);
    expect(couplingPattern(270)).toBe('distal');
  });
  it('is undefined (NaN) when neither signal moves', () => {
    expect(couplingAngle(0, 0)).toBeNaN();
  });
  it('puts the bin edges where the listed bins put them (lower bound inclusive)', () => {
    const cases: [number, string][] = [
      [22.4, 'proximal'], [22.5, 'in_phase'], [67.4, 'in_phase'], [67.5, 'distal'], [112.5, 'anti_phase'], [157.4, 'anti_phase'],
      [157.5, 'proximal'], [202.4, 'proximal'], [202.5, 'in_phase'], [247.5, 'distal'], [292.5, 'anti_phase'], [337.4, 'anti_phase'],
      [337.5, 'proximal'], [359.9, 'proximal'], [-45, 'anti_phase'],
    ];
    for (const [a, p] of cases) expect(couplingPattern(a), `${a}°`).toBe(p);
  });
});

describe('pattern shares', () => {
  it('counts a constructed cycle: 40 in-phase, 30 anti-phase, 20 proximal, 10 distal points', () => {
    const a = [...Array(40).fill(45), ...Array(30).fill(135), ...Array(20).fill(0), ...Array(10).fill(270)];
    expect(patternShares(a)).toEqual({ in_phase: 40, anti_phase: 30, proximal: 20, distal: 10 });
  });
  it('gives half in-phase and half proximal over a cycle where the distal signal stops at mid-cycle', () => {
    // Cycle of exactly 100 frames: x rises all along, y rises with it for the first half then holds.
    const x = ramp(201, (f) => f % 100), y = ramp(201, (f) => Math.min(f % 100, 50));
    x[100] = 100; y[100] = 50; // the cycle's end sample continues the first cycle
    const r = vectorCodingCycles(x, y, [{ start: 0, end: 100 }]);
    for (let i = 0; i < 50; i++) expect(r.meanAngle[i]).toBeCloseTo(45, 9);
    for (let i = 50; i < 100; i++) expect(r.meanAngle[i]).toBeCloseTo(0, 9);
    expect(r.shares).toEqual({ in_phase: 50, anti_phase: 0, proximal: 50, distal: 0 });
  });
});

describe('summariseVectorCoding', () => {
  it('gives the circular mean and the angular deviation across cycles', () => {
    // Two cycles, 2 points: 30° and 60° → mean 45°, R = cos 15°, variability √(2 (1 − cos 15°)) rad (hand-derived);
    // 350° and 10° → mean 0°.
    const s = summariseVectorCoding(Float64Array.from([30, 350, 60, 10]), 2, 2);
    expect(s.meanAngle[0]).toBeCloseTo(45, 10);
    expect(s.meanAngle[1]).toBeCloseTo(0, 10);
    expect(s.variability[0]).toBeCloseTo(angularDeviationFromR(Math.cos(Math.PI / 12)), 10);
    expect(s.variability[0]).toBeCloseTo(14.96, 2);
    expect(s.shares.in_phase).toBe(100); // only the first point counts: the last point belongs to the next cycle
  });
});
