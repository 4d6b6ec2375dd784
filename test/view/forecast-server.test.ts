// /api/forecast with a tiny model trained here: the shape of the answer, the display frame, the scores,
// 400 for a bad t or sample count, and 404 staying for every unknown path.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { synthesizeTake } from '../../src/synth/index.js';
import { importTake } from '../../src/skeleton/import.js';
import { loadModel } from '../../src/model/modelfile.js';
import { createEvaluator, forecastAt } from '../../src/model/evaluate.js';
import { buildViewData, type ViewData } from '../../src/view/data.js';
import { ForecastService } from '../../src/view/forecast.js';
import { startViewServer, type ViewServer } from '../../src/view/server.js';
import type { ViewFactors, ViewForecast, ViewTake } from '../../src/view/types.js';
import { rawRequest } from './http.js';
import { writeTinyModel } from './tiny-model.js';

const work = mkdtempSync(join(tmpdir(), 'jointloom-view-forecast-'));
const root = join(work, 'site');
const takePath = join(work, 'walker.bvh');
let data: ViewData;
let service: ForecastService;
let server: ViewServer;
let modelPath: string;

beforeAll(async () => {
  mkdirSync(root);
  writeFileSync(join(root, 'index.html'), '<!doctype html><title>t</title>');
  // A 6 s take at 60 Hz of an invented subject (180 steps at the model's 30 Hz).
  writeFileSync(takePath, synthesizeTake({ seed: 6161, duration: 6, frameRate: 60 }).bvhText);
  modelPath = await writeTinyModel(work);
  const imported = importTake(takePath);
  data = buildViewData(imported, { version: '0.0.0-test', caution: 'Caution: test build.' });
  service = new ForecastService(imported, loadModel(modelPath), modelPath);
  server = await startViewServer({ staticRoot: root, data, port: 0, forecast: service });
}, 60_000);

afterAll(async () => {
  await server?.close();
  rmSync(work, { recursive: true, force: true });
});

const get = async (path: string) => {
  const r = await rawRequest(server.port, path);
  return { status: r.status, type: String(r.headers['content-type']), body: JSON.parse(r.body.toString('utf8')) as Record<string, unknown> };
};

describe('/api/forecast with a model', () => {
  test('/api/take says the forecast is on and when it may start', async () => {
    const { body } = await get('/api/take');
    const t = body as unknown as ViewTake;
    expect(t.features.forecast).toBe(true);
    expect(t.forecast?.model).toBe('tiny-model.json');
    // 60 observed steps at 30 Hz are 2 s; the last start is the last step, (180 - 1) / 30 s (hand-computed).
    expect(t.forecast?.observeS).toBe(2);
    expect(t.forecast?.horizonS).toBe(1);
    expect(t.forecast?.lastS).toBeCloseTo(179 / 30, 9);
  });

  test('shape: 30 steps x 17 nodes x 3, 8 samples by default, 16 bones, node names and joints', async () => {
    const r = await get('/api/forecast?t=3');
    expect(r.status).toBe(200);
    expect(r.type).toMatch(/^application\/json/);
    const f = r.body as unknown as ViewForecast;
    expect(f.format).toBe('jointloom-view-forecast');
    // t = 3 s at 30 Hz is step 90 (hand-computed).
    expect(f.endStep).toBe(90);
    expect(f.time_s).toBe(3);
    expect(f.steps).toBe(30);
    expect(f.nodes).toHaveLength(17);
    expect(f.nodes[0]).toBe('pelvis');
    // 30 x 17 x 3 = 1530 numbers per pose series (hand-computed).
    expect(f.mean).toHaveLength(1530);
    expect(f.samples).toHaveLength(8);
    for (const s of f.samples) expect(s).toHaveLength(1530);
    expect(f.mean.every(Number.isFinite)).toBe(true);
    // Bones: pelvis-thorax, thorax-head, and per side pelvis-hip, hip-knee, knee-ankle, ankle-toe,
    // thorax-shoulder, shoulder-elbow, elbow-wrist: 2 + 2 x 7 = 16 (hand-counted).
    expect(f.bones).toHaveLength(16);
    const names = (b: [number, number]) => `${f.nodes[b[0]]}-${f.nodes[b[1]]}`;
    expect(f.bones.map(names)).toContain('l_knee-l_ankle');
    expect(f.bones.map(names)).toContain('thorax-r_shoulder');
    const joints = (data.take.joints);
    f.nodeJoints.forEach(([a, b], n) => {
      // A node stands on the joint of its role (or, for a fallback, between two).
      if (a === b) expect(joints[a]!.role).toBe(f.nodes[n]);
    });
  });

  test('the mean is forecastAt\'s, turned to the display frame (x, z, -y) of the canonical Z-up frame', async () => {
    const f = (await get('/api/forecast?t=3&samples=4')).body as unknown as ViewForecast;
    const ref = forecastAt(service.track, 90, createEvaluator({ model: loadModel(modelPath).model }, 4));
    // three.js is Y up; canonical Z up to Y up maps (x, y, z) to (x, z, -y) (DEVELOPERS.md, the viewer).
    for (let i = 0; i < ref.result.mean.length; i += 3) {
      expect(f.mean[i]).toBeCloseTo(ref.result.mean[i]!, 3);
      expect(f.mean[i + 1]).toBeCloseTo(ref.result.mean[i + 2]!, 3);
      expect(f.mean[i + 2]).toBeCloseTo(-ref.result.mean[i + 1]!, 3);
    }
    expect(f.samples).toHaveLength(4);
  });

  test('the first forecast step lies near the recorded pose 1/30 s later in /api/positions', async () => {
    const f = (await get('/api/forecast?t=3')).body as unknown as ViewForecast;
    const J = data.take.joints.length;
    const pos = new Float32Array(data.positions.buffer.slice(data.positions.byteOffset, data.positions.byteOffset + data.positions.byteLength));
    // 3 s + 1/30 s at 60 Hz is recorded frame 182, display stride 1 (60 Hz is not decimated).
    const d = 182 / data.take.stride;
    expect(Number.isInteger(d)).toBe(true);
    let worst = 0;
    f.nodeJoints.forEach(([a, b], n) => {
      for (let k = 0; k < 3; k++) {
        const rec = (pos[(d * J + a) * 3 + k]! + pos[(d * J + b) * 3 + k]!) / 2;
        worst = Math.max(worst, Math.abs(f.mean[n * 3 + k]! - rec));
      }
    });
    // Walking at about 1.3 m/s a joint moves about 4 cm in 1/30 s (common practice: adult walking speed
    // 1.2-1.4 m/s); a wrong axis would put the forecast a metre or more away.
    expect(worst).toBeLessThan(0.15);
  });

  test('scores: every method at 0.25, 0.5 and 1 s where the future is recorded; none near the end', async () => {
    const f = (await get('/api/forecast?t=3')).body as unknown as ViewForecast;
    expect(f.scores?.horizons_s).toEqual([0.25, 0.5, 1]);
    for (const m of ['model', 'stride_mean', 'last_stride', 'constant_velocity', 'zero_motion']) {
      expect(f.scores!.mpjpe_mm[m]).toHaveLength(3);
      for (const v of f.scores!.mpjpe_mm[m]!) expect(v).toBeGreaterThanOrEqual(0);
    }
    // Standing still while the subject walks at ~1.3 m/s is off by roughly a metre after 1 s (common practice).
    expect(f.scores!.mpjpe_mm.zero_motion![2]).toBeGreaterThan(500);
    // t = 5.5 s is step 165; 165 + 30 reaches past the last step 179 (hand-computed).
    const late = (await get('/api/forecast?t=5.5')).body as unknown as ViewForecast;
    expect(late.endStep).toBe(165);
    expect(late.scores).toBeNull();
  });

  for (const q of ['', '?t=', '?t=abc', '?t=1', '?t=1.98', '?t=-3', '?t=6.5', '?t=100', '?t=3&samples=0', '?t=3&samples=1', '?t=3&samples=33', '?t=3&samples=2.5', '?t=3&samples=x'])
    test(`a bad query ${JSON.stringify(q)} is 400 with a JSON error`, async () => {
      const r = await get(`/api/forecast${q}`);
      expect(r.status).toBe(400);
      expect(r.type).toMatch(/^application\/json/);
      expect(typeof r.body.error).toBe('string');
    });

  test('t = 2 s (exactly 2 s observed) and 32 samples are allowed', async () => {
    const r = await get('/api/forecast?t=2&samples=32');
    expect(r.status).toBe(200);
    expect((r.body as unknown as ViewForecast).samples).toHaveLength(32);
  });

  test('a repeated request is answered from the cache with the same bytes', async () => {
    const a = await rawRequest(server.port, '/api/forecast?t=4&samples=3');
    const b = await rawRequest(server.port, '/api/forecast?t=4.01&samples=3');
    expect(a.status).toBe(200);
    // 4 s and 4.01 s both round to step 120 on the 30 Hz grid (hand-computed).
    expect(b.body.equals(a.body)).toBe(true);
  });

  for (const path of ['/api/nope', '/api/forecast/x', '/nope'])
    test(`unknown path ${path} stays 404`, async () => {
      expect((await rawRequest(server.port, path)).status).toBe(404);
    });
});

describe('/api/factors with a model', () => {
  test('/api/take offers the factors; the heat has every unordered node pair and one value per window', async () => {
    const t = (await get('/api/take')).body as unknown as ViewTake;
    expect(t.features.factors).toBe(true);
    const r = await get('/api/factors');
    expect(r.status).toBe(200);
    const f = r.body as unknown as ViewFactors;
    expect(f.format).toBe('jointloom-view-factors');
    // 17 nodes give 17 · 16 / 2 = 136 unordered pairs (hand-computed).
    expect(f.pairs).toHaveLength(136);
    // Windows end every 6 steps (0.2 s) from step 60 (2 s observed) to the last, 179: steps 60 … 174, 20 windows.
    expect(f.times[0]).toBe(2);
    expect(f.times[19]).toBeCloseTo(5.8, 4);
    expect(f.times).toHaveLength(20);
    for (const p of f.pairs) {
      expect(p.dynamic).toHaveLength(20);
      expect(p.static).toBeGreaterThanOrEqual(f.staticRange[0]);
      expect(p.static).toBeLessThanOrEqual(f.staticRange[1]);
      expect(p.label).toMatch(/^[a-z_]+–[a-z_]+$/);
    }
    // KL divergences are never negative.
    expect(f.staticRange[0]).toBeGreaterThanOrEqual(0);
    // The tiny model holds no normative coupling figures.
    expect(f.asymmetry).toBeNull();
  });
});
