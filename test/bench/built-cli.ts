// The built CLI the bench sections run as child processes (dist/cli/main.js, compiled by tsc from
// tsconfig.build.json), as an installed tool runs: from source every worker thread compiles the
// TypeScript through tsx at start, a fixed cost users never pay.
import { spawnSync } from 'node:child_process';
import { join, resolve } from 'node:path';

export const repo = resolve(import.meta.dirname, '..', '..');
export const builtCli = join(repo, 'dist', 'cli', 'main.js');

let built = false;

/** Compiles src/ into dist/ once per bench run (tsc only; the viewer is not needed here). */
export function buildCli(): void {
  if (built) return;
  const r = spawnSync(process.execPath, [join(repo, 'node_modules', 'typescript', 'bin', 'tsc'), '-p', join(repo, 'tsconfig.build.json')], { cwd: repo, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`tsc -p tsconfig.build.json failed: ${(r.stdout + r.stderr).trim().split('\n')[0]}`);
  built = true;
}
