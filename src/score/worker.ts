// The batch worker: reads one take, scores it, and returns the record or the reason it failed.
// Loaded by piscina in a worker thread (see pool.ts); nothing here touches the ledger.
import { readFileSync } from 'node:fs';
import { UserError } from '../errors/index.js';
import { scoreTake, type ScoreOptions } from './compose.js';
import type { ScoreRecord } from './record.js';

/** One unit of work. */
export interface ScoreTask {
  file: string;
  /** The path recorded in the ledger (relative to the folder given). */
  shownPath: string;
  options: ScoreOptions;
}

/** What a worker sends back: a record, or a failure with its reason. */
export type ScoreOutcome = { ok: true; record: ScoreRecord; ms: number } | { ok: false; reason: string; ms: number };

/** Returns the outcome of scoring one take; never throws for a bad take. */
export function scoreTask(task: ScoreTask): ScoreOutcome {
  const t0 = performance.now();
  try {
    const bytes = readFileSync(task.file);
    const record = scoreTake(bytes, task.shownPath, task.options);
    return { ok: true, record, ms: performance.now() - t0 };
  } catch (e) {
    const reason = e instanceof UserError ? e.message : e instanceof Error ? `internal error: ${e.message}` : String(e);
    return { ok: false, reason, ms: performance.now() - t0 };
  }
}

export default scoreTask;
