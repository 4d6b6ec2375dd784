// Joint world positions from jointloom (parser + forward kinematics) against an independent reference:
// three.js's BVHLoader driven through three's own scene graph (test/reference/three-fk.ts), corrected
// for its two known differences: it adds the OFFSET to position channels, and it trusts the header's
// frame count. Runs on every BVH fixture under test/fixtures that jointloom reads, on the FK fixtures
// covering all Euler orders and non-root position channels, and on synthesized takes.
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { parseBvh, readBvhFile, writeBvh, type Take } from '../../src/bvh/index.js';
import { forwardKinematics, restPose } from '../../src/skeleton/fk.js';
import { BvhParseError } from '../../src/errors/index.js';
import { threeWorldPositions, withHeaderFrames, type ThreeFkResult } from '../reference/three-fk.js';
import { smoothTake } from '../reference/smooth-take.js';
import { randomBvh } from '../reference/random-bvh.js';

const HERE = fileURLToPath(new URL('.', import.meta.url));
const REPO = join(HERE, '..', '..');
const FIXTURES = join(REPO, 'test', 'fixtures');

function bvhFiles(dir: string): string[] {
  if (!existsSync(dir)) return [];
  const out: string[] = [];
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) out.push(...bvhFiles(p));
    else if (e.name.toLowerCase().endsWith('.bvh')) out.push(p);
  }
  return out.sort();
}

/** Largest finite float32 (IEEE 754 binary32). */
const FLOAT32_MAX = 3.4028234663852886e38;

/** Largest extent of the rest pose over the three axes: the skeleton's size for tolerances. */
function skeletonHeight(take: Take): number {
  const rest = restPose(take);
  let h = 0;
  for (let a = 0; a < 3; a++) {
    let lo = Infinity, hi = -Infinity;
    for (let j = 0; j < take.joints.length; j++) {
      lo = Math.min(lo, rest[j * 3 + a]!);
      hi = Math.max(hi, rest[j * 3 + a]!);
    }
    h = Math.max(h, hi - lo);
  }
  return h;
}

interface Comparison {
  frames: number;
  /** Frames left out because the float32 tracks cannot hold them (a value beyond ±3.4e38, or a root so far out that its float64 sum loses the skeleton). */
  unrepresentable: number;
  /** Worst root-relative position difference, and where. */
  worst: number;
  where: string;
  /** Worst root position difference beyond the float32 rounding of its track. */
  worstRoot: number;
  tolerance: number;
}

/** Compares root-relative world positions of every joint in the frames both sides read. */
function compare(take: Take, three: ThreeFkResult): Comparison {
  const J = take.joints.length;
  // Hierarchy first: same bones in the same depth-first order, same parents, same offsets.
  expect(three.names.length, 'bone count (End Sites included)').toBe(J);
  take.joints.forEach((j, i) => {
    if (j.endSite) expect(three.names[i]).toBe('ENDSITE');
    // BVHLoader keeps only the first word of a name.
    else expect(three.names[i], `name of joint ${i}`).toBe(j.name.split(/\s+/)[0]);
    expect(three.parents[i], `parent of ${j.name}`).toBe(j.parent);
    // Both read OFFSET decimals correctly rounded (parseFloat on three's side), so exactly equal.
    // (Compared by value: three builds positions as 0 + offset, which turns an OFFSET of -0 into +0.)
    for (let a = 0; a < 3; a++) expect(Math.abs(three.restOffsets[i * 3 + a]! - j.offset[a]!), `offset of ${j.name}`).toBe(0);
  });
  const frames = Math.min(take.frameCount, three.frames);
  const ours = forwardKinematics(take, 0, frames);
  const height = Math.max(skeletonHeight(take), 1e-9);
  // three's tracks are float32: about 6e-8 relative rounding per value, a few of them along a chain.
  const tolerance = 1e-5 * height;
  let worst = 0, worstRoot = 0, where = '', unrepresentable = 0;
  const C = take.channelCount;
  for (let f = 0; f < frames; f++) {
    const o = f * J * 3;
    let skip = Math.hypot(ours[o]!, ours[o + 1]!, ours[o + 2]!) > 1e9 * height;
    for (let c = 0; c < C && !skip; c++) if (Math.abs(take.values[f * C + c]!) > FLOAT32_MAX) skip = true;
    if (skip) {
      unrepresentable++;
      continue;
    }
    for (let a = 0; a < 3; a++) {
      const r = ours[o + a]!;
      // Float32 rounding of the root's track value is at most 2^-24 of it, about 6e-8.
      const d = Math.abs(r - three.positions[o + a]!) - 1.2e-7 * Math.abs(r);
      if (!(d <= worstRoot)) worstRoot = Number.isNaN(d) ? Infinity : d;
    }
    for (let j = 1; j < J; j++)
      for (let a = 0; a < 3; a++) {
        const mine = ours[o + j * 3 + a]! - ours[o + a]!;
        const theirs = three.positions[o + j * 3 + a]! - three.positions[o + a]!;
        const d = Math.abs(mine - theirs);
        // A NaN on either side counts as the worst disagreement, never as agreement.
        if (!(d <= worst)) {
          worst = Number.isNaN(d) ? Infinity : d;
          where = `frame ${f + 1}, joint ${take.joints[j]!.name}, axis ${'XYZ'[a]}: ${mine} vs three ${theirs}`;
        }
      }
  }
  return { frames, unrepresentable, worst, where, worstRoot, tolerance };
}

function expectAgreement(take: Take, three: ThreeFkResult): Comparison {
  const c = compare(take, three);
  expect(c.frames - c.unrepresentable, 'frames compared').toBeGreaterThan(0);
  expect(c.worst, c.where).toBeLessThan(c.tolerance);
  expect(c.worstRoot, 'root position').toBeLessThan(c.tolerance);
  return c;
}

/**
 * Runs three on a file's text, rewriting a header that over-claims (difference b) so three can read it;
 * `failedAsWritten` tells whether BVHLoader failed on the text as written (it runs out of lines).
 */
function threeFor(take: Take, raw: string): { three: ThreeFkResult; failedAsWritten: boolean } {
  // BVHLoader compares its first line with "HIERARCHY" as is, so a UTF-8 byte-order mark is dropped first.
  const text = raw.replace(/^\uFEFF/, '');
  if (take.headerFrameCount > take.frameCount) {
    let failedAsWritten = false;
    try {
      threeWorldPositions(text);
    } catch {
      failedAsWritten = true;
    }
    return { three: threeWorldPositions(withHeaderFrames(text, take.frameCount)), failedAsWritten };
  }
  return { three: threeWorldPositions(text), failedAsWritten: false };
}

// ---- every fixture in the tree ---------------------------------------------------------------------

interface Case {
  label: string;
  path: string;
  take?: Take;
  skip?: string;
}

const cases: Case[] = bvhFiles(FIXTURES).map((path) => {
  const label = relative(FIXTURES, path);
  try {
    const take = readBvhFile(path);
    const roots = take.joints.filter((j) => j.parent < 0).length;
    if (roots > 1) return { label, path, skip: `${roots} roots (BVHLoader reads one)` };
    return { label, path, take };
  } catch (e) {
    if (e instanceof BvhParseError) return { label, path, skip: 'jointloom refuses it (a bad-input fixture)' };
    throw e;
  }
});

describe('world positions equal three.js scene-graph FK on every fixture', () => {
  it('finds the FK fixtures at least', () => {
    expect(cases.filter((c) => c.label.startsWith('fk')).length).toBeGreaterThanOrEqual(4);
  });
  it('skips fixtures only for a known reason (several roots, or a bad-input file jointloom refuses)', () => {
    for (const c of cases) if (c.skip) expect(c.skip, c.label).toMatch(/roots \(BVHLoader reads one\)|jointloom refuses it/);
  });
  for (const c of cases) {
    if (c.skip) {
      it.skip(`${c.label}: ${c.skip}`, () => {});
      continue;
    }
    const take = c.take!;
    const text = readFileSync(c.path, 'utf8');
    // A file BVHLoader cannot read at all (it prints errors and goes on) is not a reference.
    let three: ThreeFkResult | null = null;
    let failedAsWritten = false;
    let reason = '';
    try {
      ({ three, failedAsWritten } = threeFor(take, text));
      if (three.messages.length) reason = `BVHLoader: ${three.messages[0]}`;
    } catch (e) {
      reason = `BVHLoader throws: ${(e as Error).message}`;
    }
    if (reason) {
      it.skip(`${c.label}: ${reason}`, () => {});
      continue;
    }
    it(`${c.label} (${take.joints.length} joints, ${take.frameCount} frames)`, () => {
      // Difference (b): a header claiming more frames than the data makes BVHLoader fail as written.
      expect(failedAsWritten).toBe(take.headerFrameCount > take.frameCount);
      if (take.headerFrameCount !== take.frameCount) expect(three!.frames).toBe(Math.min(take.headerFrameCount, take.frameCount));
      expectAgreement(take, three!);
    });
  }
});

// ---- the two known differences, checked explicitly -------------------------------------------------

describe('the reference and its two known differences', () => {
  const fk = (name: string) => join(FIXTURES, 'fk', name);

  it('header one short: jointloom uses all data lines and warns; three reads header-many, one fewer', () => {
    const take = readBvhFile(fk('header-one-short.bvh'));
    const three = threeWorldPositions(readFileSync(fk('header-one-short.bvh'), 'utf8'));
    expect(take.headerFrameCount).toBe(5);
    expect(take.frameCount).toBe(6);
    expect(take.warnings.length).toBe(1);
    expect(three.frames).toBe(take.headerFrameCount);
    expect(take.frameCount - three.frames).toBe(1);
    expect(expectAgreement(take, three).frames).toBe(5);
  });

  it('header one over: jointloom uses the 6 data lines and warns; three fails until the header is corrected', () => {
    const text = readFileSync(fk('header-one-over.bvh'), 'utf8');
    const take = readBvhFile(fk('header-one-over.bvh'));
    expect(take.headerFrameCount).toBe(7);
    expect(take.frameCount).toBe(6);
    expect(take.warnings.length).toBe(1);
    expect(() => threeWorldPositions(text)).toThrow();
    const three = threeWorldPositions(withHeaderFrames(text, 6));
    expect(three.frames).toBe(6);
    expect(expectAgreement(take, three).frames).toBe(6);
  });

  it('without the OFFSET correction three disagrees on a file with non-root position channels', () => {
    // Difference (a): three places Spine at value + OFFSET; the offset (0, 0, 12) shows as a 12-unit gap.
    const text = readFileSync(fk('positions-mixed-crlf.bvh'), 'utf8');
    const take = parseBvh(text);
    const c = compare(take, threeWorldPositions(text, { correctOffset: false }));
    expect(c.worst).toBeGreaterThan(1);
  });

  it('the comparison notices a one-degree error in one rotation value', () => {
    const text = readFileSync(fk('all-orders.bvh'), 'utf8');
    const take = parseBvh(text);
    const three = threeWorldPositions(text);
    expect(compare(take, three).worst).toBeLessThan(compare(take, three).tolerance);
    take.values[take.channelCount * 3 + 8] += 1; // frame 4, last rotation channel of the first chain joint
    const c = compare(take, three);
    expect(c.worst).toBeGreaterThan(10 * c.tolerance);
  });
});

// ---- synthesized takes -----------------------------------------------------------------------------

/** Synthesized walker takes from src/synth with varied options, or the reason it could not be loaded. */
async function synthCases(): Promise<{ cases: { label: string; text: string; frames: number }[]; reason: string }> {
  try {
    const { synthesizeTake } = await import('../../src/synth/index.js');
    const variants: [string, Parameters<typeof synthesizeTake>[0]][] = [
      ['seed 1, defaults (ZXY, cm, Y up)', { seed: 1, duration: 4 }],
      ['seed 2, mixed orders, position channels on all joints', { seed: 2, duration: 4, rotationOrder: 'mixed', positionsOnAllJoints: true }],
      ['seed 3, metres, Z up, mixed orders', { seed: 3, duration: 4, units: 'm', upAxis: 'Z', rotationOrder: 'mixed' }],
      ['seed 4, YXZ, 4 decimals, noise', { seed: 4, duration: 4, rotationOrder: 'YXZ', decimals: 4, noise: { rotationDeg: 0.5, positionMm: 1 } }],
    ];
    return {
      cases: variants.map(([label, o]) => {
        const r = synthesizeTake(o);
        return { label: `synthesizeTake ${label}`, text: r.bvhText, frames: r.take.frameCount };
      }),
      reason: '',
    };
  } catch (e) {
    return { cases: [], reason: (e as Error).message };
  }
}

const synth = await synthCases();
const programmatic = [
  { label: 'smooth take, mixed orders, seed 11', take: smoothTake({ seed: 11, seconds: 4, rate: 120, order: 'mixed', amplitude: 90 }) },
  { label: 'smooth take, mixed orders, seed 12', take: smoothTake({ seed: 12, seconds: 4, rate: 120, order: 'mixed', amplitude: 170 }) },
  { label: 'smooth take, ZXY, seed 13', take: smoothTake({ seed: 13, seconds: 4, rate: 120, order: 'ZXY' }) },
];

describe('world positions equal three.js on synthesized takes', () => {
  it('src/synth loads and synthesizes', () => {
    // If this fails, the synth cases below are missing: the message says why.
    expect(synth.reason).toBe('');
    expect(synth.cases.length).toBe(4);
  });
  for (const { label, text, frames } of synth.cases) {
    it(label, () => {
      const take = parseBvh(text);
      expect(take.frameCount).toBe(frames);
      expectAgreement(take, threeWorldPositions(text));
    });
  }
  // Programmatic smooth takes with larger rotations, written by jointloom's writer and read back.
  for (const { label, take: source } of programmatic) {
    it(label, () => {
      const text = writeBvh(source);
      const take = parseBvh(text);
      expect(take.frameCount).toBe(source.frameCount);
      expectAgreement(take, threeWorldPositions(text));
    });
  }
});

// ---- random trees, channel subsets and spellings -----------------------------------------------------

describe('world positions equal three.js on seeded random BVH texts', () => {
  // Random trees with any subset and order of rotation axes, position channels on any joint (all,
  // some or none of X, Y, Z, before or after the rotations), End Sites or bare JOINT ends, CRLF or LF,
  // tabs or spaces, exponent and fixed spellings.
  for (let seed = 1; seed <= 60; seed++) {
    it(`seed ${seed}`, () => {
      const { text, joints, frames } = randomBvh(seed);
      const take = parseBvh(text);
      expect(take.joints.filter((j) => !j.endSite).length).toBe(joints);
      expect(take.frameCount).toBe(frames);
      const three = threeWorldPositions(text);
      expect(three.messages).toEqual([]);
      expectAgreement(take, three);
    });
  }
});
