// The synth command writes a take and its truth that the importer reads back as the walker made them.
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readBvhFile } from '../../src/bvh/parse.js';
import { runCli } from './run.js';

const tmp = mkdtempSync(join(tmpdir(), 'jointloom-synth-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('synth command', () => {
  it('writes a BVH take and a truth sidecar; same seed, same bytes', async () => {
    const a = join(tmp, 'a.bvh'), b = join(tmp, 'b.bvh'), truth = join(tmp, 'a.json');
    const r = await runCli(['synth', '--seed', '5', '--duration', '6', '--fps', '100', '--out', a, '--truth', truth]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/600 frames at 100 Hz/);
    await runCli(['synth', '--seed', '5', '--duration', '6', '--fps', '100', '--out', b, '--quiet']);
    expect(readFileSync(a, 'utf8')).toBe(readFileSync(b, 'utf8'));
    const take = readBvhFile(a);
    expect(take.frameCount).toBe(600);
    const t = JSON.parse(readFileSync(truth, 'utf8'));
    expect(t.options.seed).toBe(5);
  });

  it('names, units and up axis follow the options', async () => {
    const out = join(tmp, 'z.bvh');
    await runCli(['synth', '--seed', '3', '--duration', '4', '--units', 'm', '--up', 'Z', '--naming', 'snake', '--out', out, '--quiet']);
    const j = JSON.parse((await runCli(['inspect', out, '--json'])).stdout);
    expect(j.units).toBe('m');
    expect(j.up).toBe('z');
    expect(j.roles.l_knee).toBe('l_knee');
  });

  it('bad options are usage errors (exit 2), nothing written', async () => {
    const out = join(tmp, 'never.bvh');
    expect((await runCli(['synth', '--out', out])).code).toBe(2);
    expect((await runCli(['synth', '--seed', '1', '--units', 'parsecs', '--out', out])).code).toBe(2);
    expect((await runCli(['synth', '--seed', '1', '--impair-left', 'knee=abc', '--out', out])).code).toBe(2);
    expect(() => readFileSync(out)).toThrow();
  });
});
