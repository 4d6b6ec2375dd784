// `jointloom view` from the command line: usage errors, a missing build, and a real run that prints its
// URL, answers on it, and exits 0 on SIGINT.
import { spawn } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, test } from 'vitest';
import { synthesizeTake } from '../../src/synth/index.js';
import { runCli } from '../cli/run.js';
import { rawRequest } from './http.js';

const MAIN = fileURLToPath(new URL('../../src/cli/main.ts', import.meta.url));
const work = mkdtempSync(join(tmpdir(), 'jointloom-view-cli-'));
const take = join(work, 'walk.bvh');
writeFileSync(take, synthesizeTake({ seed: 77, duration: 4, frameRate: 100 }).bvhText);
const site = join(work, 'site');
mkdirSync(site);
writeFileSync(join(site, 'index.html'), '<!doctype html><title>view</title>');

afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('jointloom view', () => {
  test('--help carries the caution and lists the options', async () => {
    const r = await runCli(['view', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('--port');
    expect(r.stdout).toContain('--host');
    expect(r.stdout).toContain('--model');
    expect(r.stdout).toContain('not a diagnostic device');
  });

  for (const host of ['0.0.0.0', '192.168.1.20', '::', 'example.com', '128.0.0.1'])
    test(`--host ${host} is a usage error (exit 2): loopback only`, async () => {
      const r = await runCli(['view', take, '--host', host]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/loopback/);
    });

  test('--port outside 0-65535 is a usage error', async () => {
    expect((await runCli(['view', take, '--port', '70000'])).code).toBe(2);
  });

  test('a missing model file is one line naming it, exit 1', async () => {
    const r = await runCli(['view', take, '--model', join(work, 'no-model.json')]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('no-model.json');
  });

  test('a missing take is one line and exit 1', async () => {
    const r = await runCli(['view', join(work, 'none.bvh')]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });

  test('an unbuilt viewer is one line naming the build command, exit 1', async () => {
    const saved = process.env.JOINTLOOM_VIEWER_DIR;
    process.env.JOINTLOOM_VIEWER_DIR = join(work, 'empty');
    try {
      const r = await runCli(['view', take]);
      expect(r.code).toBe(1);
      expect(r.stderr).toContain('npm run build');
    } finally {
      if (saved === undefined) delete process.env.JOINTLOOM_VIEWER_DIR;
      else process.env.JOINTLOOM_VIEWER_DIR = saved;
    }
  });

  test('prints its URL on 127.0.0.1, serves the take there, and exits 0 on SIGINT', async () => {
    const child = spawn(process.execPath, ['--import', 'tsx', MAIN, 'view', take], {
      env: { ...process.env, JOINTLOOM_VIEWER_DIR: site },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
    let out = '';
    const url = await new Promise<string>((resolve, reject) => {
      child.stdout.on('data', (c: Buffer) => {
        out += c.toString();
        const m = /^jointloom view: (http:\/\/127\.0\.0\.1:(\d+)\/)$/m.exec(out);
        if (m) resolve(m[1]!);
      });
      void exited.then((code) => reject(new Error(`exited ${code} before printing a URL`)));
    });
    const port = Number(new URL(url).port);
    expect(port).toBeGreaterThan(0);
    const page = await rawRequest(port, '/');
    expect(page.body.toString()).toContain('<title>view</title>');
    const t = JSON.parse((await rawRequest(port, '/api/take')).body.toString()) as { sourceFps: number; sourceFrames: number; stride: number };
    // 4 s at 100 Hz: 400 frames, drawn at 50 Hz (stride 2) (hand-computed).
    expect(t.sourceFrames).toBe(400);
    expect(t.stride).toBe(2);
    child.kill('SIGINT');
    expect(await exited).toBe(0);
  });
});
