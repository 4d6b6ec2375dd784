// Regressions: inputs that once broke the parser or writer. Each block says the input, what must
// happen, what went wrong before the fix, and where.
import { afterAll, describe, expect, it } from 'vitest';
import { parseBvh, readBvhFile } from '../../src/bvh/parse.js';
import { writeBvh } from '../../src/bvh/write.js';
import { BvhParseError } from '../../src/errors/index.js';
import { Prng } from '../fuzz/prng.js';
import { randomTake } from '../fuzz/random-take.js';
import { expectSameTake, parseFixture, tempDir } from './support.js';

const tmp = tempDir();
afterAll(() => tmp.cleanup());

describe('regression: deep joint nesting overflows the call stack (src/bvh/parse.ts parseJoint recursion)', () => {
  // Input: ROOT with 6,000 JOINTs each nested in the previous one (6,001 joints, under LIMITS.joints).
  // Expected: a Take, or a BvhParseError refusing the nesting depth with line and column.
  // Before the fix: RangeError "Maximum call stack size exceeded" from parseJoint calling itself per level
  // (about 4,000 levels is where Node 20's default stack gives out).
  it('6,000 nested joints give a Take or a BvhParseError, never a RangeError', () => {
    const depth = 6000;
    const parts = ['HIERARCHY\nROOT r\n{\nOFFSET 0 0 0\nCHANNELS 1 Xrotation\n'];
    for (let i = 0; i < depth; i++) parts.push(`JOINT j${i}\n{\nOFFSET 0 1 0\n`);
    parts.push('}\n'.repeat(depth), '}\nMOTION\nFrames: 1\nFrame Time: 0.1\n0\n');
    let caught: unknown = null;
    try {
      const t = parseBvh(parts.join(''), { file: 'deep.bvh' });
      expect(t.joints.length).toBe(depth + 1);
    } catch (e) {
      caught = e;
    }
    if (caught !== null) {
      expect((caught as Error).name).toBe('BvhParseError');
      expect(caught).toBeInstanceOf(BvhParseError);
    }
  });
});

describe('regression: writeBvh drops the sign of -0 (src/bvh/write.ts formatNumber: String(-0) is "0")', () => {
  // Input: a take holding -0 in values or offsets. Expected: parse(write(t)) bit-identical to t
  // (IEEE 754 -0 and +0 differ; Object.is tells them apart). Before the fix: -0 came back as +0.
  it('negative-zero.bvh round trips with its -0 values and offsets', () => {
    const t = parseFixture('negative-zero.bvh');
    expectSameTake(parseBvh(writeBvh(t)), t);
  });
  it('random takes with -0 round trip bit-identically', () => {
    for (let seed = 1; seed <= 50; seed++) {
      const t = randomTake(new Prng(seed), { maxJoints: 10, maxFrames: 4, negativeZero: true });
      expectSameTake(parseBvh(writeBvh(t)), t);
    }
  });
});

describe('regression: numbers longer than 63 characters fail only when they straddle a file chunk (src/bvh/parse.ts parseMotion)', () => {
  // Input: 12,000 frame lines each holding one 93-character number "0.000…0001" (valid decimal),
  // the Frame Time line padded with 9 spaces so that one number straddles the first 1 MiB refill.
  // Expected: readBvhFile gives what parseBvh of the same bytes gives (a Take of 12,000 frames).
  // Before the fix: parseBvh succeeds; readBvhFile throws "expected a number of at most 64 characters" at
  // line 11163, because parseMotion refills only when fewer than 64 bytes remain and then treats a
  // number reaching the buffer end as too long. The limit also applies only at chunk edges.
  it('reading from a file agrees with reading from memory', () => {
    const num = '0.' + '0'.repeat(90) + '1';
    const text =
      'HIERARCHY\nROOT a\n{\nOFFSET 0 0 0\nCHANNELS 1 Xrotation\n}\nMOTION\nFrames: 12000\nFrame Time: 0.1' +
      ' '.repeat(9) +
      '\n' +
      `${num}\n`.repeat(12000);
    const fromMemory = parseBvh(text, { file: 'long-numbers.bvh' });
    expect(fromMemory.frameCount).toBe(12000);
    expect(fromMemory.values[0]).toBe(Number(num));
    const path = tmp.file('long-numbers.bvh', text);
    let fromFile;
    try {
      fromFile = readBvhFile(path, { file: 'long-numbers.bvh' });
    } catch (e) {
      throw new Error(`file read failed where memory read worked: ${(e as Error).message}`);
    }
    expectSameTake(fromFile, fromMemory, true);
  });
});
