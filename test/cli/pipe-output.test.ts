// The real process, not the in-process runner: output larger than a pipe's buffer (64 KiB on Linux)
// reaches the reader whole before the process exits. Reference: the same export written to a file.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const repo = resolve(import.meta.dirname, '..', '..');
const dir = mkdtempSync(join(tmpdir(), 'jointloom-pipe-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('output through a pipe', () => {
  it('delivers every byte of a 1.4 MB export before exiting', () => {
    const take = join(repo, 'demo-takes', 'S01-1-walk.bvh'), file = join(dir, 'all.csv');
    const cli = [join(repo, 'src', 'cli', 'main.ts'), 'export', take, '--all', '--format', 'csv'];
    const piped = spawnSync(process.execPath, ['--import', 'tsx', ...cli], { cwd: repo, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
    expect(piped.status).toBe(0);
    const written = spawnSync(process.execPath, ['--import', 'tsx', ...cli, '-o', file], { cwd: repo, encoding: 'utf8' });
    expect(written.status).toBe(0);
    const reference = readFileSync(file, 'utf8');
    expect(reference.length).toBeGreaterThan(1_000_000);
    expect(piped.stdout.length).toBe(reference.length);
    expect(piped.stdout === reference).toBe(true);
  });
});
