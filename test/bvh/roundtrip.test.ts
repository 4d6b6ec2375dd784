// parse(write(t)) gives t back bit for bit: on every fixture, on random takes, and through the
// chunked file reader on files larger than three 1 MiB chunks (short and very long lines).
import { readdirSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { parseBvh, readBvhFile } from '../../src/bvh/parse.js';
import { writeBvh } from '../../src/bvh/write.js';
import type { Joint, Take } from '../../src/bvh/take.js';
import { Prng } from '../fuzz/prng.js';
import { randomTake } from '../fuzz/random-take.js';
import { FIXTURE_DIR, expectSameTake, parseFixture, tempDir } from './support.js';

const FIXTURES = readdirSync(FIXTURE_DIR).filter((f) => f.endsWith('.bvh')).sort();

const tmp = tempDir();
afterAll(() => tmp.cleanup());

describe('round trip on the fixtures', () => {
  it('finds the fixture files', () => {
    expect(FIXTURES.length).toBeGreaterThanOrEqual(17);
  });
  for (const name of FIXTURES) {
    it(`${name}: parse(write(parse(file))) equals parse(file)`, () => {
      const t = parseFixture(name);
      const back = parseBvh(writeBvh(t), { file: 'again.bvh' });
      expectSameTake(back, t);
      // The writer writes the data's frame count, so the one-off warnings do not come back.
      expect(back.warnings).toEqual([]);
      expect(back.headerFrameCount).toBe(t.frameCount);
    });
  }
  it('round trips with CRLF line ends and space indentation too', () => {
    for (const name of FIXTURES) {
      const t = parseFixture(name);
      expectSameTake(parseBvh(writeBvh(t, { eol: '\r\n', indent: '  ' })), t);
    }
  });
});

describe('round trip on random takes', () => {
  it('300 random takes (random trees, 1-3 roots, channel sets and orders, mixed magnitudes) come back bit-identical', () => {
    for (let seed = 1; seed <= 300; seed++) {
      const t = randomTake(new Prng(seed), { maxJoints: 20, maxFrames: 8, maxRoots: 3, negativeZero: true });
      let back: Take;
      try {
        back = parseBvh(writeBvh(t), { file: `seed-${seed}.bvh` });
      } catch (e) {
        throw new Error(`seed ${seed}: ${(e as Error).message}`);
      }
      expectSameTake(back, t);
      expect(back.warnings, `seed ${seed}`).toEqual([]);
    }
  });

  it('the random takes do cover the hard cases (tiny, huge, subnormal, many digits, every channel order)', () => {
    // Guards the generator itself: without these the test above proves little.
    let tiny = 0, huge = 0, sub = 0, long = 0;
    const orders = new Set<string>();
    for (let seed = 1; seed <= 300; seed++) {
      const t = randomTake(new Prng(seed), { maxJoints: 20, maxFrames: 8, maxRoots: 3 });
      for (const v of t.values) {
        const a = Math.abs(v);
        if (a > 0 && a < 1e-300) tiny++;
        if (a > 1e300) huge++;
        if (a > 0 && a < 2.2250738585072014e-308) sub++; // below the smallest normal double (IEEE 754)
        if (String(v).replace(/[-.]|e.*$/g, '').length >= 16) long++;
      }
      for (const j of t.joints) {
        const rot = j.channels.filter((c) => c.endsWith('rotation')).map((c) => c[0]).join('');
        if (rot.length === 3) orders.add(rot);
      }
    }
    expect(tiny).toBeGreaterThan(50);
    expect(huge).toBeGreaterThan(50);
    expect(sub).toBeGreaterThan(50);
    expect(long).toBeGreaterThan(500);
    expect([...orders].sort()).toEqual(['XYZ', 'XZY', 'YXZ', 'YZX', 'ZXY', 'ZYX']);
  });
});

describe('round trip through the chunked file reader', () => {
  it('a > 3 MiB file of short lines reads the same from disk as from memory, and equals the take written', () => {
    const rng = new Prng(20240611);
    const t = randomTake(rng, { maxJoints: 20, maxFrames: 1, negativeZero: true });
    // Refill with many frames of full-precision values so the text passes 3 MiB.
    const frames = Math.ceil((3.2 * 2 ** 20) / (t.channelCount * 18)) + 10;
    const big: Take = { ...t, frameCount: frames, headerFrameCount: frames, values: new Float64Array(frames * t.channelCount) };
    for (let i = 0; i < big.values.length; i++) big.values[i] = (rng.next() - 0.5) * 10 ** rng.int(-5, 5);
    const text = writeBvh(big);
    expect(Buffer.byteLength(text)).toBeGreaterThan(3 * 2 ** 20);
    const path = tmp.file('short-lines.bvh', text);
    const fromFile = readBvhFile(path, { file: 'short-lines.bvh' });
    const fromMemory = parseBvh(text, { file: 'short-lines.bvh' });
    expectSameTake(fromFile, fromMemory, true);
    expectSameTake(fromFile, big);
  });

  it('a > 3 MiB file whose frame lines are ~180 kB long (lines span chunk boundaries)', () => {
    const rng = new Prng(77);
    // One root with 1500 six-channel children: 9006 values a line.
    const joints: Joint[] = [{ name: 'Hub', parent: -1, offset: [0, 0, 0], channels: ['Xposition', 'Yposition', 'Zposition', 'Zrotation', 'Xrotation', 'Yrotation'], channelStart: 0, endSite: false, line: 0 }];
    for (let k = 0; k < 1500; k++)
      joints.push({ name: `spoke.${k}:L`, parent: 0, offset: [k, 0 - k, 0.5], channels: ['Xposition', 'Yposition', 'Zposition', 'Yrotation', 'Xrotation', 'Zrotation'], channelStart: 6 + 6 * k, endSite: false, line: 0 });
    const C = 6 + 6 * 1500;
    const F = 24;
    const values = new Float64Array(F * C);
    for (let i = 0; i < values.length; i++) values[i] = (rng.next() - 0.5) * 720;
    const t: Take = { joints, frameTime: 1 / 120, frameCount: F, channelCount: C, values, headerFrameCount: F, warnings: [] };
    const text = writeBvh(t);
    expect(Buffer.byteLength(text)).toBeGreaterThan(3 * 2 ** 20);
    const path = tmp.file('long-lines.bvh', text);
    const fromFile = readBvhFile(path, { file: 'long-lines.bvh' });
    expectSameTake(fromFile, parseBvh(text, { file: 'long-lines.bvh' }), true);
    expectSameTake(fromFile, t);
  });

  it('every fixture reads the same from disk as from memory (warnings included)', () => {
    for (const name of FIXTURES) {
      const fromFile = readBvhFile(`${FIXTURE_DIR}${name}`, { file: name });
      expectSameTake(fromFile, parseFixture(name), true);
    }
  });
});
