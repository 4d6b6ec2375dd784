// Normalisation statistics against simple-statistics, apply/invert, plain-JSON round trip, refusal of
// bad statistics, and left/right symmetry when mirrored windows are included.
import { mean as ssMean, standardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors/index.js';
import {
  accumulate, createAccumulator, denormalise, finishStats, normalise, statsFromJson, statsOfWindows, statsToJson,
} from '../../src/motion/normalise.js';
import { MOTION_NODES, NODE_MIRROR } from '../../src/motion/roles.js';
import { windowsOf } from '../../src/motion/window.js';
import { sameBits, synthTrack } from './support.js';

const N = MOTION_NODES.length;
const ix = (n: (typeof MOTION_NODES)[number]) => MOTION_NODES.indexOf(n);

describe('normalisation statistics', () => {
  const tr = synthTrack('train.bvh', { seed: 51, duration: 10, path: { kind: 'serpentine' } });
  const wins = [...windowsOf(tr, 20)];
  const stats = statsOfWindows(wins, MOTION_NODES);

  it('equal the mean and population SD of simple-statistics, feature by feature', () => {
    const width = N * 6;
    const columns: number[][] = Array.from({ length: width }, () => []);
    for (const w of wins)
      for (const s of [w.observed, w.future])
        for (let o = 0; o < s.length; o += width) for (let c = 0; c < width; c++) columns[c]!.push(s[o + c]!);
    expect(stats.count).toBe(columns[0]!.length);
    expect(stats.count).toBe(wins.length * 90);
    for (let c = 0; c < width; c++) {
      // simple-statistics' standardDeviation is the population SD (divide by n).
      expect(stats.mean[c]).toBeCloseTo(ssMean(columns[c]!), 10);
      expect(stats.sd[c]).toBeCloseTo(standardDeviation(columns[c]!), 10);
    }
  });

  it('normalise to mean 0 and SD 1 over the set, and invert exactly enough', () => {
    const acc = createAccumulator(N);
    const scratch = new Float64Array(wins[0]!.observed.length);
    for (const w of wins) {
      accumulate(acc, normalise(stats, w.observed, scratch));
      const back = denormalise(stats, scratch, new Float64Array(scratch.length));
      for (let i = 0; i < back.length; i += 7) expect(back[i]).toBeCloseTo(w.observed[i]!, 12);
    }
    for (const w of wins) accumulate(acc, normalise(stats, w.future, new Float64Array(w.future.length)));
    const z = finishStats(acc, MOTION_NODES);
    for (let c = 0; c < N * 6; c++) {
      expect(z.mean[c]).toBeCloseTo(0, 9);
      expect(z.sd[c]).toBeCloseTo(1, 9);
    }
  });

  it('survive plain JSON bit for bit', () => {
    const text = JSON.stringify(statsToJson(stats));
    const back = statsFromJson(JSON.parse(text), 'model.json');
    expect(back.nodes).toEqual([...MOTION_NODES]);
    expect(back.count).toBe(stats.count);
    expect(sameBits(back.mean, stats.mean)).toBe(true);
    expect(sameBits(back.sd, stats.sd)).toBe(true);
  });

  it('refuse malformed statistics with an InputError naming the source', () => {
    const good = statsToJson(stats);
    const cases: unknown[] = [
      null,
      { ...good, format: 'other' },
      { ...good, version: 2 },
      { ...good, sd: good.sd.slice(1) },
      { ...good, sd: good.sd.map((x, i) => (i === 4 ? 0 : x)) },
      { ...good, mean: good.mean.map((x, i) => (i === 2 ? 'a' : x)) },
      { ...good, count: 0 },
    ];
    for (const c of cases) {
      expect(() => statsFromJson(c, 'bad-model.json')).toThrow(InputError);
      expect(() => statsFromJson(c, 'bad-model.json')).toThrow(/bad-model\.json/);
    }
  });

  it('are left/right symmetric when mirrored windows are added', () => {
    const sym = statsOfWindows(wins, MOTION_NODES, { nodeMirror: NODE_MIRROR });
    expect(sym.count).toBe(2 * stats.count);
    for (const [l, r] of [['l_hip', 'r_hip'], ['l_ankle', 'r_ankle'], ['l_wrist', 'r_wrist']] as const)
      for (let c = 0; c < 6; c++) {
        const sign = c === 1 || c === 4 ? -1 : 1;
        expect(sym.mean[ix(l) * 6 + c]).toBeCloseTo(sign * sym.mean[ix(r) * 6 + c]!, 12);
        expect(sym.sd[ix(l) * 6 + c]).toBeCloseTo(sym.sd[ix(r) * 6 + c]!, 12);
      }
    // A midline node's lateral mean is zero: each reading meets its reflection.
    expect(sym.mean[ix('head') * 6 + 1]).toBeCloseTo(0, 12);
  });

  it('give SD 1 to a constant feature so that it is centred, not blown up', () => {
    const acc = createAccumulator(1);
    // Hand-made: feature 0 constant 2.5; feature 1 takes 1 and 3 (mean 2, population SD 1).
    accumulate(acc, new Float64Array([2.5, 1, 0, 0, 0, 0, 2.5, 3, 0, 0, 0, 0]));
    const s = finishStats(acc, ['pelvis']);
    expect([s.mean[0], s.sd[0], s.mean[1], s.sd[1]]).toEqual([2.5, 1, 2, 1]);
    expect(normalise(s, new Float64Array([2.5, 3, 0, 0, 0, 0]), new Float64Array(6))[0]).toBe(0);
  });
});
