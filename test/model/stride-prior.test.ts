// The stride prior: with the learned change of state switched off (last decoder layer zero) a model with
// `stridePrior` forecasts exactly the phase-aligned stride-mean baseline of baselines.ts run on the
// window's observed positions in the world (the prior steps telescope: x(k) = x(0) + Σ prior steps =
// prior(k)), also from a mirrored window; the batch carries the same steps as worldToFrame of the world
// baseline (rollout and teacher-forced steps); a take cut right after the observed part gives the same
// forecast bit for bit; and the option is the default without changing configurations stored before it.
import { describe, expect, it } from 'vitest';
import { registeredStrideForecast, strideForecast } from '../../src/model/baselines.js';
import { BatchBuilder, type TrainingTake } from '../../src/model/batch.js';
import { modelWindowOptions, resolveModelConfig } from '../../src/model/config.js';
import { forecast } from '../../src/model/forecast.js';
import { createModel, type CouplingModel } from '../../src/model/model.js';
import { statsOfTakes } from '../../src/model/train.js';
import { worldToFrame } from '../../src/motion/frame.js';
import { mirrorWindow } from '../../src/motion/mirror.js';
import { mirrorState } from '../../src/motion/reflect.js';
import { normalise } from '../../src/motion/normalise.js';
import type { Track } from '../../src/motion/track.js';
import { makeWindow } from '../../src/motion/window.js';
import { synthTrainingTake } from './takes.js';

const take: TrainingTake = synthTrainingTake(21, 10);
const track = take.track, N = track.nodeCount;
const config = resolveModelConfig({ stridePrior: true });
const T = config.observe, F = config.forecast;

/** Returns a model with the stride prior whose learned change of state is exactly zero. */
function priorOnly(): CouplingModel {
  const model = createModel(config, statsOfTakes([take], config), { seed: 4 });
  model.params.upW2.value.fill(0);
  model.params.upB2.value.fill(0);
  return model;
}

/** Returns the world stride-mean baseline (F × N × 3) from the observed steps e − T + 1 … e only, and its period. */
function worldBaseline(e: number): { out: Float64Array; period: number } {
  const pos = track.positions.slice((e - T + 1) * N * 3, (e + 1) * N * 3), out = new Float64Array(F * N * 3);
  return { out, period: strideForecast(pos, N, track.rate, T - 1, F, 3, out) };
}

describe('stride prior', () => {
  it('makes a model with no learned change forecast the stride-mean baseline of the observed part, mirrored or not', () => {
    const model = priorOnly();
    for (const e of [70, 130, 200]) {
      const { out, period } = worldBaseline(e);
      // A 1.1-1.4 m/s walk strides about every 1-1.2 s (common practice), so a period is found in 2 s.
      expect(period).toBeGreaterThan(0.7 * track.rate);
      expect(period).toBeLessThan(1.4 * track.rate);
      const win = makeWindow(track, e, { observe: T, forecast: F });
      for (const w of [win, mirrorWindow(win, track.nodeMirror)]) {
        const r = forecast(model, w, { samples: 3, seed: 1 });
        let worst = 0;
        for (let i = 0; i < out.length; i++) worst = Math.max(worst, Math.abs(r.mean[i]! - out[i]!));
        // Float32 rollout buffers: 30 steps of rounding at about 1e-7 relative stay far below 0.1 mm.
        expect(worst).toBeLessThan(1e-4);
      }
    }
  });

  it('puts into the batch the baseline turned into the window frame by worldToFrame, normalised, as per-step changes', () => {
    const model = priorOnly(), e = 150;
    const builder = new BatchBuilder(model.config, model.stats, [take], 2, model.store);
    const batch = builder.fill([{ take: 0, end: e, mirrored: false }, { take: 0, end: e, mirrored: true }], [0, 0]);
    const { out } = worldBaseline(e);
    // World state of the baseline: positions and backward-difference velocities (the first from step e).
    const world = new Float64Array(F * N * 6);
    for (let k = 0; k < F; k++)
      for (let n = 0; n < N; n++)
        for (let a = 0; a < 3; a++) {
          const p = out[(k * N + n) * 3 + a]!, prev = k === 0 ? track.positions[(e * N + n) * 3 + a]! : out[((k - 1) * N + n) * 3 + a]!;
          world[(k * N + n) * 6 + a] = p;
          world[(k * N + n) * 6 + 3 + a] = (p - prev) * track.rate;
        }
    const win = makeWindow(track, e, { observe: T, forecast: F });
    const W = N * 6;
    for (const mirrored of [false, true]) {
      const framed = worldToFrame(win.frame, world, new Float64Array(world.length));
      const last = win.observed.slice((T - 1) * W, T * W);
      if (mirrored) { mirrorState(framed, track.nodeMirror, framed); mirrorState(last, track.nodeMirror, last); }
      normalise(model.stats, framed, framed);
      normalise(model.stats, last, last);
      const b = mirrored ? 1 : 0;
      let worst = 0;
      for (let k = 0; k < F; k++)
        for (let i = 0; i < W; i++) {
          const want = framed[k * W + i]! - (k === 0 ? last[i]! : framed[(k - 1) * W + i]!);
          worst = Math.max(worst, Math.abs(batch.prior![(k * 2 + b) * W + i]! - want));
        }
      expect(worst).toBeLessThan(1e-4);
    }
    // Teacher-forced transitions t → t + 1: the one-step baseline from the observed steps up to t only.
    const R = config.reconSteps;
    for (const q of [0, R - 1]) {
      const t = e - R + q; // track step of observed index T − 1 − R + q
      const pos = track.positions.slice((e - T + 1) * N * 3, (t + 1) * N * 3), one = new Float64Array(N * 3);
      strideForecast(pos, N, track.rate, t - (e - T + 1), 1, 3, one);
      const w1 = new Float64Array(W);
      for (let n = 0; n < N; n++)
        for (let a = 0; a < 3; a++) {
          w1[n * 6 + a] = one[n * 3 + a]!;
          w1[n * 6 + 3 + a] = (one[n * 3 + a]! - track.positions[(t * N + n) * 3 + a]!) * track.rate;
        }
      const framed = normalise(model.stats, worldToFrame(win.frame, w1, w1), w1);
      const cur = normalise(model.stats, win.observed.slice((T - 1 - R + q) * W, (T - R + q) * W), new Float64Array(W));
      let worst = 0;
      for (let i = 0; i < W; i++) worst = Math.max(worst, Math.abs(batch.priorRecon![(q * 2) * W + i]! - (framed[i]! - cur[i]!)));
      expect(worst).toBeLessThan(1e-4);
    }
  });

  it('with the default configuration forecasts the registered stride mean of the 5-s history, mirrored or not', () => {
    // The default: priorHistory 150 steps and priorRegistration on; the prior reads steps e − 149 … e.
    const c = resolveModelConfig({});
    const longTake = synthTrainingTake(22, 16);
    const tr = longTake.track, n = tr.nodeCount;
    const model = createModel(c, statsOfTakes([longTake], c), { seed: 4 });
    model.params.upW2.value.fill(0);
    model.params.upB2.value.fill(0);
    for (const e of [200, 320]) {
      const pos = tr.positions.slice((e - 149) * n * 3, (e + 1) * n * 3), want = new Float64Array(c.forecast * n * 3);
      registeredStrideForecast(pos, n, tr.rate, 149, c.forecast, 3, want);
      const win = makeWindow(tr, e, modelWindowOptions(c));
      expect(win.historySteps).toBe(150);
      for (const w of [win, mirrorWindow(win, tr.nodeMirror)]) {
        const r = forecast(model, w, { samples: 2, seed: 1 });
        let worst = 0;
        for (let i = 0; i < want.length; i++) worst = Math.max(worst, Math.abs(r.mean[i]! - want[i]!));
        expect(worst).toBeLessThan(1e-4);
      }
    }
    // Older files: a stored stride prior without the newer fields reads only the observed part, unregistered.
    const old = resolveModelConfig({ stridePrior: true });
    expect(old.priorHistory).toBe(old.observe);
    expect(old.priorRegistration).toBe(false);
  });

  it('reads nothing after the observed part: a take cut right after it gives the same forecast bit for bit', () => {
    const model = createModel(config, statsOfTakes([take], config), { seed: 4 });
    const e = 120, o = { observe: T, forecast: F };
    const cut: Track = { ...track, steps: e + 1, positions: track.positions.slice(0, (e + 1) * N * 3) };
    const a = forecast(model, makeWindow(track, e, o), { samples: 4, seed: 5 });
    const b = forecast(model, makeWindow(cut, e, o), { samples: 4, seed: 5 });
    expect(Array.from(b.samples)).toEqual(Array.from(a.samples));
    const again = forecast(model, makeWindow(track, e, o), { samples: 4, seed: 5 });
    expect(Array.from(again.samples)).toEqual(Array.from(a.samples));
  });

  it('is on by default, while a stored configuration from before it (naming kinematic only) keeps the kinematic step', () => {
    expect(resolveModelConfig({}).stridePrior).toBe(true);
    expect(resolveModelConfig({ kinematic: true }).stridePrior).toBe(false);
    expect(resolveModelConfig({ kinematic: true, stridePrior: true }).stridePrior).toBe(true);
    // Starting exactly at the baseline: the learned change's last layer is zero with the prior, small otherwise.
    const stats = statsOfTakes([take], config);
    expect(createModel({}, stats).params.upW2.value.every((v) => v === 0)).toBe(true);
    expect(createModel({ stridePrior: false }, stats).params.upW2.value.some((v) => v !== 0)).toBe(true);
  });
});
