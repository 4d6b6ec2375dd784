// The ledger's schema as numbered migrations. `PRAGMA user_version` holds the version a file is at;
// opening a file runs the missing migrations in order, each in one transaction.
import type Database from 'better-sqlite3';
import { InputError } from '../errors/index.js';

type Db = Database.Database;

/** One step of the schema: SQL and, when rows must be rewritten, a function run after it. */
interface Migration {
  version: number;
  sql: string;
  after?: (db: Db) => void;
}

/** Version 1: subjects, sessions, takes and one score per take (kept to migrate older files). */
const V1 = `
CREATE TABLE subjects (id INTEGER PRIMARY KEY, code TEXT NOT NULL UNIQUE);
CREATE TABLE sessions (id INTEGER PRIMARY KEY, subject_id INTEGER NOT NULL REFERENCES subjects(id), label TEXT NOT NULL, date TEXT, UNIQUE (subject_id, label));
CREATE TABLE takes (id INTEGER PRIMARY KEY, sha256 TEXT NOT NULL UNIQUE, session_id INTEGER REFERENCES sessions(id), path TEXT NOT NULL, bytes INTEGER NOT NULL);
CREATE TABLE scores (id INTEGER PRIMARY KEY, take_id INTEGER NOT NULL UNIQUE REFERENCES takes(id), tool_version TEXT NOT NULL, scored_at TEXT NOT NULL, record_json TEXT NOT NULL);
`;

/** Version 2: models, one score per take and model, numbers in score_values, failures. */
const V2 = `
CREATE TABLE models (key TEXT PRIMARY KEY, sha256 TEXT, file TEXT, note TEXT NOT NULL);
INSERT INTO models (key, sha256, file, note) VALUES ('none', NULL, NULL, 'no model: scores without model-based columns');
CREATE TABLE scores_v2 (
  id INTEGER PRIMARY KEY,
  take_id INTEGER NOT NULL REFERENCES takes(id),
  model_key TEXT NOT NULL REFERENCES models(key),
  tool_version TEXT NOT NULL,
  options_json TEXT NOT NULL,
  scored_at TEXT NOT NULL,
  record_json TEXT NOT NULL,
  UNIQUE (take_id, model_key)
);
INSERT INTO scores_v2 (id, take_id, model_key, tool_version, options_json, scored_at, record_json)
  SELECT id, take_id, 'none', tool_version, '{}', scored_at, record_json FROM scores;
DROP TABLE scores;
ALTER TABLE scores_v2 RENAME TO scores;
CREATE TABLE score_values (score_id INTEGER NOT NULL REFERENCES scores(id) ON DELETE CASCADE, name TEXT NOT NULL, value REAL, PRIMARY KEY (score_id, name)) WITHOUT ROWID;
CREATE TABLE failures (
  id INTEGER PRIMARY KEY,
  take_id INTEGER NOT NULL REFERENCES takes(id) ON DELETE CASCADE,
  model_key TEXT NOT NULL,
  reason TEXT NOT NULL,
  attempts INTEGER NOT NULL DEFAULT 1,
  tool_version TEXT NOT NULL,
  last_at TEXT NOT NULL,
  UNIQUE (take_id, model_key)
);
CREATE INDEX sessions_subject ON sessions (subject_id);
CREATE INDEX takes_session ON takes (session_id);
`;

/** Copies the numbers of version-1 records (their "metrics" object) into score_values. */
function backfillValues(db: Db): void {
  const ins = db.prepare('INSERT OR IGNORE INTO score_values (score_id, name, value) VALUES (?, ?, ?)');
  for (const row of db.prepare('SELECT id, record_json FROM scores').all() as { id: number; record_json: string }[]) {
    let m: unknown;
    try { m = (JSON.parse(row.record_json) as { metrics?: unknown }).metrics; } catch { continue; }
    if (!m || typeof m !== 'object') continue;
    for (const [k, v] of Object.entries(m as Record<string, unknown>)) if (typeof v === 'number' || v === null) ins.run(row.id, k, v);
  }
}

const MIGRATIONS: readonly Migration[] = [
  { version: 1, sql: V1 },
  { version: 2, sql: V2, after: backfillValues },
];

/** The schema version this code writes. */
export const SCHEMA_VERSION = MIGRATIONS[MIGRATIONS.length - 1]!.version;

/** Returns the SQL of the migration to `version` (exported for tests that build old files). */
export function migrationSql(version: number): string {
  const m = MIGRATIONS.find((x) => x.version === version);
  if (!m) throw new Error(`no migration ${version}`);
  return m.sql;
}

/** Brings the file to SCHEMA_VERSION; returns the version it was at. Refuses files from a newer jointloom. */
export function migrate(db: Db, file: string): number {
  const from = db.pragma('user_version', { simple: true }) as number;
  if (from > SCHEMA_VERSION)
    throw new InputError(`${file}: the ledger has schema version ${from}, newer than this jointloom understands (${SCHEMA_VERSION}); use a newer jointloom.`);
  if (from === SCHEMA_VERSION) return from;
  // Table rebuilds need foreign keys off (they are checked again at the end).
  db.pragma('foreign_keys = OFF');
  try {
    for (const m of MIGRATIONS) {
      if (m.version <= from) continue;
      db.transaction(() => {
        if ((db.pragma('user_version', { simple: true }) as number) >= m.version) return; // another process got there first
        db.exec(m.sql);
        m.after?.(db);
        const bad = db.pragma('foreign_key_check') as unknown[];
        if (bad.length) throw new InputError(`${file}: migration to schema ${m.version} left ${bad.length} broken references.`);
        db.pragma(`user_version = ${m.version}`);
      }).immediate();
    }
  } finally {
    db.pragma('foreign_keys = ON');
  }
  return from;
}
