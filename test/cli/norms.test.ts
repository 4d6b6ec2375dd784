// `jointloom norms build|show` as a user runs them: a reference from a folder of control takes with hashes and
// date in its provenance, refusal of too few strides and of bad files, and `gait --norms` with the built file.
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { synthesizeTake } from '../../src/synth/index.js';
import { runCli } from './run.js';

const tmp = mkdtempSync(join(tmpdir(), 'jointloom-norms-cli-'));
const folder = join(tmp, 'controls');
const out = join(tmp, 'norms.json');
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
beforeAll(() => {
  mkdirSync(folder);
  for (const seed of [7701, 7702]) writeFileSync(join(folder, `c${seed}.bvh`), synthesizeTake({ seed, duration: 14 }).bvhText);
  writeFileSync(join(folder, 'notes.txt'), 'not a take');
  writeFileSync(join(tmp, 'short.bvh'), synthesizeTake({ seed: 7703, duration: 6 }).bvhText);
});

describe('norms build', () => {
  it('builds from a folder: provenance with every take, its SHA-256, the version and the given date', async () => {
    const r = await runCli(['norms', 'build', folder, '-o', out, '--speed-bands', '--date', '2031-02-03']);
    expect(r.code).toBe(0);
    const n = JSON.parse(readFileSync(out, 'utf8'));
    expect(n.format).toBe('jointloom-norms');
    expect(n.version).toBe(1);
    expect(n.provenance.takes.map((t: { file: string }) => t.file)).toEqual([join(folder, 'c7701.bvh'), join(folder, 'c7702.bvh')]);
    for (const t of n.provenance.takes) expect(t.sha256).toBe(createHash('sha256').update(readFileSync(t.file)).digest('hex'));
    expect(n.provenance).toMatchObject({ synthetic: false, label: null, date: '2031-02-03', tool: 'jointloom' });
    expect(n.bands.all.curves.knee_flexion.mean).toHaveLength(101);
    // Two takes hold fewer than 90 strides: no deviation model, said on stderr; slow and fast bands left out.
    expect(n.bands.all.deviation).toBeNull();
    expect(r.stderr).toMatch(/note: band all: no deviation index: \d+ complete strides, fewer than the 90/);
    expect(r.stderr).toMatch(/speed band slow left out/);
    expect(r.stdout).toMatch(/2 control takes/);
  });

  it('records today\'s date when none is given; --json prints what show --json prints, with the notes', async () => {
    const f = join(tmp, 'today.json');
    const r = await runCli(['norms', 'build', folder, '-o', f, '--json', '--speed-bands']);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(readFileSync(f, 'utf8')).provenance.date).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    const built = JSON.parse(r.stdout);
    const shown = JSON.parse((await runCli(['norms', 'show', f, '--json'])).stdout);
    expect(built.out).toBe(f);
    expect({ provenance: built.provenance, bands: built.bands, skipped_bands: built.skipped_bands }).toEqual({ provenance: shown.provenance, bands: shown.bands, skipped_bands: shown.skipped_bands });
    expect(built.notes.some((n: string) => /speed band slow left out/.test(n))).toBe(true);
    expect(r.stderr).not.toMatch(/note:/);
  });

  it('refuses too few strides with one line and exit 1, writing nothing', async () => {
    const f = join(tmp, 'never.json');
    const r = await runCli(['norms', 'build', join(tmp, 'short.bvh'), '-o', f]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/only \d+ strides .* at least 20 for the profile score/);
    expect(() => readFileSync(f)).toThrow();
  });

  it('usage errors: no -o, a bad date', async () => {
    expect((await runCli(['norms', 'build', folder])).code).toBe(2);
    expect((await runCli(['norms', 'build', folder, '-o', join(tmp, 'x.json'), '--date', '3 May'])).code).toBe(2);
  });
});

describe('norms show and gait --norms', () => {
  it('shows a summary and its JSON', async () => {
    const r = await runCli(['norms', 'show', out]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/2 control takes/);
    expect(r.stdout).toMatch(/self-selected \(0\.35 to 0\.55\)/);
    const j = JSON.parse((await runCli(['norms', 'show', out, '--json'])).stdout);
    expect(j.provenance.takes).toHaveLength(2);
  });

  it('gait --norms uses the built file: not labelled synthetic, no deviation index with the reason', async () => {
    const take = join(folder, 'c7701.bvh');
    const r = await runCli(['gait', take, '--json', '--norms', out]);
    expect(r.code).toBe(0);
    const n = JSON.parse(r.stdout).norms;
    expect(n.reference).toMatchObject({ file: out, synthetic: false, label: null, band: 'self_selected' });
    expect(n.gdi).toBeNull();
    expect(n.gdi_note).toMatch(/fewer than the 90/);
    expect(n.gps.overall).toBeGreaterThan(0);
    expect(n.gps.mcid_deg).toBe(1.6);
  });

  it('a corrupt or foreign norms file: one line, exit 1', async () => {
    const bad = join(tmp, 'bad.json');
    writeFileSync(bad, '{"format": "something-else", "version": 1}');
    const r = await runCli(['gait', join(folder, 'c7701.bvh'), '--norms', bad]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/bad\.json: not a valid norms file: "format" is "something-else"/);
    writeFileSync(bad, 'not json');
    expect((await runCli(['norms', 'show', bad])).stderr).toMatch(/the JSON does not parse/);
  });
});
