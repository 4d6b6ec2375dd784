// Writing to the ledger: one immediate transaction per take (subject, session, take, model, score
// and its numbers, or a failure), so a killed batch leaves every take either fully in or not at all.
import type { TakeIdentity } from '../score/identity.js';
import { modelKey, type ModelRef, type ScoreRecord } from '../score/record.js';
import type { Ledger } from './open.js';

/** The outcome of committing a score: written, or already there (another run scored it). */
export type CommitResult = 'written' | 'already';

function upsertTake(db: Ledger, sha: string, path: string, bytes: number, id: TakeIdentity | null): number {
  let sessionId: number | null = null;
  if (id) {
    db.prepare('INSERT INTO subjects (code) VALUES (?) ON CONFLICT (code) DO NOTHING').run(id.subject);
    const subj = (db.prepare('SELECT id FROM subjects WHERE code = ?').get(id.subject) as { id: number }).id;
    db.prepare('INSERT INTO sessions (subject_id, label, date) VALUES (?, ?, ?) ON CONFLICT (subject_id, label) DO UPDATE SET date = coalesce(min(sessions.date, excluded.date), sessions.date, excluded.date)').run(subj, id.session, id.date);
    sessionId = (db.prepare('SELECT id FROM sessions WHERE subject_id = ? AND label = ?').get(subj, id.session) as { id: number }).id;
  }
  db.prepare('INSERT INTO takes (sha256, session_id, path, bytes) VALUES (?, ?, ?, ?) ON CONFLICT (sha256) DO UPDATE SET session_id = coalesce(takes.session_id, excluded.session_id)').run(sha, sessionId, path, bytes);
  return (db.prepare('SELECT id FROM takes WHERE sha256 = ?').get(sha) as { id: number }).id;
}

/** Ensures the model row exists; returns its key. */
export function upsertModel(db: Ledger, model: ModelRef): string {
  const key = modelKey(model);
  db.prepare('INSERT INTO models (key, sha256, file, note) VALUES (?, ?, ?, ?) ON CONFLICT (key) DO NOTHING')
    .run(key, model.file_sha256, model.file, model.file_sha256 ? 'coupling model file (forecast and coupling columns)' : 'no model: scores without model-based columns');
  return key;
}

/** Writes one score record with its numbers in one transaction; returns whether it was new. */
export function commitScore(db: Ledger, record: ScoreRecord, id: TakeIdentity | null, scoredAt = new Date().toISOString()): CommitResult {
  return db.transaction((): CommitResult => {
    const takeId = upsertTake(db, record.take.sha256, record.take.path, record.take.bytes, id);
    const key = upsertModel(db, record.provenance.model);
    const r = db.prepare('INSERT INTO scores (take_id, model_key, tool_version, options_json, scored_at, record_json) VALUES (?, ?, ?, ?, ?, ?) ON CONFLICT (take_id, model_key) DO NOTHING')
      .run(takeId, key, record.provenance.tool_version, JSON.stringify(record.provenance.options), scoredAt, JSON.stringify(record));
    if (r.changes === 0) return 'already';
    const ins = db.prepare('INSERT INTO score_values (score_id, name, value) VALUES (?, ?, ?)');
    for (const [name, value] of Object.entries(record.metrics)) ins.run(r.lastInsertRowid, name, value);
    db.prepare('DELETE FROM failures WHERE take_id = ? AND model_key = ?').run(takeId, key);
    return 'written';
  }).immediate();
}

/** Records (or counts again) the failure of a take under a model, in one transaction. */
export function recordFailure(db: Ledger, take: { sha256: string; path: string; bytes: number }, id: TakeIdentity | null, model: ModelRef, reason: string, toolVersion: string, at = new Date().toISOString()): void {
  db.transaction(() => {
    const takeId = upsertTake(db, take.sha256, take.path, take.bytes, id);
    const key = upsertModel(db, model);
    db.prepare(`INSERT INTO failures (take_id, model_key, reason, attempts, tool_version, last_at) VALUES (?, ?, ?, 1, ?, ?)
      ON CONFLICT (take_id, model_key) DO UPDATE SET reason = excluded.reason, attempts = failures.attempts + 1, tool_version = excluded.tool_version, last_at = excluded.last_at`)
      .run(takeId, key, reason, toolVersion, at);
  }).immediate();
}

/** Returns the SHA-256 of every take already scored under the model key. */
export function scoredTakes(db: Ledger, key: string): Set<string> {
  const rows = db.prepare('SELECT t.sha256 AS sha FROM scores s JOIN takes t ON t.id = s.take_id WHERE s.model_key = ?').all(key) as { sha: string }[];
  return new Set(rows.map((r) => r.sha));
}
