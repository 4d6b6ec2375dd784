// The forecast spread per window (src/model/spread.ts, calibrate.ts): the backcast error of a window's
// history against hand-built signals, the factor's clipping and powers by hand, the interval-score choice
// of the exponent, coverage of forecasts made with the calibrated spread, and the model file keeping it.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { calibrateSpread } from '../../src/model/calibrate.js';
import { modelWindowOptions, resolveModelConfig } from '../../src/model/config.js';
import { forecast } from '../../src/model/forecast.js';
import { bandCoverage } from '../../src/model/metrics.js';
import { createModel } from '../../src/model/model.js';
import { loadModel, saveModel } from '../../src/model/modelfile.js';
import { backcastError, spreadFactor } from '../../src/model/spread.js';
import { statsOfTakes } from '../../src/model/train.js';
import { windowsOf } from '../../src/motion/window.js';
import { SMALL, synthTrainingTake } from './takes.js';

const dir = mkdtempSync(join(tmpdir(), 'jointloom-spread-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Returns a window history (H × N × 6) whose positions are periodic with period 30 steps plus steady travel in x. */
function periodicHistory(N: number, H: number, offsetFrom = Infinity, offset = 0): Float64Array {
  const out = new Float64Array(H * N * 6);
  for (let t = 0; t < H; t++)
    for (let n = 0; n < N; n++) {
      const o = (t * N + n) * 6, ph = (2 * Math.PI * t) / 30 + n;
      out[o] = 0.04 * t + (n ? 0.1 * Math.sin(ph) : 0);
      out[o + 1] = n ? 0.05 * Math.cos(ph) : 0;
      out[o + 2] = (n ? 0.2 * Math.sin(2 * ph) : 0) + (t >= offsetFrom ? offset : 0);
    }
  return out;
}

describe('backcast error', () => {
  const c = resolveModelConfig({ nodes: 5 });
  const H = c.priorHistory, F = c.forecast;

  it('is near zero for a walk that repeats its stride exactly (the stride mean forecasts it)', () => {
    // Not exactly zero: the period is refined by a parabola and the lag blends neighbouring steps, on
    // swings of 0.1-0.2; 1e-3 is 1 % of them.
    expect(backcastError(c, periodicHistory(5, H), H)).toBeLessThan(1e-3);
  });

  it('equals a lift of every node after the backcast starts (hand-computed: the mean distance is the lift)', () => {
    const lifted = periodicHistory(5, H, H - F, 0.03);
    expect(backcastError(c, lifted, H)).toBeCloseTo(0.03, 6);
  });

  it('is NaN for a history too short to hold a stride', () => {
    expect(backcastError(c, periodicHistory(5, F + 1), F + 1)).toBeNaN();
  });
});

describe('spread factor', () => {
  const adapt = { exponent: 0.5, reference: 0.02 };
  it('is (backcast / reference)^exponent with the ratio clipped to [1/4, 4]', () => {
    expect(spreadFactor(adapt, 0.08)).toBeCloseTo(2, 12);
    expect(spreadFactor(adapt, 0.005)).toBeCloseTo(0.5, 12);
    expect(spreadFactor(adapt, 1)).toBeCloseTo(2, 12); // ratio 50 clipped to 4, √4 = 2
    expect(spreadFactor(adapt, 1e-6)).toBeCloseTo(0.5, 12); // clipped to 1/4
  });
  it('is 1 without adaptation, at exponent 0 or without a backcast', () => {
    expect(spreadFactor(null, 0.08)).toBe(1);
    expect(spreadFactor({ exponent: 0, reference: 0.02 }, 0.08)).toBe(1);
    expect(spreadFactor(adapt, NaN)).toBe(1);
  });
});

describe('spread calibration', () => {
  const takes = [31, 32].map((s) => synthTrainingTake(s, 16));
  const c = resolveModelConfig(SMALL);
  const windows = [...windowsOf(takes[1]!.track, 9, modelWindowOptions(c))].filter((w) => w.futureSteps === c.forecast && w.endObservedStep >= c.priorHistory);

  it('gives forecasts whose 90 % band covers about 90 % of the calibration windows\' futures, exponent chosen from the grid', () => {
    const model = createModel(c, statsOfTakes(takes, c), { seed: 3 });
    const k = calibrateSpread(model, windows);
    expect(k).toBeGreaterThan(0);
    expect(model.spreadScale).toBe(k);
    expect([0, 0.25, 0.5, 0.75, 1]).toContain(model.spreadAdapt?.exponent ?? 0);
    // forecast() draws other noise than the calibration, so coverage lands near, not at, 90 %.
    let cover = 0;
    for (const [i, w] of windows.entries()) {
      const f = forecast(model, w, { samples: 20, seed: 100 + i });
      const truth = new Float64Array(f.mean.length);
      const world = w.toWorld(Float64Array.from(w.future), new Float64Array(w.future.length));
      for (let j = 0; j < truth.length / 3; j++) for (let a = 0; a < 3; a++) truth[j * 3 + a] = world[j * 6 + a]!;
      cover += bandCoverage(f.samples, 20, truth, 0.9);
    }
    expect(cover / windows.length).toBeGreaterThan(0.84);
    expect(cover / windows.length).toBeLessThan(0.96);
  });

  it('with the fixed spread only, keeps no adaptation', () => {
    const model = createModel(c, statsOfTakes(takes, c), { seed: 3 });
    calibrateSpread(model, windows, { exponents: [0] });
    expect(model.spreadAdapt).toBeNull();
  });

  it('is kept by the model file, and a bad adaptation block is refused', () => {
    const model = createModel(c, statsOfTakes(takes, c), { seed: 3 });
    model.spreadAdapt = { exponent: 0.75, reference: 0.0123 };
    const path = join(dir, 'adapt.json');
    saveModel(path, model);
    expect(loadModel(path).model.spreadAdapt).toEqual({ exponent: 0.75, reference: 0.0123 });
    model.spreadAdapt = { exponent: 0.75, reference: -1 };
    saveModel(path, model);
    expect(() => loadModel(path)).toThrow(/spreadAdapt/);
  });
});
