// Merging ledgers (e.g. the shards of one batch): every take, score with its numbers and failure of
// each input is added to the output; a take already scored under the same model keeps its first score.
// Inputs are read from a private copy (VACUUM INTO), migrated there, and never changed; the whole merge is
// one transaction, so a failure leaves the output as it was.
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import Database from 'better-sqlite3';
import { InputError, UsageError } from '../errors/index.js';
import { openLedger, type Ledger } from './open.js';

/** Counts of what a merge added. */
export interface MergeCounts { inputs: number; scores: number; already: number; failures: number }

interface InScore {
  sha256: string; path: string; bytes: number; subject: string | null; session: string | null; date: string | null;
  model_key: string; model_sha: string | null; model_file: string | null; model_note: string | null;
  tool_version: string; options_json: string; scored_at: string; record_json: string; score_id: number;
}

function takeId(out: Ledger, r: { sha256: string; path: string; bytes: number; subject: string | null; session: string | null; date: string | null }): number {
  let sessionId: number | null = null;
  if (r.subject !== null && r.session !== null) {
    out.prepare('INSERT INTO subjects (code) VALUES (?) ON CONFLICT (code) DO NOTHING').run(r.subject);
    const subj = (out.prepare('SELECT id FROM subjects WHERE code = ?').get(r.subject) as { id: number }).id;
    out.prepare('INSERT INTO sessions (subject_id, label, date) VALUES (?, ?, ?) ON CONFLICT (subject_id, label) DO UPDATE SET date = coalesce(min(sessions.date, excluded.date), sessions.date, excluded.date)').run(subj, r.session, r.date);
    sessionId = (out.prepare('SELECT id FROM sessions WHERE subject_id = ? AND label = ?').get(subj, r.session) as { id: number }).id;
  }
  out.prepare('INSERT INTO takes (sha256, session_id, path, bytes) VALUES (?, ?, ?, ?) ON CONFLICT (sha256) DO UPDATE SET session_id = coalesce(takes.session_id, excluded.session_id)').run(r.sha256, sessionId, r.path, r.bytes);
  return (out.prepare('SELECT id FROM takes WHERE sha256 = ?').get(r.sha256) as { id: number }).id;
}

/** Returns a private, migrated copy of the ledger at `file` and a function removing it. */
function privateCopy(file: string): { db: Ledger; done: () => void } {
  const dir = mkdtempSync(join(tmpdir(), 'jointloom-merge-'));
  const copy = join(dir, 'in.sqlite');
  try {
    const src = new Database(file, { readonly: true, fileMustExist: true });
    try { src.prepare('VACUUM INTO ?').run(copy); } finally { src.close(); }
  } catch (e) {
    rmSync(dir, { recursive: true, force: true });
    throw new InputError(`${file}: cannot read the ledger (${(e as Error).message}).`);
  }
  let db: Ledger;
  try {
    db = openLedger(copy);
  } catch (e) {
    // A ledger this version cannot use (e.g. a newer schema): no copy of a clinic's data stays behind,
    // and the message names the user's file, not the copy.
    rmSync(dir, { recursive: true, force: true });
    throw e instanceof InputError ? new InputError(e.message.split(copy).join(file)) : e;
  }
  return { db, done: () => { db.close(); rmSync(dir, { recursive: true, force: true }); } };
}

/**
 * Merges the `inputs` ledgers into `output` (created when missing); returns what was added. Every input is
 * opened and checked before the output is touched, and all of them are merged in one transaction, so a
 * failure leaves the output as it was (and removes it when the merge created it). Merging the same input
 * again adds nothing: its scores are there already and its failures, with the same last attempt, too.
 */
export function mergeLedgers(inputs: readonly string[], output: string): MergeCounts {
  if (!inputs.length) throw new UsageError('ledger merge needs at least one input ledger.');
  if (inputs.some((f) => resolve(f) === resolve(output))) throw new UsageError(`the output ${output} is also an input; write the merge to a new file.`);
  const copies: { db: Ledger; done: () => void }[] = [];
  try {
    for (const file of inputs) copies.push(privateCopy(file));
    const created = !existsSync(output);
    const out = openLedger(output);
    const counts: MergeCounts = { inputs: inputs.length, scores: 0, already: 0, failures: 0 };
    try {
      out.transaction(() => { for (const c of copies) mergeOne(c.db, out, counts); }).immediate();
    } catch (e) {
      out.close();
      if (created) for (const f of [output, `${output}-wal`, `${output}-shm`]) rmSync(f, { force: true });
      throw e;
    }
    out.close();
    return counts;
  } finally {
    for (const c of copies) c.done();
  }
}

/** Adds one input's models, scores with their numbers, and failures to `out` (inside the caller's transaction). */
function mergeOne(db: Ledger, out: Ledger, counts: MergeCounts): void {
  const scores = db.prepare(`SELECT t.sha256, t.path, t.bytes, sub.code AS subject, se.label AS session, se.date, s.model_key, m.sha256 AS model_sha, m.file AS model_file, m.note AS model_note,
      s.tool_version, s.options_json, s.scored_at, s.record_json, s.id AS score_id
    FROM scores s JOIN takes t ON t.id = s.take_id LEFT JOIN sessions se ON se.id = t.session_id LEFT JOIN subjects sub ON sub.id = se.subject_id LEFT JOIN models m ON m.key = s.model_key
    ORDER BY s.id`).all() as InScore[];
  const values = db.prepare('SELECT name, value FROM score_values WHERE score_id = ?');
  const failures = db.prepare(`SELECT t.sha256, t.path, t.bytes, sub.code AS subject, se.label AS session, se.date, f.model_key, f.reason, f.attempts, f.tool_version, f.last_at
    FROM failures f JOIN takes t ON t.id = f.take_id LEFT JOIN sessions se ON se.id = t.session_id LEFT JOIN subjects sub ON sub.id = se.subject_id ORDER BY f.id`).all() as
    (Omit<InScore, 'model_sha' | 'model_file' | 'model_note' | 'options_json' | 'scored_at' | 'record_json' | 'score_id'> & { reason: string; attempts: number; last_at: string })[];
  const models = db.prepare('SELECT key, sha256, file, note FROM models').all() as { key: string; sha256: string | null; file: string | null; note: string }[];
  for (const m of models) out.prepare('INSERT INTO models (key, sha256, file, note) VALUES (?, ?, ?, ?) ON CONFLICT (key) DO NOTHING').run(m.key, m.sha256, m.file, m.note);
  const ins = out.prepare('INSERT INTO score_values (score_id, name, value) VALUES (?, ?, ?)');
  for (const s of scores) {
    const tid = takeId(out, s);
    const r = out.prepare('INSERT INTO scores (take_id, model_key, tool_version, options_json, scored_at, record_json) VALUES (?, ?, ?, ?, ?, ?) ON CONFLICT (take_id, model_key) DO NOTHING')
      .run(tid, s.model_key, s.tool_version, s.options_json, s.scored_at, s.record_json);
    if (r.changes === 0) { counts.already++; continue; }
    counts.scores++;
    for (const v of values.all(s.score_id) as { name: string; value: number | null }[]) ins.run(r.lastInsertRowid, v.name, v.value);
    out.prepare('DELETE FROM failures WHERE take_id = ? AND model_key = ?').run(tid, s.model_key);
  }
  for (const f of failures) {
    const tid = takeId(out, f);
    if (out.prepare('SELECT 1 FROM scores WHERE take_id = ? AND model_key = ?').get(tid, f.model_key)) continue;
    // The same failure merged before (same last attempt) is not counted twice.
    const held = out.prepare('SELECT attempts, last_at FROM failures WHERE take_id = ? AND model_key = ?').get(tid, f.model_key) as { attempts: number; last_at: string } | undefined;
    if (held && held.last_at === f.last_at && held.attempts >= f.attempts) continue;
    out.prepare(`INSERT INTO failures (take_id, model_key, reason, attempts, tool_version, last_at) VALUES (?, ?, ?, ?, ?, ?)
      ON CONFLICT (take_id, model_key) DO UPDATE SET attempts = failures.attempts + excluded.attempts,
        reason = CASE WHEN excluded.last_at > failures.last_at THEN excluded.reason ELSE failures.reason END, last_at = max(failures.last_at, excluded.last_at)`)
      .run(tid, f.model_key, f.reason, f.attempts, f.tool_version, f.last_at);
    counts.failures++;
  }
}
