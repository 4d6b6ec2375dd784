// The forecast stage of scoring: with a model it writes the surprise timeline of the take (one forecast
// every 0.3 s where the recorded future second exists), the 1-s errors of the model and the stride-mean
// baseline and the irregular steps; without a model it writes nulls and does not mark the model used.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SHIPPED_NORMS } from '../../src/cli/gait.js';
import { scoreTake, type ScoreOptions } from '../../src/score/compose.js';
import { FORECAST_STAGE } from '../../src/score/forecast-stage.js';
import { GAIT_STAGE } from '../../src/score/stages.js';
import { irregularEpisodes } from '../../src/model/evaluate.js';
import { synthesizeTake } from '../../src/synth/index.js';
import { writeTinyModel } from '../view/tiny-model.js';

const work = mkdtempSync(join(tmpdir(), 'jointloom-fstage-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));
let modelPath = '';
beforeAll(async () => { modelPath = await writeTinyModel(work); });

const base: ScoreOptions = {
  tool: 'jointloom', toolVersion: '0.0.0-test', lowpassHz: 6, steadyOnly: true,
  normsFile: SHIPPED_NORMS, normsSha256: null, model: { file: null, file_sha256: null, used: false },
};
// 14 s at 60 Hz of an invented walker with a stumble at 9 s (src/synth stumble option).
const bytes = Buffer.from(synthesizeTake({ seed: 6262, duration: 14, frameRate: 60, stumbles: [{ time: 9, side: 'left' }] }).bvhText, 'utf8');

describe('forecast stage', () => {
  it('writes the timeline, errors and irregular steps with a model', () => {
    const r = scoreTake(bytes, 'stumble.bvh', { ...base, model: { file: modelPath, file_sha256: 'x', used: false } }, [GAIT_STAGE, FORECAST_STAGE]);
    const m = r.metrics;
    // The tiny model's prior reads up to 5 s of history, so forecasts start at 5 s (step 150) and run every
    // 0.3 s (9 steps at 30 Hz) while a second of recorded future remains (step + 30 < 420): 5.0, 5.3, ...
    // 12.8 s (27 points).
    expect(m['forecast.forecast_points']).toBe(27);
    expect(m['forecast.mpjpe_1s_mm']).toBeGreaterThan(0);
    expect(m['forecast.stride_mean_1s_mm']).toBeGreaterThan(0);
    expect(m['forecast.coverage_90']).toBeGreaterThanOrEqual(0);
    expect(m['forecast.coverage_90']).toBeLessThanOrEqual(1);
    const detail = r.detail.forecast as { timeline: { time_s: number; irregular: boolean }[] };
    expect(detail.timeline.map((t) => t.time_s)).toEqual(Array.from({ length: 27 }, (_, k) => Math.round((150 + 9 * k) / 30 * 1000) / 1000));
    // The stumble synthesized at 9 s is flagged within 0.5 s of it (the forecast issue's acceptance rule).
    expect(detail.timeline.some((t) => t.irregular && Math.abs(t.time_s - 9) <= 0.5)).toBe(true);
    // Flagged points within 0.5 s of each other are one episode and one flag.
    const episodes = irregularEpisodes(detail.timeline.map((t) => ({ ...t, surprise: 1 })));
    expect(m['forecast.irregular_steps']).toBe(episodes.length);
    expect(m['forecast.irregular_steps']).toBeLessThanOrEqual(detail.timeline.filter((t) => t.irregular).length);
    const flags = r.flags.filter((f) => f.stage === 'forecast');
    expect(flags.length).toBe(m['forecast.irregular_steps']);
    // One episode reaches to within 0.5 s of the stumble, and its flag names where to look.
    const stored = (r.detail.forecast as { episodes: { start_s: number; end_s: number; peak_s: number }[] }).episodes;
    expect(stored).toHaveLength(flags.length);
    const k = stored.findIndex((e) => e.start_s - 0.5 <= 9 && 9 <= e.end_s + 0.5);
    expect(k).toBeGreaterThanOrEqual(0);
    expect(flags[k]!.text).toContain(`irregular motion near ${stored[k]!.start_s.toFixed(1)}`);
    expect(r.provenance.model.used).toBe(true);
  });

  it('writes nulls and leaves the model unused without one', () => {
    const r = scoreTake(bytes, 'stumble.bvh', base, [GAIT_STAGE, FORECAST_STAGE]);
    expect(r.metrics['forecast.forecast_points']).toBeNull();
    expect(r.provenance.model.used).toBe(false);
  });
});
