// The viewer's HTTP server: its API on a synthesized take, and that it serves nothing but its own
// files (path traversal, hidden files, symlinks out, unknown paths: 404; foreign Host headers: 403).
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { synthesizeTake } from '../../src/synth/index.js';
import { importTake } from '../../src/skeleton/import.js';
import { buildViewData, type ViewData } from '../../src/view/data.js';
import { startViewServer, type ViewServer } from '../../src/view/server.js';
import type { ViewEvents, ViewGait, ViewPairs, ViewTake } from '../../src/view/types.js';
import { threeWorldPositions } from '../reference/three-fk.js';
import { rawRequest } from './http.js';

const work = mkdtempSync(join(tmpdir(), 'jointloom-view-server-'));
const root = join(work, 'site');
// A 6 s take at 120 Hz, Z up, in metres, from the project's walker.
const synth = synthesizeTake({ seed: 4242, duration: 6, frameRate: 120, upAxis: 'Z', units: 'm' });
const takePath = join(work, 'walker.bvh');
let data: ViewData;
let server: ViewServer;

beforeAll(async () => {
  mkdirSync(join(root, 'assets'), { recursive: true });
  writeFileSync(join(root, 'index.html'), '<!doctype html><title>t</title>');
  writeFileSync(join(root, 'assets', 'app.js'), 'export {};');
  writeFileSync(join(root, '.hidden.txt'), 'hidden');
  writeFileSync(join(work, 'secret.txt'), 'outside the root');
  writeFileSync(join(work, 'secret.js'), 'outside the root');
  symlinkSync(join(work, 'secret.js'), join(root, 'assets', 'link.js'));
  writeFileSync(takePath, synth.bvhText);
  data = buildViewData(importTake(takePath), { version: '0.0.0-test', caution: 'Caution: test build.' });
  server = await startViewServer({ staticRoot: root, data, port: 0 });
});

afterAll(async () => {
  await server?.close();
  rmSync(work, { recursive: true, force: true });
});

const json = async <T>(path: string): Promise<T> => {
  const r = await rawRequest(server.port, path);
  expect(r.status).toBe(200);
  expect(String(r.headers['content-type'])).toMatch(/^application\/json/);
  return JSON.parse(r.body.toString('utf8')) as T;
};

describe('listening', () => {
  test('binds 127.0.0.1 on a free port and prints-ready URL', () => {
    expect(server.url).toBe(`http://127.0.0.1:${server.port}/`);
    expect(server.port).toBeGreaterThan(0);
    const addr = server.server.address();
    expect(typeof addr === 'object' && addr?.address).toBe('127.0.0.1');
  });
});

describe('API', () => {
  test('/api/take: rates and sizes (hand-computed: 120 Hz over 60 Hz gives stride 2; 720 frames give 360 shown)', async () => {
    const t = await json<ViewTake>('/api/take');
    expect(t.format).toBe('jointloom-view-take');
    expect(t.sourceFps).toBeCloseTo(120, 6);
    expect(t.sourceFrames).toBe(720);
    expect(t.stride).toBe(2);
    expect(t.displayFps).toBeCloseTo(60, 6);
    expect(t.displayFrames).toBe(360);
    expect(t.durationS).toBeCloseTo(6, 6);
    expect(t.caution).toBe('Caution: test build.');
    expect(t.features).toEqual({ gait: true, pairs: true, forecast: false, factors: false });
    // Without a model the forecast is off: no timing, and /api/forecast is 404 (see the unknown paths below).
    expect(t.forecast).toBeNull();
    expect(t.positions.byteLength).toBe(360 * t.joints.length * 3 * 4);
    expect(t.units).toBe('m');
    expect(t.up).toBe('+z');
  });

  test('/api/take: every joint of a side role chain is on that side; the trunk is centre', async () => {
    const t = await json<ViewTake>('/api/take');
    for (const j of t.joints) {
      if (j.role?.startsWith('l_')) expect(j.side).toBe('left');
      if (j.role?.startsWith('r_')) expect(j.side).toBe('right');
      if (j.role === 'pelvis' || j.role === 'thorax' || j.role === 'head') expect(j.side).toBe('centre');
    }
    const ankle = t.joints.findIndex((j) => j.role === 'l_ankle');
    const below = t.joints.filter((j) => j.parent === ankle);
    expect(below.length).toBeGreaterThan(0);
    for (const j of below) expect(j.side).toBe('left');
  });

  test('/api/positions: equal to three.js BVHLoader positions of every second frame, in metres, Z up turned to Y up', async () => {
    const t = await json<ViewTake>('/api/take');
    const r = await rawRequest(server.port, '/api/positions');
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toBe('application/octet-stream');
    const bytes = new Uint8Array(r.body).slice();
    const got = new Float32Array(bytes.buffer);
    const ref = threeWorldPositions(synth.bvhText);
    const J = t.joints.length;
    expect(ref.names.length).toBe(J);
    let worst = 0;
    for (let d = 0; d < t.displayFrames; d += 7) {
      const f = d * 2;
      for (let j = 0; j < J; j++) {
        const [x, y, z] = [ref.positions[(f * J + j) * 3]!, ref.positions[(f * J + j) * 3 + 1]!, ref.positions[(f * J + j) * 3 + 2]!];
        // Z up to three's Y up, right-handed: (x, y, z) -> (x, z, -y) (hand-derived; determinant +1).
        const o = (d * J + j) * 3;
        worst = Math.max(worst, Math.abs(got[o]! - x), Math.abs(got[o + 1]! - z), Math.abs(got[o + 2]! + y));
      }
    }
    // three's tracks are float32 and so is the display buffer: 1e-4 m is well above both roundings.
    expect(worst).toBeLessThan(1e-4);
    // The floor: the lowest joint height over the take, near 0 for the walker (its floor is at 0).
    expect(Math.abs(t.floorY)).toBeLessThan(0.03);
  });

  test('/api/events and /api/gait: the gait events of `jointloom gait` and its summary', async () => {
    const ev = await json<ViewEvents>('/api/events');
    const gait = await json<ViewGait>('/api/gait');
    expect(gait.available).toBe(true);
    if (!gait.available) return;
    const events = gait.result.events as Record<'left' | 'right', Record<'initial_contact' | 'toe_off', number[]>>;
    for (const side of ['left', 'right'] as const)
      for (const kind of ['initial_contact', 'toe_off'] as const) {
        const times = ev.events.filter((e) => e.side === side && e.kind === kind).map((e) => Math.round(e.time * 1000) / 1000);
        expect(times).toEqual(events[side][kind]);
      }
    // The walker's truth sidecar: every detected contact lies within 2 frames (1/60 s) of a true one.
    const truth = synth.truth.events.left.initialContactTimes;
    for (const e of ev.events.filter((x) => x.side === 'left' && x.kind === 'initial_contact' && x.steady))
      expect(Math.min(...truth.map((t) => Math.abs(t - e.time)))).toBeLessThan(2 / 120 + 1e-9);
    expect(ev.passes.length).toBeGreaterThan(0);
    // 6 s of walking at the walker's default cadence (110 steps/min) is about 5 strides a side.
    expect(gait.result.cadence_steps_per_min as number).toBeGreaterThan(95);
    expect(gait.result.cadence_steps_per_min as number).toBeLessThan(125);
  });

  test('/api/pairs: 17 roles give 136 unordered pairs, each with a finite spread', async () => {
    const p = await json<ViewPairs>('/api/pairs');
    // C(17, 2) = 136 (hand-computed).
    expect(p.pairs.length).toBe(136);
    expect(p.unit).toBe('cm');
    for (const x of p.pairs) expect(Number.isFinite(x.value) && x.value >= 0).toBe(true);
    expect(p.min).toBe(Math.min(...p.pairs.map((x) => x.value)));
  });

  test('HEAD answers with headers only; other methods get 405', async () => {
    const head = await rawRequest(server.port, '/api/take', { method: 'HEAD' });
    expect(head.status).toBe(200);
    expect(head.body.length).toBe(0);
    const post = await rawRequest(server.port, '/api/take', { method: 'POST' });
    expect(post.status).toBe(405);
    expect(post.headers.allow).toBe('GET, HEAD');
  });
});

describe('static files', () => {
  test('/ is index.html with a same-origin-only content security policy', async () => {
    const r = await rawRequest(server.port, '/');
    expect(r.status).toBe(200);
    expect(r.headers['content-type']).toBe('text/html; charset=utf-8');
    expect(r.body.toString()).toContain('<title>t</title>');
    expect(String(r.headers['content-security-policy'])).toContain("default-src 'self'");
    expect(r.headers['x-content-type-options']).toBe('nosniff');
    const js = await rawRequest(server.port, '/assets/app.js?v=1');
    expect(js.status).toBe(200);
    expect(js.headers['content-type']).toBe('text/javascript; charset=utf-8');
  });

  // Each of these names a file outside the root (or a hidden one) in some spelling; all must be 404.
  const attempts = [
    '/../secret.txt', '/assets/../../secret.txt', '/%2e%2e/secret.txt', '/%2E%2E%2Fsecret.txt', '/..%2fsecret.txt',
    '/assets/%2e%2e/%2e%2e/secret.js', '/assets/..%5c..%5csecret.js', '/..\\secret.txt', '//secret.txt', '/assets//app.js',
    '/.hidden.txt', '/%2ehidden.txt', '/assets/link.js', '/index.html%00.js', '/%ff', '/assets/', '/assets',
    '/' + '../'.repeat(12) + 'etc/passwd', '/./index.html',
  ];
  for (const path of attempts)
    test(`traversal ${JSON.stringify(path)} is 404`, async () => {
      const r = await rawRequest(server.port, path);
      expect(r.status).toBe(404);
      expect(r.body.toString()).not.toContain('outside the root');
    });

  test('a request target that is not a path never reaches a file (node:http answers 400)', async () => {
    const r = await rawRequest(server.port, 'secret.txt');
    expect([400, 404]).toContain(r.status);
    expect(r.body.toString()).not.toContain('outside the root');
  });

  for (const path of ['/nope.html', '/nope', '/api', '/api/', '/api/nope', '/api/forecast?t=1', '/api/factors', '/api/take/x', '/assets/missing.js'])
    test(`unknown path ${path} is 404`, async () => {
      expect((await rawRequest(server.port, path)).status).toBe(404);
    });

  test('a Host header that is not a loopback name is refused (403), guarding against DNS rebinding', async () => {
    expect((await rawRequest(server.port, '/api/take', { host: `attacker.example:${server.port}` })).status).toBe(403);
    expect((await rawRequest(server.port, '/api/take', { host: `localhost:${server.port}` })).status).toBe(200);
  });
});

describe('start-up errors', () => {
  test('a folder without index.html is "not built"', async () => {
    await expect(startViewServer({ staticRoot: join(work, 'nothing'), data, port: 0 })).rejects.toThrow(/not built/);
  });
  test('a port in use is an InputError naming it', async () => {
    await expect(startViewServer({ staticRoot: root, data, port: server.port })).rejects.toThrow(`port ${server.port}`);
  });
  test('a non-loopback host is refused before binding', async () => {
    await expect(startViewServer({ staticRoot: root, data, port: 0, host: '0.0.0.0' })).rejects.toThrow(/loopback/);
  });
});
