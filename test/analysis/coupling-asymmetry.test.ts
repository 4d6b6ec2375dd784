// Coupling asymmetry on hand-built factor summaries: controls whose pair factors equal their mirror's up
// to seeded noise, and takes with one couple shifted by a known amount on a known side. Expected values
// are worked out by hand from the definitions in src/analysis/coupling-asymmetry.ts (pair score = RMS over
// dimensions of the z-scored pair-minus-mirror difference).
import { describe, expect, it } from 'vitest';
import { couplingAsymmetry, couplingNorms, mirrorCouples, pairName, storedCouplingNorms, COUPLING_NORMS_KEY } from '../../src/analysis/coupling-asymmetry.js';
import type { TakeFactors } from '../../src/analysis/factors.js';
import { DEFAULT_PAIRS, MOTION_NODES, pairIndex } from '../../src/motion/roles.js';
import { Pcg32 } from '../../src/nn/prng.js';

const P = DEFAULT_PAIRS.count, S = 3, WINDOWS = 12;
const node = (n: string) => (MOTION_NODES as readonly string[]).indexOf(n);

/** Returns factors whose pair values are a fixed per-unordered-couple pattern plus seeded noise of SD `noise`. */
function factors(seed: number, noise: number, edit?: (p: number, d: number) => number): TakeFactors {
  const rng = new Pcg32(seed, 3);
  const base = new Float64Array(P * S);
  // A pair and its mirror share the pattern value, so a symmetric take has d_p = 0 up to noise.
  for (let p = 0; p < P; p++) for (let d = 0; d < S; d++) base[p * S + d] = Math.sin(Math.min(p, DEFAULT_PAIRS.mirror[p]!) * 0.37 + d);
  const staticPerWindow = new Float64Array(WINDOWS * P * S);
  for (let w = 0; w < WINDOWS; w++)
    for (let i = 0; i < P * S; i++) staticPerWindow[w * P * S + i] = base[i]! + noise * rng.gauss() + (edit ? edit(Math.floor(i / S), i % S) : 0);
  const staticMean = new Float64Array(P * S);
  for (let i = 0; i < P * S; i++) { let m = 0; for (let w = 0; w < WINDOWS; w++) m += staticPerWindow[w * P * S + i]!; staticMean[i] = m / WINDOWS; }
  return {
    pairs: P, staticDims: S, dynamicDims: 2, windowEnds: Array.from({ length: WINDOWS }, (_, w) => 60 + 15 * w),
    times: Float64Array.from({ length: WINDOWS }, (_, w) => (60 + 15 * w) / 30), staticPerWindow, staticMean,
    staticSd: new Float64Array(P * S), staticPosteriorSd: new Float64Array(P * S), dynamicSeries: new Float64Array(WINDOWS * P * 2), mirrorAveraged: false,
  };
}

const controls = Array.from({ length: 12 }, (_, i) => factors(100 + i, 0.05));
const norms = couplingNorms(controls);
const leftKnee = pairIndex(node('l_hip'), node('l_knee'));

describe('coupling asymmetry', () => {
  it('lists every mirror couple once and names pairs by role', () => {
    const couples = mirrorCouples();
    // 272 ordered pairs; pairs mapped to themselves are those between midline nodes (3·2 = 6), so 133 couples.
    expect(couples.length).toBe((272 - 6) / 2);
    expect(pairName(leftKnee)).toBe('l_hip→l_knee');
    expect(pairName(DEFAULT_PAIRS.mirror[leftKnee]!)).toBe('r_hip→r_knee');
  });

  it('ranks the shifted couple first, on the shifted side, at the joint it involves', () => {
    // Shift every dimension of l_hip→l_knee by 1.0: its difference from r_hip→r_knee moves by 1.0 against
    // a control SD of about 0.05·√(2/12) ≈ 0.02 of the window means, so its score is far above the rest.
    const take = factors(7, 0.05, (p) => (p === leftKnee ? 1 : 0));
    const a = couplingAsymmetry(take, norms, { replicates: 50 });
    expect(a.ranked[0]!.pair).toBe('l_hip→l_knee');
    expect(a.ranked[0]!.side).toBe('left');
    expect(a.ranked[0]!.score).toBeGreaterThan(10 * a.ranked[5]!.score);
    expect(a.ranked[0]!.ciLow).toBeLessThanOrEqual(a.ranked[0]!.score * 1.05);
    expect(a.ranked[0]!.ciHigh).toBeGreaterThanOrEqual(a.ranked[0]!.ciLow);
    expect(a.side).toBe('left');
    // l_hip→l_knee: the hip node names no joint, the knee node is carried by the hip.
    expect(a.joint).toBe('hip');
    expect(a.summary).toContain('left side');
  });

  it('names the joint that carries the shifted node: every pair of the left ankle shifted names the left knee', () => {
    const ankle = node('l_ankle');
    const take = factors(8, 0.05, (p) => (DEFAULT_PAIRS.sender[p] === ankle || DEFAULT_PAIRS.receiver[p] === ankle ? 0.5 : 0));
    const a = couplingAsymmetry(take, norms, { replicates: 20 });
    expect(a.joint).toBe('knee');
    expect(a.side).toBe('left');
  });

  it('flips the side and keeps the score when every pair swaps with its mirror (mirror test)', () => {
    const take = factors(7, 0.05, (p) => (p === leftKnee ? 1 : 0));
    const mirrored: TakeFactors = { ...take, staticPerWindow: new Float64Array(take.staticPerWindow.length), staticMean: new Float64Array(take.staticMean.length) };
    for (let p = 0; p < P; p++) {
      const m = DEFAULT_PAIRS.mirror[p]!;
      for (let d = 0; d < S; d++) {
        mirrored.staticMean[m * S + d] = take.staticMean[p * S + d]!;
        for (let w = 0; w < WINDOWS; w++) mirrored.staticPerWindow[(w * P + m) * S + d] = take.staticPerWindow[(w * P + p) * S + d]!;
      }
    }
    const a = couplingAsymmetry(take, norms, { replicates: 20 }), b = couplingAsymmetry(mirrored, norms, { replicates: 20 });
    expect(b.side).toBe('right');
    expect(b.ranked[0]!.side).toBe('right');
    // The norms count every control with its mirror image, so a take and its mirror image score the same.
    expect(b.ranked[0]!.score).toBeCloseTo(a.ranked[0]!.score, 9);
    expect(b.score).toBeCloseTo(a.score, 9);
    for (const d of norms.diffMean) expect(Math.abs(d)).toBeLessThan(1e-12);
  });

  it('scores a symmetric take near the controls and below a shifted one', () => {
    const sym = couplingAsymmetry(factors(55, 0.05), norms, { replicates: 20 });
    const shifted = couplingAsymmetry(factors(55, 0.05, (p) => (p === leftKnee ? 0.2 : 0)), norms, { replicates: 20 });
    expect(sym.score).toBeLessThan(norms.controlScoreP90 * 1.5);
    expect(shifted.score).toBeGreaterThan(sym.score);
  });

  it('reads stored figures back and refuses ones of another shape', () => {
    const extras = JSON.parse(JSON.stringify({ [COUPLING_NORMS_KEY]: norms })) as Record<string, unknown>;
    expect(storedCouplingNorms(extras, P, S)?.controlScoreP90).toBeCloseTo(norms.controlScoreP90, 12);
    expect(storedCouplingNorms({}, P, S)).toBeNull();
    expect(() => storedCouplingNorms(extras, P, 4)).toThrow(/do not fit/);
  });
});
