// A batch run: find the takes, keep this shard's, skip those already scored under the model, score
// the rest in the worker pool, and commit each take in its own transaction as it finishes (so an
// interrupted run resumes where it stopped). Bad takes are recorded with their reason.
import { accessSync, constants, mkdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, sep } from 'node:path';
import { InputError } from '../errors/index.js';
import type { ScoreOptions } from '../score/compose.js';
import { sha256Hex } from '../score/hash.js';
import { takeIdentity, type TakeIdentity } from '../score/identity.js';
import { createScorePool } from '../score/pool.js';
import { modelKey } from '../score/record.js';
import { shardOf, type Shard } from '../score/shard.js';
import { findTakes } from '../util/takes.js';
import { commitScore, recordFailure, scoredTakes } from './store.js';
import { openLedger } from './open.js';

/** What a batch is asked to do. */
export interface BatchOptions {
  paths: readonly string[];
  ledger: string;
  workers: number;
  shard: Shard | null;
  score: ScoreOptions;
  onProgress?: (done: number, total: number, status: string) => void;
  /** Called after each take is committed (the CLI uses it for nothing; tests may). */
  onCommit?: (path: string) => void;
}

/** One take found by the scan. */
export interface FoundTake { file: string; root: string; shown: string }

/** What a batch did. */
export interface BatchSummary {
  found: number;
  inShard: number;
  scored: number;
  skipped: number;
  /** Scored meanwhile by another run on the same ledger (not written twice). */
  already: number;
  failed: { path: string; reason: string }[];
  workers: number;
  elapsedS: number;
  modelKey: string;
}

/** Returns the takes under the given files and folders, each with the root its relative path is taken from. */
export function scanTakes(paths: readonly string[]): FoundTake[] {
  const seen = new Set<string>();
  const out: FoundTake[] = [];
  for (const p of paths) {
    const isDir = statSync(p, { throwIfNoEntry: false })?.isDirectory() ?? false;
    const root = isDir ? p : dirname(p);
    for (const file of findTakes([p])) {
      if (seen.has(file)) continue;
      seen.add(file);
      out.push({ file, root, shown: relative(root, file).split(sep).join('/') });
    }
  }
  return out;
}

/** Throws InputError unless `dir` exists (it is created) and a file can be written in it. */
export function checkOutputFolder(dir: string): void {
  try {
    mkdirSync(dir, { recursive: true });
    accessSync(dir, constants.W_OK);
    const probe = join(dir, `.jointloom-probe-${process.pid}`);
    writeFileSync(probe, '');
    rmSync(probe);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(`${dir}: the output folder cannot be written (${code === 'EACCES' || code === 'EPERM' ? 'permission denied' : code === 'ENOTDIR' || code === 'EEXIST' ? 'a part of the path is a file' : code ?? (e as Error).message}); nothing was scored.`);
  }
}

/** Runs the batch; returns its summary. Throws only when nothing can run (no takes, unusable ledger). */
export async function runBatch(o: BatchOptions): Promise<BatchSummary> {
  const t0 = performance.now();
  const found = scanTakes(o.paths);
  if (!found.length) throw new InputError(`no BVH takes found in ${o.paths.join(', ')}.`);
  const mine = o.shard ? found.filter((t) => shardOf(t.shown, o.shard!.n) === o.shard!.k) : found;
  const db = openLedger(o.ledger);
  const key = modelKey(o.score.model);
  const summary: BatchSummary = { found: found.length, inShard: mine.length, scored: 0, skipped: 0, already: 0, failed: [], workers: 0, elapsedS: 0, modelKey: key };
  try {
    const done = scoredTakes(db, key);
    const todo: { t: FoundTake; id: TakeIdentity | null; bytes: number }[] = [];
    const fail = (t: FoundTake, sha: string, bytes: number, id: TakeIdentity | null, reason: string) => {
      recordFailure(db, { sha256: sha, path: t.shown, bytes }, id, o.score.model, reason, o.score.toolVersion);
      summary.failed.push({ path: t.shown, reason });
    };
    for (const t of mine) {
      let bytes: Buffer;
      try { bytes = readFileSync(t.file); } catch (e) { summary.failed.push({ path: t.shown, reason: `cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})` }); continue; }
      const sha = sha256Hex(bytes);
      if (done.has(sha)) { summary.skipped++; continue; }
      let id: TakeIdentity | null = null;
      try { id = takeIdentity(t.file, t.root); } catch (e) { fail(t, sha, bytes.byteLength, null, (e as Error).message); continue; }
      todo.push({ t, id, bytes: bytes.byteLength });
    }
    // Largest takes first, so the pool does not end on one long take while the other workers idle.
    todo.sort((a, b) => b.bytes - a.bytes || (a.t.shown < b.t.shown ? -1 : a.t.shown > b.t.shown ? 1 : 0));
    const total = mine.length;
    let finished = summary.skipped + summary.failed.length;
    o.onProgress?.(finished, total, '');
    if (todo.length) {
      const pool = createScorePool(Math.min(o.workers, todo.length));
      summary.workers = pool.workers;
      try {
        await Promise.all(todo.map(async ({ t, id }) => {
          const r = await pool.run({ file: t.file, shownPath: t.shown, options: o.score });
          if (r.ok) {
            const c = commitScore(db, r.record, id);
            if (c === 'written') summary.scored++; else summary.already++;
            o.onCommit?.(t.shown);
          } else {
            const bytes = readFileSync(t.file);
            fail(t, sha256Hex(bytes), bytes.byteLength, id, r.reason);
          }
          o.onProgress?.(++finished, total, t.shown);
        }));
      } finally {
        await pool.close();
      }
    }
  } finally {
    db.close();
  }
  summary.elapsedS = (performance.now() - t0) / 1000;
  return summary;
}
