// Seeded mutation fuzz of the BVH parser: every mutated input yields a sound Take or a well-formed
// BvhParseError, within 2 s, and the file reader agrees with the in-memory reader.
// The long run (100,000 cases) is `npx tsx test/fuzz/run.ts`; this file runs 10,000 fixed seeds.
import { describe, expect, it } from 'vitest';
import { BvhParseError } from '../../src/errors/index.js';
import type { Take } from '../../src/bvh/take.js';
import { Prng } from '../fuzz/prng.js';
import { checkError, checkTake, loadCorpus, makeInput, runFuzz } from '../fuzz/mutate.js';

describe('the fuzz machinery', () => {
  it('xoshiro128** matches the reference algorithm on state (1, 2, 3, 4)', () => {
    // Hand-computed from the reference C (prng.di.unimi.it/xoshiro128starstar.c):
    // out1 = rotl(2*5, 7)*9 = 1280*9 = 11520; then s = (7, 0, 1026, 12288) so out2 = 0;
    // then s1 = 1029, out3 = rotl(1029*5, 7)*9 = 658560*9 = 5927040.
    const g = Prng.fromState(1, 2, 3, 4);
    expect([g.nextU32(), g.nextU32(), g.nextU32()]).toEqual([11520, 0, 5927040]);
  });

  it('a seed always makes the same input, different seeds different inputs', () => {
    const corpus = loadCorpus();
    const a = makeInput(12345, corpus);
    const b = makeInput(12345, corpus);
    expect(Buffer.from(a.input).equals(Buffer.from(b.input))).toBe(true);
    expect(a.recipe).toBe(b.recipe);
    const distinct = new Set<string>();
    for (let s = 0; s < 50; s++) distinct.add(Buffer.from(makeInput(s, corpus).input).toString('latin1'));
    expect(distinct.size).toBeGreaterThan(45);
  });

  it('the take oracle rejects NaN, Infinity, a bad frame time and a wrong value count', () => {
    const good: Take = {
      joints: [{ name: 'a', parent: -1, offset: [0, 0, 0], channels: ['Xrotation'], channelStart: 0, endSite: false, line: 2 }],
      frameTime: 0.01, frameCount: 2, channelCount: 1, values: new Float64Array([1, 2]), headerFrameCount: 2, warnings: [],
    };
    expect(checkTake(good)).toBeNull();
    expect(checkTake({ ...good, values: new Float64Array([1, NaN]) })).toMatch(/NaN/);
    expect(checkTake({ ...good, values: new Float64Array([Infinity, 1]) })).toMatch(/Infinity/);
    expect(checkTake({ ...good, frameTime: 0 })).toMatch(/frameTime/);
    expect(checkTake({ ...good, values: new Float64Array([1, 2, 3]) })).toMatch(/values.length/);
    expect(checkTake({ ...good, joints: [{ ...good.joints[0]!, offset: [0, NaN, 0] }] })).toMatch(/offset/);
  });

  it('the error oracle wants file:line:column: expected …', () => {
    expect(checkError(new BvhParseError('fuzz.bvh', 3, 4, 'a number', '"x"'), 'fuzz.bvh')).toBeNull();
    expect(checkError(new BvhParseError('fuzz.bvh', 3, 0, 'a number', '"x"'), 'fuzz.bvh')).toMatch(/column/);
    expect(checkError(new BvhParseError('fuzz.bvh', 0, 1, 'a number', '"x"'), 'fuzz.bvh')).toMatch(/line/);
  });
});

describe('mutation fuzz, 10,000 fixed seeds', () => {
  it('every input gives a sound Take or a well-formed BvhParseError, never anything else', () => {
    const s = runFuzz({ cases: 10_000, seed: 20240601, fileEvery: 25, strictColumns: true });
    const report = s.failures.slice(0, 10).map((f) => `seed ${f.seed} [${f.recipe}]: ${f.detail} — replay: npx tsx test/fuzz/run.ts --seed ${f.seed} --cases 1`);
    expect(report).toEqual([]);
    expect(s.cases).toBe(10_000);
    expect(s.takes + s.errors).toBe(10_000);
    expect(s.fileChecks).toBe(400);
    // Both outcomes must be well represented or the run proves little.
    expect(s.takes).toBeGreaterThan(1000);
    expect(s.errors).toBeGreaterThan(4000);
    expect(s.slowest.ms).toBeLessThan(2000);
  });
});
