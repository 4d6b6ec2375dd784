// Bench section: `jointloom batch` on the demo takes with 2 workers against 1 worker (each run into a
// fresh ledger, as child processes, alternating so machine noise hits both alike), and takes scored per
// minute. It runs the built CLI (dist/, compiled first with tsconfig.build.json), as an installed tool
// runs: from source every worker thread would compile the TypeScript through tsx at start, a fixed cost
// users never pay. The time is the batch's own (scan, hashing, pool start, scoring, commits), read from
// its --json summary.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { synthesizeTake } from '../../src/synth/index.js';
import { buildCli, builtCli, repo } from './built-cli.js';
import { ratio, type Section } from './report.js';

/** Returns the batch's elapsed seconds for one run with `workers` threads into a fresh ledger. */
function timeBatch(takes: string, workers: number, dir: string, rep: number): number {
  const ledger = join(dir, `w${workers}-${rep}.sqlite`);
  const r = spawnSync(process.execPath, [builtCli, 'batch', takes, '--ledger', ledger, '--workers', String(workers), '--json', '--quiet'], { cwd: repo, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`batch with ${workers} workers exited ${r.status}: ${r.stderr.trim()}`);
  const s = JSON.parse(r.stdout) as { elapsed_s: number; scored: number; failed: unknown[] };
  if (s.failed.length) throw new Error(`batch with ${workers} workers: ${s.failed.length} takes failed`);
  return s.elapsed_s;
}

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); const m = s.length >> 1; return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2; };

/** Writes `n` synthesized 30-s takes (fictional subjects, 120 Hz, with sidecars) into `dir`. */
function writeCohort(dir: string, n: number): void {
  for (let i = 0; i < n; i++) {
    const subject = `B${String(Math.floor(i / 4)).padStart(3, '0')}`, session = String(1 + (i % 2));
    writeFileSync(join(dir, `${subject}-${session}-${i}.bvh`), synthesizeTake({ seed: 9000 + i, subjectSeed: 900 + Math.floor(i / 4), duration: 30, speed: 1.0 + 0.05 * (i % 8) }).bvhText);
    writeFileSync(join(dir, `${subject}-${session}-${i}.json`), JSON.stringify({ subject, session, invented: true }));
  }
}

/** Returns the batch section: 1 and 2 workers on the demo takes, their ratio and the throughput; with `cohort` > 0 also that many 30-s takes on 2 workers. */
export function runBatchBench(o: { reps: number; takes?: string; cohort?: number }): Section {
  const takes = o.takes ?? join(repo, 'demo-takes');
  const n = readdirSync(takes).filter((f) => f.endsWith('.bvh')).length;
  buildCli();
  const dir = mkdtempSync(join(tmpdir(), 'jointloom-bench-batch-'));
  const t1: number[] = [], t2: number[] = [];
  try {
    for (let i = 0; i < o.reps; i++) {
      t1.push(timeBatch(takes, 1, dir, i));
      t2.push(timeBatch(takes, 2, dir, i));
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  const m1 = median(t1), m2 = median(t2);
  const extraRows: Section['rows'] = [], extraRatios: Section['ratios'] = [];
  if (o.cohort) {
    const cdir = mkdtempSync(join(tmpdir(), 'jointloom-bench-cohort-'));
    try {
      writeCohort(cdir, o.cohort);
      const t = timeBatch(cdir, 2, cdir, 0);
      extraRows.push({ name: `${o.cohort} takes of 30 s, 2 workers`, value: t, unit: 's' });
      const per100 = (t * 100) / o.cohort;
      extraRatios.push(ratio('100 takes of 30 s on 2 workers (s)', per100, '<=', 300, o.cohort === 100 ? 'measured' : `projected from ${o.cohort} takes`));
    } finally {
      rmSync(cdir, { recursive: true, force: true });
    }
  }
  const notes = [`${n} demo takes; median of ${o.reps} alternating runs each; ${availableParallelism()} cores available; the built CLI (dist/)`];
  if (availableParallelism() < 2) notes.push('fewer than 2 cores: the 2-worker ratio cannot reach its target here');
  return {
    title: 'batch scoring (worker pool, ledger commits)',
    rows: [
      { name: '1 worker', value: m1, unit: 's', note: `${n} takes` },
      { name: '2 workers', value: m2, unit: 's', note: `${n} takes` },
      { name: 'throughput, 2 workers', value: (n / m2) * 60, unit: 'takes/min' },
      { name: 'throughput, 1 worker', value: (n / m1) * 60, unit: 'takes/min' },
      ...extraRows,
    ],
    ratios: [ratio('2 workers vs 1 (speed-up)', m1 / m2, '>=', 1.6), ...extraRatios],
    notes,
  };
}
