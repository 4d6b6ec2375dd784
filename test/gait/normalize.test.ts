// Time normalisation and per-cycle scalars against hand-computed values and simple-statistics.
import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors/index.js';
import { CYCLE_SAMPLES, cyclesFromContacts, meanSd, normaliseCycles, peakInSwing, rangeOfMotion, sampleAt } from '../../src/gait/normalize.js';

describe('normaliseCycles', () => {
  it('interpolates linearly between frames', () => {
    // Series 0, 10, 20, 30, 40 (a straight line): a cycle from frame 0 to 4 in 5 samples gives the frames back;
    // from 0.5 to 2.5 in 3 samples it gives 5, 15, 25 (halfway between neighbours, by hand).
    const s = [0, 10, 20, 30, 40];
    expect(Array.from(normaliseCycles(s, [{ start: 0, end: 4 }], 5).curves)).toEqual([0, 10, 20, 30, 40]);
    const r = normaliseCycles(s, [{ start: 0.5, end: 2.5 }], 3).curves;
    expect(r[0]).toBeCloseTo(5, 12); expect(r[1]).toBeCloseTo(15, 12); expect(r[2]).toBeCloseTo(25, 12);
    // A bent series: 0, 10, 0. Sample at frame 1.25 = 10 + 0.25 × (0 − 10) = 7.5 (by hand).
    expect(sampleAt([0, 10, 0], 1.25)).toBeCloseTo(7.5, 12);
  });
  it('gives 101 samples from 0 to 100 % with the contacts at both ends', () => {
    // 101 samples per cycle (common practice). Series = frame index squared: the 0 % and 100 % samples are the
    // squares of the contact frames, and the 50 % sample of cycle 10..30 is frame 20: 400 (20 is an integer frame).
    const s = Array.from({ length: 50 }, (_, f) => f * f);
    const n = normaliseCycles(s, [{ start: 10, end: 30 }], CYCLE_SAMPLES);
    expect(n.samples).toBe(101);
    expect(n.curves[0]).toBe(100);
    expect(n.curves[50]).toBeCloseTo(400, 9);
    expect(n.curves[100]).toBe(900);
    // Sample 1 sits at frame 10.2: 100 + 0.2 × (121 − 100) = 104.2.
    expect(n.curves[1]).toBeCloseTo(104.2, 9);
  });
  it('gives the per-sample mean and sample SD of the cycles (simple-statistics as reference)', () => {
    const s = Array.from({ length: 200 }, (_, f) => Math.sin(f / 7) * 20 + f * 0.1);
    const cycles = cyclesFromContacts([3, 40, 81, 120, 160]);
    const n = normaliseCycles(s, cycles);
    expect(n.cycles).toBe(4);
    for (const i of [0, 17, 50, 99, 100]) {
      const col = [0, 1, 2, 3].map((k) => n.curves[k * 101 + i]!);
      expect(n.mean[i]).toBeCloseTo(ssMean(col), 10);
      expect(n.sd[i]).toBeCloseTo(sampleStandardDeviation(col), 10);
      expect(n.count[i]).toBe(4);
    }
  });
  it('skips non-finite samples in the mean and SD', () => {
    // Cycle 1 has NaN at its start: the mean of sample 0 is the other cycle's value alone, SD undefined (n = 1).
    const s = [NaN, 1, 2, 3, 4, 5, 6];
    const n = normaliseCycles(s, [{ start: 0, end: 2 }, { start: 2, end: 4 }], 3);
    expect(n.mean[0]).toBe(2);
    expect(n.count[0]).toBe(1);
    expect(n.sd[0]).toBeNaN();
    // Sample 2: frames 2 and 4 → mean 3, SD of (2, 4) = √2 (by hand).
    expect(n.mean[2]).toBe(3);
    expect(n.sd[2]).toBeCloseTo(Math.SQRT2, 12);
  });
  it('raises InputError for a cycle outside the series', () => {
    expect(() => normaliseCycles([1, 2, 3], [{ start: 0, end: 5 }])).toThrow(InputError);
    expect(() => normaliseCycles([1, 2, 3], [{ start: 2, end: 1 }])).toThrow(InputError);
  });
});

describe('per-cycle peaks and ranges', () => {
  const knee = [5, 10, 18, 12, 6, 4, 20, 45, 60, 50, 20, 5, 12];
  it('finds the swing peak after toe-off', () => {
    // Cycle 0..11 with toe-off at frame 5: largest of frames 5..11 is 60 (frame 8); the stance hump of 18 is
    // before toe-off and not counted. A cycle with no toe-off inside gives NaN.
    const p = peakInSwing(knee, [{ start: 0, end: 11 }, { start: 1, end: 4 }], [5]);
    expect(p[0]).toBe(60);
    expect(p[1]).toBeNaN();
  });
  it('gives the range of motion of each cycle', () => {
    // Frames 0..11: max 60, min 4 → 56. Frames 0..4: max 18, min 5 → 13 (by hand).
    const r = rangeOfMotion(knee, [{ start: 0, end: 11 }, { start: 0, end: 4 }]);
    expect(Array.from(r)).toEqual([56, 13]);
    expect(rangeOfMotion([1, NaN, 3], [{ start: 0, end: 2 }])[0]).toBeNaN();
  });
  it('summarises per-cycle values (simple-statistics as reference)', () => {
    const xs = [58.2, 59.1, 57.7, 60.3];
    const m = meanSd([...xs, NaN]);
    expect(m.n).toBe(4);
    expect(m.mean).toBeCloseTo(ssMean(xs), 12);
    expect(m.sd).toBeCloseTo(sampleStandardDeviation(xs), 12);
  });
});
