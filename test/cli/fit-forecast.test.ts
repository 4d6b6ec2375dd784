// fit and forecast as a user runs them: a tiny training run writes a model file with its no-coupling
// twin; forecast scores the model, the twin and every baseline on the recorded future; a corrupt model
// file and an impossible --at are refused with one line; with the shipped model, forecast names the
// pair readout it used (standard or jitter-robust).
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { synthesizeTake } from '../../src/synth/index.js';
import { runCli } from './run.js';

const tmp = mkdtempSync(join(tmpdir(), 'jointloom-fit-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const model = join(tmp, 'model.json');

beforeAll(() => {
  // Three invented subjects, one take each, with session sidecars naming them.
  for (const [i, s] of ['P1', 'P2', 'P3'].entries()) {
    writeFileSync(join(tmp, `${s}.bvh`), synthesizeTake({ seed: 9100 + i, duration: 6, frameRate: 60 }).bvhText);
    writeFileSync(join(tmp, `${s}.json`), JSON.stringify({ subject: s, session: 1 }));
  }
});

describe('fit and forecast commands', () => {
  it('fit trains the model and its twin and writes one model file', async () => {
    const r = await runCli(['fit', join(tmp, 'P1.bvh'), join(tmp, 'P2.bvh'), join(tmp, 'P3.bvh'), '-o', model, '--epochs', '1', '--json']);
    expect(r.code).toBe(0);
    const s = JSON.parse(r.stdout);
    expect(s.subjects).toBe(3);
    expect(s.valid_subjects.length).toBeGreaterThanOrEqual(1);
    expect(s.twin).not.toBeNull();
    // 6-s takes hold no window with the readout's full history: the fit says so and keeps none.
    expect(s.readout.model.kept).toBe(false);
    expect(s.readout.model.dropped).toMatch(/no training window has \d+\.\d s of history/);
    const file = JSON.parse(readFileSync(model, 'utf8'));
    expect(file.format).toBe('jointloom-coupling-model');
    expect(file.extras.no_coupling.config.noCoupling).toBe(true);
    expect(file.readout).toBeUndefined();
  }, 300_000);

  it('fit --no-match-pairing --no-restricted-labeling --take-signature writes the switches into the model file', async () => {
    const ablated = join(tmp, 'ablated.json');
    const r = await runCli(['fit', join(tmp, 'P1.bvh'), join(tmp, 'P2.bvh'), join(tmp, 'P3.bvh'), '-o', ablated, '--epochs', '1', '--no-twin', '--no-match-pairing', '--no-restricted-labeling', '--take-signature', '--json']);
    expect(r.code).toBe(0);
    const s = JSON.parse(r.stdout);
    expect([s.match_pairing, s.restricted_labeling, s.take_signature]).toEqual([false, false, true]);
    const file = JSON.parse(readFileSync(ablated, 'utf8'));
    expect([file.config.matchPairing, file.config.restrictedLabeling, file.config.signatureWeight]).toEqual([false, false, 272]);
    expect(file.layout.map((l: { name: string }) => l.name)).toContain('enc.sig.w');
    // The default fit (the suite's model) leaves the experimental signature term off.
    const full = JSON.parse(readFileSync(model, 'utf8'));
    expect(full.config.signatureWeight).toBe(0);
    expect(full.layout.map((l: { name: string }) => l.name)).not.toContain('enc.sig.w');
  }, 300_000);

  it('forecast --json scores the model, the twin and every baseline at the three horizons', async () => {
    const r = await runCli(['forecast', join(tmp, 'P2.bvh'), '--model', model, '--at', '3', '--samples', '6', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.horizons_s).toEqual([0.25, 0.5, 1]);
    for (const m of ['model', 'constant_velocity', 'zero_motion', 'last_stride', 'stride_mean', 'no_coupling']) {
      expect(Object.keys(j.mpjpe_mm[m])).toEqual(['0.25', '0.5', '1.0']);
      for (const v of Object.values(j.mpjpe_mm[m]) as number[]) expect(Number.isFinite(v)).toBe(true);
    }
    expect(j.coverage_90).toBeGreaterThanOrEqual(0);
    expect(j.coverage_90).toBeLessThanOrEqual(1);
    expect(j.predicted.mean).toHaveLength(30);
    expect(j.predicted.samples).toHaveLength(6);
    expect(j.predicted.nodes).toHaveLength(17);
  }, 120_000);

  it('forecast --every gives a surprise timeline, and with --csv writes it as CSV row for row', async () => {
    const csv = join(tmp, 'timeline.csv');
    const r = await runCli(['forecast', join(tmp, 'P1.bvh'), '--model', model, '--every', '0.5', '--samples', '4', '--json', '--csv', csv]);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.timeline.length).toBeGreaterThanOrEqual(4);
    expect(typeof j.timeline[0].surprise).toBe('number');
    const rows = readFileSync(csv, 'utf8').trim().split('\n');
    expect(rows[0]).toBe('time_s,surprise,mpjpe_1s_mm,irregular');
    expect(rows.slice(1).map((l) => Number(l.split(',')[0]))).toEqual(j.timeline.map((t: { time_s: number }) => t.time_s));
    expect(rows.slice(1).map((l) => l.split(',')[3])).toEqual(j.timeline.map((t: { irregular: boolean }) => (t.irregular ? '1' : '0')));
  }, 120_000);

  it('forecast with the shipped model names the readout: the standard one on a clean capture, the jitter-robust one on a noisy capture', async () => {
    // Same invented walker, 9 s at 100 Hz, without and with 0.6° of jitter on every rotation channel (the demo's noisy capture).
    const walker = { seed: 9200, duration: 9, frameRate: 100 };
    writeFileSync(join(tmp, 'clean.bvh'), synthesizeTake(walker).bvhText);
    writeFileSync(join(tmp, 'noisy.bvh'), synthesizeTake({ ...walker, noise: { rotationDeg: 0.6, positionMm: 1.5 } }).bvhText);
    const run = async (f: string) => JSON.parse((await runCli(['forecast', join(tmp, f), '--at', '7', '--json'])).stdout);
    const clean = await run('clean.bvh'), noisy = await run('noisy.bvh');
    expect(clean.readout).toBe('standard');
    expect(noisy.readout).toBe('jitter-robust');
    expect(noisy.capture_jitter_mll).toBeGreaterThan(clean.capture_jitter_mll);
    const text = await runCli(['forecast', join(tmp, 'noisy.bvh'), '--at', '7']);
    expect(text.stdout).toMatch(/noisy capture: .* jitter-robust pair readout corrected this forecast/);
  });

  it('a corrupt model file and an --at without 2 s observed are refused with one line', async () => {
    const bad = join(tmp, 'bad.json');
    writeFileSync(bad, readFileSync(model, 'utf8').slice(0, 500));
    const a = await runCli(['forecast', join(tmp, 'P1.bvh'), '--model', bad]);
    expect(a.code).toBe(1);
    expect(a.stderr.trim().split('\n')).toHaveLength(1);
    expect(a.stderr).toContain('bad.json');
    const b = await runCli(['forecast', join(tmp, 'P1.bvh'), '--model', model, '--at', '1']);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/outside/);
  }, 120_000);
});
