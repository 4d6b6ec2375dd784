// Joint attribution by learned prototypes (src/analysis/joint-profiles.ts) on hand-built couple vectors:
// known joint patterns sharing one common component (one source per joint, and for the hip a second
// source with another pattern), each development subject one pattern turned to its side plus seeded
// noise. Expected: the prototypes point along the patterns, leave-one-out names joint and side, a negated
// vector (the mirror image) keeps the joint and flips the side, and stored prototypes are read back or
// refused by shape. Then couplingAsymmetry uses stored prototypes for joint and side.
import { describe, expect, it } from 'vitest';
import { coupleNames, coupleVector, couplingAsymmetry, couplingNorms } from '../../src/analysis/coupling-asymmetry.js';
import type { TakeFactors } from '../../src/analysis/factors.js';
import { attributeByProfiles, fitJointProfiles, JOINT_GROUPS, JOINT_PROFILES_KEY, storedJointProfiles, type ProfileSample } from '../../src/analysis/joint-profiles.js';
import { DEFAULT_PAIRS } from '../../src/motion/roles.js';
import { Pcg32 } from '../../src/nn/prng.js';

const couples = ['a→b', 'c→d', 'e→f', 'g→h', 'i→j', 'k→l'], S = 2, L = couples.length * S;

/** Returns pattern j: a common lift of 1 on every entry plus 3 on entries 2j and 2j + 1 (j = 4: the hip's second source). */
function pattern(j: number): Float64Array {
  const v = new Float64Array(L).fill(1);
  v[2 * j] = 4; v[2 * j + 1] = 4;
  return v;
}

function samples(seed: number, perJoint: number, noise: number): ProfileSample[] {
  const rng = new Pcg32(seed, 5), out: ProfileSample[] = [];
  const kinds = [...JOINT_GROUPS.map((joint, j) => ({ joint, source: 'walker', j })), { joint: 'hip' as const, source: 'edited', j: 4 }];
  for (const { joint, source, j } of kinds)
    for (let k = 0; k < perJoint; k++) {
      const side = k % 2 === 0 ? 'left' : 'right', sign = side === 'left' ? 1 : -1;
      out.push({ joint, source, side, z: Float64Array.from(pattern(j), (x) => sign * x + noise * rng.gauss()) });
    }
  return out;
}

describe('joint profiles', () => {
  const fitted = fitJointProfiles(samples(1, 6, 0.3), couples, S);

  it('points each prototype along its pattern (unit length), one per joint and source', () => {
    expect(fitted.prototypes.map((p) => `${p.joint}/${p.source}`)).toEqual(['hip/edited', 'hip/walker', 'knee/walker', 'ankle/walker', 'shoulder/arm/walker']);
    for (const p of fitted.prototypes) {
      const t = pattern(p.source === 'edited' ? 4 : JOINT_GROUPS.indexOf(p.joint));
      const cos = p.vector.reduce((s, x, i) => s + x * t[i]!, 0) / Math.hypot(...t);
      expect(Math.hypot(...p.vector)).toBeCloseTo(1, 12);
      expect(cos).toBeGreaterThan(0.98);
    }
    expect(fitted.subjects).toEqual({ hip: 12, knee: 6, ankle: 6, 'shoulder/arm': 6 });
  });

  it('names joint and side of every development subject when left out (noise well below the patterns)', () => {
    expect(fitted.looJoint).toBe(1);
    expect(fitted.looSide).toBe(1);
  });

  it('names a new subject, and its mirror image (the negated vector) on the other side at the same joint', () => {
    const z = pattern(2);
    const a = attributeByProfiles(z, fitted), b = attributeByProfiles(Float64Array.from(z, (x) => -x), fitted);
    expect(a).toMatchObject({ joint: 'ankle', side: 'left' });
    expect(b).toMatchObject({ joint: 'ankle', side: 'right' });
    expect(a.similarity.ankle).toBeCloseTo(b.similarity.ankle, 12);
    // The hip's second source names the hip as well.
    expect(attributeByProfiles(Float64Array.from(pattern(4), (x) => -x), fitted)).toMatchObject({ joint: 'hip', side: 'right' });
  });

  it('refuses development data without every joint, and stored profiles of another shape', () => {
    expect(() => fitJointProfiles(samples(2, 4, 0.1).filter((s) => s.joint !== 'knee'), couples, S)).toThrow(/knee/);
    const extras = JSON.parse(JSON.stringify({ [JOINT_PROFILES_KEY]: fitted })) as Record<string, unknown>;
    expect(storedJointProfiles(extras, couples, S)?.looJoint).toBe(1);
    expect(storedJointProfiles({}, couples, S)).toBeNull();
    expect(() => storedJointProfiles(extras, couples, 3)).toThrow(/do not fit/);
    expect(() => storedJointProfiles(extras, [...couples].reverse(), S)).toThrow(/do not fit/);
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
  const profiles = fitJointProfiles(dev, names, SD);

  it('names joint and side by the profiles, and says so', () => {
    const target = DEFAULT_PAIRS.mirror[couplesIdx[20]!]!;
    const a = couplingAsymmetry(factors(999, (p) => (p === target ? 0.5 : 0)), norms, { replicates: 10, profiles });
    expect(a.attribution).toBe('profiles');
    expect(a.joint).toBe('ankle');
    expect(a.side).toBe('right');
    expect(couplingAsymmetry(factors(999, () => 0), norms, { replicates: 10 }).attribution).toBe('carried nodes');
  });
});
