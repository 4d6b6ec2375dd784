// Forgetting a subject: every row that belongs to them goes, then the file is rewritten (VACUUM) and
// the write-ahead log truncated, so that the deleted data is not left in free pages.
import { InputError } from '../errors/index.js';
import type { Ledger } from './open.js';

/** Returns how many rows of each table were removed for `subject`; throws InputError when the subject is unknown. */
export function forgetSubject(db: Ledger, subject: string): Record<string, number> {
  const s = db.prepare('SELECT id FROM subjects WHERE code = ?').get(subject) as { id: number } | undefined;
  if (!s) throw new InputError(`subject "${subject}" is not in this ledger.`);
  const removed = db.transaction(() => {
    const takes = 'SELECT t.id FROM takes t JOIN sessions se ON se.id = t.session_id WHERE se.subject_id = ?';
    const scores = `SELECT id FROM scores WHERE take_id IN (${takes})`;
    const out: Record<string, number> = {};
    out.score_values = db.prepare(`DELETE FROM score_values WHERE score_id IN (${scores})`).run(s.id).changes;
    out.scores = db.prepare(`DELETE FROM scores WHERE take_id IN (${takes})`).run(s.id).changes;
    out.failures = db.prepare(`DELETE FROM failures WHERE take_id IN (${takes})`).run(s.id).changes;
    out.takes = db.prepare(`DELETE FROM takes WHERE id IN (${takes})`).run(s.id).changes;
    out.sessions = db.prepare('DELETE FROM sessions WHERE subject_id = ?').run(s.id).changes;
    out.subjects = db.prepare('DELETE FROM subjects WHERE id = ?').run(s.id).changes;
    return out;
  }).immediate();
  db.exec('VACUUM');
  db.pragma('wal_checkpoint(TRUNCATE)');
  return removed;
}
