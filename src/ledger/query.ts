// Reading the ledger: score rows with their numbers, and the failures.
import type { ScoreFlag } from '../score/record.js';
import type { Ledger } from './open.js';
import type { CohortTake } from '../report/cohort-data.js';

/** One score as read back: the cohort report's take row plus its score id and the model file's hash. */
export interface ScoreRow extends CohortTake {
  scoreId: number;
  modelSha256: string | null;
}

/** One failed take as read back. */
export interface FailureRow { subject: string | null; session: string | null; path: string; sha256: string; modelKey: string; reason: string; attempts: number; lastAt: string }

/** Returns the scores, optionally of one model and one subject, ordered by subject, session date and label, and path. */
export function listScores(db: Ledger, o: { modelKey?: string; subject?: string } = {}): ScoreRow[] {
  const where: string[] = [], args: string[] = [];
  if (o.modelKey !== undefined) { where.push('s.model_key = ?'); args.push(o.modelKey); }
  if (o.subject !== undefined) { where.push('sub.code = ?'); args.push(o.subject); }
  const rows = db.prepare(`SELECT s.id AS scoreId, sub.code AS subject, se.label AS session, se.date AS date, t.path AS path, t.sha256 AS sha256,
      s.model_key AS modelKey, m.sha256 AS modelSha256, s.tool_version AS toolVersion, s.scored_at AS scoredAt, s.options_json AS options, s.record_json AS record
    FROM scores s JOIN takes t ON t.id = s.take_id LEFT JOIN sessions se ON se.id = t.session_id LEFT JOIN subjects sub ON sub.id = se.subject_id
    LEFT JOIN models m ON m.key = s.model_key
    ${where.length ? 'WHERE ' + where.join(' AND ') : ''}
    ORDER BY sub.code, se.date, se.label, t.path, s.model_key`).all(...args) as (Omit<ScoreRow, 'metrics' | 'flags'> & { record: string })[];
  const values = db.prepare('SELECT name, value FROM score_values WHERE score_id = ? ORDER BY name');
  return rows.map(({ record, ...r }) => {
    const metrics: Record<string, number | null> = {};
    for (const v of values.all(r.scoreId) as { name: string; value: number | null }[]) metrics[v.name] = v.value;
    let flags: ScoreFlag[] = [];
    try { flags = ((JSON.parse(record) as { flags?: ScoreFlag[] }).flags) ?? []; } catch { /* an old record without flags */ }
    return { ...r, metrics, flags };
  });
}

/** Returns the model keys the ledger holds scores under, the one of the latest score first. */
export function modelKeysByRecency(db: Ledger): string[] {
  return (db.prepare('SELECT model_key AS key FROM scores GROUP BY model_key ORDER BY max(scored_at) DESC, model_key').all() as { key: string }[]).map((r) => r.key);
}

/** Returns the failures, optionally of one model. */
export function listFailures(db: Ledger, modelKey?: string): FailureRow[] {
  return db.prepare(`SELECT sub.code AS subject, se.label AS session, t.path AS path, t.sha256 AS sha256, f.model_key AS modelKey, f.reason AS reason, f.attempts AS attempts, f.last_at AS lastAt
    FROM failures f JOIN takes t ON t.id = f.take_id LEFT JOIN sessions se ON se.id = t.session_id LEFT JOIN subjects sub ON sub.id = se.subject_id
    ${modelKey !== undefined ? 'WHERE f.model_key = ?' : ''} ORDER BY t.path`).all(...(modelKey !== undefined ? [modelKey] : [])) as FailureRow[];
}
