// Per-take factor summaries: the gait-cycle fraction from contact times (hand-computed), the binning of
// a dynamic series over the cycle on a hand-built summary, and takeFactors on a synthesized take with
// the shipped model (shapes, window times, the SD between windows, causality of each window).
import { describe, expect, it } from 'vitest';
import { cycleFraction, dynamicOverCycle, takeFactors, type TakeFactors } from '../../src/analysis/factors.js';
import { defaultModelPath } from '../../src/model/default-model.js';
import { loadModel } from '../../src/model/modelfile.js';
import { DEFAULT_PAIRS, MOTION_NODES, pairIndex } from '../../src/motion/roles.js';
import { mirrorTrack } from '../../src/motion/mirror.js';
import type { Track } from '../../src/motion/track.js';
import { synthTrainingTake } from '../model/takes.js';

describe('cycleFraction', () => {
  it('is the share of the current cycle, and unknown outside a cycle or over a pause', () => {
    const c = [1.0, 2.0, 3.2, 6.0];
    expect(cycleFraction(c, 1.5)).toBeCloseTo(0.5, 12);
    expect(cycleFraction(c, 2.3)).toBeCloseTo(0.25, 12); // 0.3 s into a 1.2-s cycle
    expect(cycleFraction(c, 0.5)).toBeNaN();
    expect(cycleFraction(c, 4.0)).toBeNaN(); // the 2.8-s gap is not a stride
    expect(cycleFraction(c, 6.5)).toBeNaN(); // after the last contact
  });
});

describe('dynamicOverCycle', () => {
  it('averages each pair series per bin of the cycle of its own side', () => {
    const P = DEFAULT_PAIRS.count, D = 2, n = 8;
    // Windows at 1.0, 1.25, … 2.75 s; left cycle 1-2 s and 2-3 s, right cycle 1.5-2.5 s only.
    const times = Float64Array.from({ length: n }, (_, w) => 1 + 0.25 * w);
    const dynamicSeries = new Float64Array(n * P * D);
    for (let w = 0; w < n; w++) for (let p = 0; p < P; p++) { dynamicSeries[(w * P + p) * D] = w; dynamicSeries[(w * P + p) * D + 1] = -w; }
    const f: TakeFactors = {
      pairs: P, staticDims: 1, dynamicDims: D, windowEnds: Array.from(times, (t) => Math.round(t * 30)), times,
      staticPerWindow: new Float64Array(n * P), staticMean: new Float64Array(P), staticSd: new Float64Array(P), staticPosteriorSd: new Float64Array(P), dynamicSeries, mirrorAveraged: false,
    };
    const r = dynamicOverCycle(f, { left: [1, 2, 3], right: [1.5, 2.5] }, 4);
    const left = pairIndex(MOTION_NODES.indexOf('l_hip'), MOTION_NODES.indexOf('l_knee'));
    const right = pairIndex(MOTION_NODES.indexOf('r_hip'), MOTION_NODES.indexOf('r_knee'));
    // Left cycle bins of 25 %: bin 0 holds the windows at 1.0 and 2.0 s (w = 0 and 4): mean 2 (hand-computed).
    expect(r.mean[(0 * P + left) * D]).toBeCloseTo(2, 12);
    expect(r.mean[(0 * P + left) * D + 1]).toBeCloseTo(-2, 12);
    expect(r.count[0 * P + left]).toBe(2);
    // Right cycle 1.5-2.5 s: bin 0 holds only the window at 1.5 s (w = 2); bin 3 only 2.25 s (w = 5).
    expect(r.mean[(0 * P + right) * D]).toBeCloseTo(2, 12);
    expect(r.count[0 * P + right]).toBe(1);
    expect(r.mean[(3 * P + right) * D]).toBeCloseTo(5, 12);
  });
});

describe('takeFactors with the shipped model', () => {
  const model = loadModel(defaultModelPath()).model;
  const take = synthTrainingTake(31, 10).track;
  it('reads a window every 0.5 s from the 2 s observed part, every pair and dimension', () => {
    const f = takeFactors(model, take);
    // 10 s at 30 Hz are 300 steps; window ends 60, 75, … 285 (15 steps apart): 16 windows (hand-computed).
    expect(f.windowEnds).toHaveLength(16);
    expect(f.times[0]).toBe(2);
    expect(f.staticMean).toHaveLength(272 * model.config.staticDims);
    expect(f.dynamicSeries).toHaveLength(16 * 272 * model.config.dynamicDims);
    for (const v of f.staticSd) expect(v).toBeGreaterThanOrEqual(0);
    for (const v of f.staticPosteriorSd) expect(v).toBeGreaterThan(0);
  });
  it('reads each window from its own past only: a take cut after a window gives it the same factors', () => {
    const f = takeFactors(model, take);
    const end = f.windowEnds[5]!;
    const cut: Track = { ...take, steps: end + 1, positions: take.positions.slice(0, (end + 1) * take.nodeCount * 3) };
    const g = takeFactors(model, cut);
    const PS = 272 * model.config.staticDims;
    expect(Array.from(g.staticPerWindow.subarray(5 * PS, 6 * PS))).toEqual(Array.from(f.staticPerWindow.subarray(5 * PS, 6 * PS)));
  });
  it('mirror averaging: the mirror image gets every pair\'s factors of its mirror, bit for bit; raw readings do not', () => {
    const f = takeFactors(model, take), g = takeFactors(model, mirrorTrack(take));
    const S = model.config.staticDims;
    let rawWorst = 0;
    for (let p = 0; p < 272; p++)
      for (let d = 0; d < S; d++) expect(g.staticMean[DEFAULT_PAIRS.mirror[p]! * S + d]).toBe(f.staticMean[p * S + d]);
    // Without averaging the encoder's own left/right bias shows (measured: differences of a few hundredths).
    const fr = takeFactors(model, take, { mirrorAverage: false }), gr = takeFactors(model, mirrorTrack(take), { mirrorAverage: false });
    for (let p = 0; p < 272; p++) for (let d = 0; d < S; d++) rawWorst = Math.max(rawWorst, Math.abs(gr.staticMean[DEFAULT_PAIRS.mirror[p]! * S + d]! - fr.staticMean[p * S + d]!));
    expect(rawWorst).toBeGreaterThan(1e-6);
    expect(f.mirrorAveraged).toBe(true);
    expect(fr.mirrorAveraged).toBe(false);
  });
});
