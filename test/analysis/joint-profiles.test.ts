// Joint attribution by the shrinkage discriminant (src/analysis/joint-profiles.ts): weights and biases
// hand-computed on a two-class example (regularised discriminant analysis, Friedman 1989); then
// hand-built couple vectors, known joint patterns sharing one common component (one source per joint, a
// second source for the hip, a side-only stance pattern), each development subject one pattern turned to
// its side plus seeded noise. Expected: cross-validation names joint and side, a negated vector (the
// mirror image) keeps the joint and flips the side, a nuisance shared by two joints is discounted, and
// stored profiles are read back or refused; the evidence score is hand-computed on the two-class example
// and grows with the size of an impairment pattern. Then couplingAsymmetry uses stored profiles for joint,
// side and score, and names a side-only class as the pattern when it fits better than every joint class.
import { describe, expect, it } from 'vitest';
import { coupleNames, coupleVector, couplingAsymmetry, couplingNorms, sideOnlyWording } from '../../src/analysis/coupling-asymmetry.js';
import type { TakeFactors } from '../../src/analysis/factors.js';
import { attributeByProfiles, fitDiscriminant, fitJointProfiles, JOINT_GROUPS, JOINT_PROFILES_KEY, SHRINKAGE_GRID, storedJointProfiles, type ProfileSample } from '../../src/analysis/joint-profiles.js';
import { DEFAULT_PAIRS } from '../../src/motion/roles.js';
import { Pcg32 } from '../../src/nn/prng.js';

const couples = ['a→b', 'c→d', 'e→f', 'g→h', 'i→j', 'k→l'], S = 2, L = couples.length * S;

/** Returns pattern j: a common lift of 1 on every entry plus 3 on entries 2j and 2j + 1 (j = 4: the hip's second source, j = 5: a side-only kind). */
function pattern(j: number): Float64Array {
  const v = new Float64Array(L).fill(1);
  v[2 * j] = 4; v[2 * j + 1] = 4;
  return v;
}

/** Control vectors: noise only, no pattern. */
function controlVectors(seed: number, count: number, noise: number): Float64Array[] {
  const rng = new Pcg32(seed, 9);
  return Array.from({ length: count }, () => Float64Array.from({ length: L }, () => noise * rng.gauss()));
}

/** Development subjects: each joint's pattern (and the hip's edited one, and a side-only stance pattern) on alternating sides, plus noise and a shared nuisance. */
function samples(seed: number, perClass: number, noise: number, nuisance = 0): ProfileSample[] {
  const rng = new Pcg32(seed, 5), out: ProfileSample[] = [];
  const kinds = [...JOINT_GROUPS.map((joint, j) => ({ joint, source: 'walker', j })), { joint: 'hip' as const, source: 'edited', j: 4 }, { joint: null, source: 'stance', j: 5 }];
  for (const { joint, source, j } of kinds)
    for (let k = 0; k < perClass; k++) {
      const side = k % 2 === 0 ? 'left' : 'right', sign = side === 'left' ? 1 : -1;
      // The nuisance moves entries 0-3 (hip and knee) together by a large random amount, on neither side.
      const n = nuisance * rng.gauss();
      out.push({ joint, source, side, z: Float64Array.from(pattern(j), (x, i) => sign * x + noise * rng.gauss() + (i < 4 ? n : 0)) });
    }
  return out;
}

describe('shrinkage discriminant', () => {
  it('gives hand-computed weights and biases', () => {
    // Two classes in two dimensions, two subjects each at μ ± (1, 1) (all turned left): pooled scatter
    // [[1, 1], [1, 1]], trace 2, so with λ = 0.5: Σ = [[1, 0.5], [0.5, 1]], Σ⁻¹ = [[1, −0.5], [−0.5, 1]] / 0.75.
    // μ_a = (2, 0): w = (8/3, −4/3), bias = ½ μ·w = 8/3. μ_b = (0, 2): w = (−4/3, 8/3), bias 8/3.
    const two: ProfileSample[] = [
      { joint: 'hip', source: 'walker', side: 'left', z: [3, 1] }, { joint: 'hip', source: 'walker', side: 'right', z: [-1, 1] },
      { joint: 'knee', source: 'walker', side: 'left', z: [1, 3] }, { joint: 'knee', source: 'walker', side: 'left', z: [-1, 1] },
    ];
    const classes = fitDiscriminant(two, 2, 0.5);
    expect(classes.map((c) => `${c.joint}/${c.source}/${c.subjects}`)).toEqual(['hip/walker/2', 'knee/walker/2']);
    expect(classes[0]!.weights[0]).toBeCloseTo(8 / 3, 12);
    expect(classes[0]!.weights[1]).toBeCloseTo(-4 / 3, 12);
    expect(classes[0]!.bias).toBeCloseTo(8 / 3, 12);
    expect(classes[1]!.weights[0]).toBeCloseTo(-4 / 3, 12);
    expect(classes[1]!.weights[1]).toBeCloseTo(8 / 3, 12);
    expect(() => fitDiscriminant(two, 2, 0)).toThrow(/shrinkage/);
    // Evidence: the best |w·z| − bias of any class. z = (2, 0): hip 16/3 − 8/3 = 8/3, knee |−8/3| − 8/3 = 0,
    // so 8/3 on the left; z = (0, −2): knee |−16/3| − 8/3 = 8/3 on the right; z = 0: −8/3 (no class fits).
    const hand = { method: 'shrinkage-discriminant' as const, staticDims: 1, couples: ['a→b', 'c→d'], classes, shrinkage: 0.5, subjects: { hip: 2, knee: 2, ankle: 0, 'shoulder/arm': 0 }, sideOnlySubjects: 0, cv: [], controls: { subjects: 3, evidenceP50: 0, evidenceP90: 0 } };
    expect(attributeByProfiles([2, 0], hand)).toMatchObject({ side: 'left', joint: 'hip' });
    expect(attributeByProfiles([2, 0], hand).evidence).toBeCloseTo(8 / 3, 12);
    expect(attributeByProfiles([0, -2], hand)).toMatchObject({ side: 'right', joint: 'knee' });
    expect(attributeByProfiles([0, -2], hand).evidence).toBeCloseTo(8 / 3, 12);
    expect(attributeByProfiles([0, 0], hand).evidence).toBeCloseTo(-8 / 3, 12);
  });

  const controls = controlVectors(7, 20, 0.3);
  const fitted = fitJointProfiles(samples(1, 6, 0.3), controls, couples, S);

  it('fits one class per joint and source (side-only kinds without a joint), chosen by cross-validation', () => {
    expect(fitted.classes.map((c) => `${c.joint}/${c.source}`)).toEqual(['null/stance', 'ankle/walker', 'hip/edited', 'hip/walker', 'knee/walker', 'shoulder/arm/walker']);
    expect(fitted.subjects).toEqual({ hip: 12, knee: 6, ankle: 6, 'shoulder/arm': 6 });
    expect(fitted.sideOnlySubjects).toBe(6);
    expect(fitted.cv.map((r) => r.shrinkage)).toEqual([...SHRINKAGE_GRID]);
    const best = fitted.cv.find((r) => r.shrinkage === fitted.shrinkage)!;
    expect(best.joint).toBe(1);
    expect(best.side).toBe(1);
  });

  it('stores the controls\' evidence percentiles, which a patterned take exceeds and a larger pattern exceeds more', () => {
    const ev = controls.map((z) => attributeByProfiles(z, fitted).evidence).sort((a, b) => a - b);
    expect(fitted.controls).toEqual({ subjects: 20, evidenceP50: ev[Math.round(0.5 * 19)], evidenceP90: ev[Math.round(0.9 * 19)] });
    const half = attributeByProfiles(Float64Array.from(pattern(1), (x) => 0.5 * x), fitted).evidence;
    const full = attributeByProfiles(pattern(1), fitted).evidence;
    expect(half).toBeGreaterThan(fitted.controls.evidenceP90);
    expect(full).toBeGreaterThan(half);
    expect(() => fitJointProfiles(samples(1, 6, 0.3), controls.slice(0, 2), couples, S)).toThrow(/three control/);
  });

  it('names a new subject, and its mirror image (the negated vector) on the other side at the same joint', () => {
    const z = pattern(2);
    const a = attributeByProfiles(z, fitted), b = attributeByProfiles(Float64Array.from(z, (x) => -x), fitted);
    expect(a).toMatchObject({ joint: 'ankle', side: 'left' });
    expect(b).toMatchObject({ joint: 'ankle', side: 'right' });
    expect(a.scores.ankle).toBeCloseTo(b.scores.ankle, 12);
    expect(a.scores.ankle).toBeGreaterThan(Math.max(a.scores.hip, a.scores.knee, a.scores['shoulder/arm']));
    // The hip's second source names the hip as well; a side-only pattern names its side.
    expect(attributeByProfiles(Float64Array.from(pattern(4), (x) => -x), fitted)).toMatchObject({ joint: 'hip', side: 'right' });
    const stance = attributeByProfiles(Float64Array.from(pattern(5), (x) => -x), fitted);
    expect(stance.side).toBe('right');
    // The best class of any kind is the side-only one; a joint pattern's best class is its own.
    expect(stance.best).toEqual({ joint: null, source: 'stance' });
    expect(a.best).toEqual({ joint: 'ankle', source: 'walker' });
    // A vector no class can score names no best class (so no side-only pattern either).
    expect(attributeByProfiles(new Float64Array(L).fill(NaN), fitted).best).toBeNull();
  });

  it('sees through a large nuisance shared by two joints, which the plain class means do not', () => {
    // With λ = 1 (no covariance: nearest class mean direction) the nuisance on the hip and knee entries
    // confuses them; the cross-validated shrinkage learns its direction and discounts it.
    const noisy = samples(3, 12, 0.2, 3), test = samples(4, 12, 0.2, 3).filter((s) => s.joint === 'hip' || s.joint === 'knee');
    const accuracy = (p: ReturnType<typeof fitJointProfiles>) => test.filter((s) => attributeByProfiles(s.z, p).joint === s.joint).length / test.length;
    const learned = fitJointProfiles(noisy, controls, couples, S), plain = fitJointProfiles(noisy, controls, couples, S, { shrinkages: [1] });
    expect(accuracy(learned)).toBeGreaterThan(0.9);
    expect(accuracy(learned)).toBeGreaterThan(accuracy(plain) + 0.1);
  });

  it('refuses development data without every joint, and stored profiles of another shape or kind', () => {
    expect(() => fitJointProfiles(samples(2, 4, 0.1).filter((s) => s.joint !== 'knee'), controls, couples, S)).toThrow(/knee/);
    const extras = JSON.parse(JSON.stringify({ [JOINT_PROFILES_KEY]: fitted })) as Record<string, unknown>;
    expect(storedJointProfiles(extras, couples, S)?.shrinkage).toBe(fitted.shrinkage);
    expect(storedJointProfiles({}, couples, S)).toBeNull();
    expect(() => storedJointProfiles(extras, couples, 3)).toThrow(/do not fit/);
    expect(() => storedJointProfiles(extras, [...couples].reverse(), S)).toThrow(/do not fit/);
    expect(() => storedJointProfiles({ [JOINT_PROFILES_KEY]: { prototypes: [] } }, couples, S)).toThrow(/older kind/);
    // A discriminant stored before the controls' evidence percentiles is refused the same way.
    const { controls: _, ...withoutControls } = fitted;
    expect(() => storedJointProfiles({ [JOINT_PROFILES_KEY]: withoutControls }, couples, S)).toThrow(/older kind/);
  });
});

describe('coupling asymmetry with stored profiles', () => {
  const P = DEFAULT_PAIRS.count, SD = 3, W = 8;
  /** Returns factors equal to their mirror's up to noise, plus `edit` on chosen pairs. */
  function factors(seed: number, edit: (p: number) => number): TakeFactors {
    const rng = new Pcg32(seed, 3), per = new Float64Array(W * P * SD), mean = new Float64Array(P * SD);
    for (let w = 0; w < W; w++)
      for (let p = 0; p < P; p++)
        for (let d = 0; d < SD; d++) {
          const v = Math.sin(Math.min(p, DEFAULT_PAIRS.mirror[p]!) * 0.37 + d) + 0.05 * rng.gauss() + edit(p);
          per[(w * P + p) * SD + d] = v;
          mean[p * SD + d]! += v / W;
        }
    return {
      pairs: P, staticDims: SD, dynamicDims: 2, windowEnds: Array.from({ length: W }, (_, w) => 60 + 15 * w), times: Float64Array.from({ length: W }, (_, w) => 2 + w / 2),
      staticPerWindow: per, staticMean: mean, staticSd: new Float64Array(P * SD), staticPosteriorSd: new Float64Array(P * SD), dynamicSeries: new Float64Array(W * P * 2), mirrorAveraged: false,
    };
  }
  const norms = couplingNorms(Array.from({ length: 10 }, (_, i) => factors(200 + i, () => 0)));
  // Development subjects: the left member of couple k shifted for joint k (k = 0..3), or its mirror for the right side.
  const names = coupleNames();
  const couplesIdx = Array.from({ length: P }, (_, p) => p).filter((p) => DEFAULT_PAIRS.mirror[p]! > p);
  const dev: ProfileSample[] = [];
  JOINT_GROUPS.forEach((joint, j) => {
    for (let k = 0; k < 4; k++) {
      const side = k % 2 ? 'right' : 'left', target = side === 'left' ? couplesIdx[10 * j]! : DEFAULT_PAIRS.mirror[couplesIdx[10 * j]!]!;
      dev.push({ joint, source: 'walker', side, z: coupleVector(factors(300 + 10 * j + k, (p) => (p === target ? 0.5 : 0)), norms) });
    }
  });
  // A side-only class (shorter stance): couple 45's left member shifted, or its mirror.
  const stancePair = (side: 'left' | 'right') => (side === 'left' ? couplesIdx[45]! : DEFAULT_PAIRS.mirror[couplesIdx[45]!]!);
  for (let k = 0; k < 4; k++) {
    const side = k % 2 ? 'right' : 'left';
    dev.push({ joint: null, source: 'stance', side, z: coupleVector(factors(350 + k, (p) => (p === stancePair(side) ? 0.5 : 0)), norms) });
  }
  const devControls = Array.from({ length: 6 }, (_, i) => coupleVector(factors(400 + i, () => 0), norms));
  const profiles = fitJointProfiles(dev, devControls, names, SD);

  it('names joint and side by the profiles, and says so', () => {
    const target = DEFAULT_PAIRS.mirror[couplesIdx[20]!]!;
    const a = couplingAsymmetry(factors(999, (p) => (p === target ? 0.5 : 0)), norms, { replicates: 10, profiles });
    expect(a.attribution).toBe('profiles');
    expect(a.joint).toBe('ankle');
    expect(a.side).toBe('right');
    expect(a.pattern).toBeNull();
    expect(a.summary).toContain('the right side lies farther from the cohort, most around the ankle;');
    // The take score is the discriminant's evidence on the take's couple vector, against the profiles' controls.
    const f = factors(999, (p) => (p === target ? 0.5 : 0));
    expect(a.scoreKind).toBe('discriminant evidence');
    expect(a.score).toBeCloseTo(attributeByProfiles(coupleVector(f, norms), profiles).evidence, 12);
    expect(a.controlP90).toBe(profiles.controls.evidenceP90);
    expect(a.score).toBeGreaterThan(a.controlP90);
    expect(a.ciLow).toBeLessThanOrEqual(a.ciHigh);
    const plain = couplingAsymmetry(factors(999, () => 0), norms, { replicates: 10 });
    expect(plain.attribution).toBe('carried nodes');
    expect(plain.scoreKind).toBe('pair distance');
    expect(plain.score).toBe(plain.distance);
    expect(plain.controlP90).toBe(norms.controlScoreP90);
    expect(plain.pattern).toBeNull();
  });

  it('says so when a side-only class fits better than every joint class, and still names the best joint', () => {
    const a = couplingAsymmetry(factors(998, (p) => (p === stancePair('left') ? 0.5 : 0)), norms, { replicates: 10, profiles });
    expect(a.side).toBe('left');
    expect(a.pattern).toBe('a shorter stance');
    // The joint named is the best of the joint classes alone.
    const scores = a.jointScores!, bestJoint = JOINT_GROUPS.reduce((b, j) => (scores[j] > scores[b] ? j : b));
    expect(a.joint).toBe(bestJoint);
    expect(Math.max(...Object.values(scores))).toBeLessThan(a.score);
    expect(a.summary).toContain(`the left side lies farther from the cohort, most like a shorter stance on that side (nearest joint class: the ${bestJoint});`);
    expect([sideOnlyWording('stance'), sideOnlyWording('step'), sideOnlyWording('sway')]).toEqual(['a shorter stance', 'a shorter step', 'a one-sided sway pattern']);
  });
});
