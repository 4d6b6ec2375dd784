// `jointloom couplings`: the JSON shape the issue names (pairs with role names, classic measures,
// asymmetry with ranked couples and intervals), the HTML report with its caution and sections, and
// one-line errors for a missing take or a corrupt model.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from './run.js';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
// S02-1 of the fictional clinic: a stiffer right knee (demo-takes/S02-1-walk.json).
const TAKE = join(ROOT, 'demo-takes', 'S02-1-walk.bvh');
const work = mkdtempSync(join(tmpdir(), 'jointloom-couplings-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('jointloom couplings', () => {
  it('prints pairs named by role, the classic measures and the ranked asymmetry as JSON', async () => {
    const r = await runCli(['couplings', TAKE, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    // 17 nodes: 17 · 16 = 272 ordered pairs (hand-computed), four static dimensions each (the default model).
    expect(j.pairs).toHaveLength(272);
    expect(j.pairs[0]).toMatchObject({ a: 'pelvis', b: 'thorax' });
    expect(j.pairs[0].static_mean).toHaveLength(4);
    expect(j.pairs[0].static_sd).toHaveLength(4);
    // A straight walk lies in the model's straight-walking domain (src/model/domain.ts).
    expect(j.domain.straight_walking).toBe(true);
    expect(j.domain.stride_mean_1s_mm).toBeLessThan(100);
    expect(j.classic.pairs.map((p: { name: string }) => p.name)).toEqual(expect.arrayContaining(['hip-knee', 'knee-ankle', 'arm-leg']));
    const a = j.asymmetry;
    expect(['left', 'right']).toContain(a.side);
    expect(['hip', 'knee', 'ankle', 'shoulder/arm']).toContain(a.joint);
    // A stiff knee fits a joint class best, so no side-only pattern is named.
    expect(a.pattern).toBeNull();
    // Every mirror couple once: (272 − 6 midline pairs) / 2 = 133.
    expect(a.ranked).toHaveLength(133);
    for (const x of a.ranked.slice(0, 10)) {
      expect(x.pair).toMatch(/^[a-z_]+→[a-z_]+$/);
      expect(x.ci_low).toBeLessThanOrEqual(x.ci_high);
    }
    expect(a.ranked[0].score).toBeGreaterThanOrEqual(a.ranked[1].score);
    expect(a.summary).toMatch(/Coupling asymmetry/);
    // The shipped model holds a joint discriminant, so the take score is its evidence, with the controls' percentiles beside it.
    expect(a.score_kind).toBe('discriminant evidence');
    expect(a.ci_low).toBeLessThanOrEqual(a.ci_high);
    expect(a.control_p50).toBeLessThan(a.control_p90);
    expect(a.distance).toBeGreaterThan(0);
    expect(j.dynamic_over_cycle.bins).toBe(20);
    expect(j.caution).toMatch(/not a diagnostic device/);
  });

  it('writes the HTML report with the caution, the heat matrix and the ranked table', async () => {
    const html = join(work, 'couplings.html');
    const r = await runCli(['couplings', TAKE, '--html', html]);
    expect(r.code, r.stderr).toBe(0);
    const text = readFileSync(html, 'utf8');
    expect(text).toContain('not a diagnostic device');
    expect(text).toContain('Static coupling, sender (row) → receiver (column)');
    expect(text).toContain('Gait-phase factors of');
    expect(text).toContain('Continuous relative phase, hip-knee');
    expect(text).toContain('side farther from the cohort');
    // The filter behind the classic measures is stated, as in the gait report (6 Hz: the gait analysis's default).
    expect(text).toMatch(/<dt>Low-pass filter<\/dt><dd>6 Hz, zero-lag fourth-order Butterworth/);
    // Self-contained: no external resource.
    expect(text).not.toMatch(/(src|href)="https?:/);
  });

  it('names a side-only pattern when it fits best: S03-1 walks with a shorter left stance and step', async () => {
    // demo-takes/S03-1-walk.json: shorter stance and step on the left, with a trunk lean (the demo's own synthesizer).
    // Tied to the shipped model's discriminant: a refit may rank a joint class first, and then this needs another take.
    const take = join(ROOT, 'demo-takes', 'S03-1-walk.bvh'), html = join(work, 's03.html');
    const r = await runCli(['couplings', take, '--json', '--html', html]);
    expect(r.code, r.stderr).toBe(0);
    const a = JSON.parse(r.stdout).asymmetry;
    expect(a.side).toBe('left');
    expect(a.pattern).toBe('a shorter stance');
    expect(a.summary).toContain('most like a shorter stance on that side');
    expect(readFileSync(html, 'utf8')).toContain('The best-fitting class is one of no single joint, a shorter stance');
  });

  it('--help carries the caution once', async () => {
    const r = await runCli(['couplings', '--help']);
    expect(r.stdout.split('not a diagnostic device').length - 1).toBe(1);
  });

  it('refuses a corrupt model with one line naming the file', async () => {
    const bad = join(work, 'bad.json');
    writeFileSync(bad, '{"format":');
    const r = await runCli(['couplings', TAKE, '--model', bad]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain(bad);
  });
});
