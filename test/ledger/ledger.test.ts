// The ledger: schema, migrations, one transaction per take, history with the MDC, forget, merge.
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { sampleStandardDeviation } from 'simple-statistics';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors/index.js';
import { forgetSubject } from '../../src/ledger/forget.js';
import { mdc95, pooledSem, subjectHistory } from '../../src/ledger/history.js';
import { mergeLedgers } from '../../src/ledger/merge.js';
import { BUSY_TIMEOUT_MS, openLedger } from '../../src/ledger/open.js';
import { listFailures, listScores } from '../../src/ledger/query.js';
import { SCHEMA_VERSION } from '../../src/ledger/schema.js';
import { commitScore, recordFailure, scoredTakes } from '../../src/ledger/store.js';
import { RECORD_FORMAT, type ModelRef, type ScoreRecord } from '../../src/score/record.js';

const dir = mkdtempSync(join(tmpdir(), 'jointloom-ledger-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const NO_MODEL: ModelRef = { file: null, file_sha256: null, used: false };

/** A score record with the given numbers (the ledger stores whatever metrics a record has). */
function record(sha: string, metrics: Record<string, number | null>, model: ModelRef = NO_MODEL): ScoreRecord {
  return {
    format: RECORD_FORMAT, version: 1,
    take: { path: `${sha}.bvh`, sha256: sha, bytes: 10, frames: 100, fps: 100, duration_s: 1 },
    provenance: { tool: 'jointloom', tool_version: '0.0.0-test', model, take_sha256: sha, options: { lowpass_hz: 6, steady_only: true, norms_file: null, norms_sha256: null }, stages: [] },
    metrics, flags: [], detail: {}, warnings: [],
  };
}
const id = (subject: string, session: string, date: string) => ({ subject, session, date, from: 'sidecar' as const });

describe('openLedger', () => {
  it('creates a file at the current schema version in WAL mode with a busy timeout and foreign keys', () => {
    const db = openLedger(join(dir, 'new.sqlite'));
    expect(db.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(db.pragma('busy_timeout', { simple: true })).toBe(BUSY_TIMEOUT_MS);
    expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
    const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name").all() as { name: string }[]).map((r) => r.name);
    expect(tables).toEqual(['failures', 'models', 'score_values', 'scores', 'sessions', 'subjects', 'takes']);
    db.close();
  });
  it('migrates a version-1 file made by hand, keeping its rows and their numbers', () => {
    const file = join(dir, 'v1.sqlite');
    const v1 = new Database(file);
    v1.exec(`
      CREATE TABLE subjects (id INTEGER PRIMARY KEY, code TEXT NOT NULL UNIQUE);
      CREATE TABLE sessions (id INTEGER PRIMARY KEY, subject_id INTEGER NOT NULL REFERENCES subjects(id), label TEXT NOT NULL, date TEXT, UNIQUE (subject_id, label));
      CREATE TABLE takes (id INTEGER PRIMARY KEY, sha256 TEXT NOT NULL UNIQUE, session_id INTEGER REFERENCES sessions(id), path TEXT NOT NULL, bytes INTEGER NOT NULL);
      CREATE TABLE scores (id INTEGER PRIMARY KEY, take_id INTEGER NOT NULL UNIQUE REFERENCES takes(id), tool_version TEXT NOT NULL, scored_at TEXT NOT NULL, record_json TEXT NOT NULL);
      INSERT INTO subjects VALUES (1, 'OLD1');
      INSERT INTO sessions VALUES (1, 1, '1', '2030-01-01');
      INSERT INTO takes VALUES (1, 'aaaa', 1, 'old.bvh', 123);
      INSERT INTO scores VALUES (1, 1, '0.0.1', '2030-01-02T00:00:00Z', '{"metrics": {"gait.cadence_steps_per_min": 111.5, "gait.speed_m_per_s": 1.21}}');
      PRAGMA user_version = 1;`);
    v1.close();
    const db = openLedger(file);
    expect(db.pragma('user_version', { simple: true })).toBe(SCHEMA_VERSION);
    const rows = listScores(db);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ subject: 'OLD1', session: '1', date: '2030-01-01', path: 'old.bvh', sha256: 'aaaa', modelKey: 'none', toolVersion: '0.0.1' });
    expect(rows[0]!.metrics).toEqual({ 'gait.cadence_steps_per_min': 111.5, 'gait.speed_m_per_s': 1.21 });
    expect(scoredTakes(db, 'none')).toEqual(new Set(['aaaa']));
    // After migration a second model may score the same take.
    expect(commitScore(db, { ...record('aaaa', { x: 1 }, { file: 'm.json', file_sha256: 'bbbb', used: false }) }, id('OLD1', '1', '2030-01-01'))).toBe('written');
    db.close();
    const again = openLedger(file); // a second open is a no-op
    expect(listScores(again)).toHaveLength(2);
    again.close();
  });
  it('refuses a file from a newer schema, and a file that is not a ledger', () => {
    const file = join(dir, 'future.sqlite');
    const f = new Database(file);
    f.pragma(`user_version = ${SCHEMA_VERSION + 1}`);
    f.close();
    expect(() => openLedger(file)).toThrow(/newer than this jointloom/);
    const junk = join(dir, 'junk.sqlite');
    writeFileSync(junk, 'this is not a database file at all, just text that is long enough to read');
    expect(() => openLedger(junk)).toThrow(InputError);
    expect(() => openLedger(join(dir, 'absent.sqlite'), { mustExist: true })).toThrow(/no such ledger/);
  });
});

describe('writing scores and failures', () => {
  it('keeps one score per take and model; a failure counts attempts and goes when the take scores', () => {
    const db = openLedger(join(dir, 'w.sqlite'));
    const who = id('W1', '1', '2031-01-01');
    recordFailure(db, { sha256: 'c1', path: 'c1.bvh', bytes: 10 }, who, NO_MODEL, 'first reason', 't');
    recordFailure(db, { sha256: 'c1', path: 'c1.bvh', bytes: 10 }, who, NO_MODEL, 'second reason', 't');
    expect(listFailures(db)).toMatchObject([{ path: 'c1.bvh', reason: 'second reason', attempts: 2, subject: 'W1' }]);
    expect(commitScore(db, record('c1', { a: 1 }), who)).toBe('written');
    expect(commitScore(db, record('c1', { a: 2 }), who)).toBe('already');
    const rows = listScores(db);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.metrics).toEqual({ a: 1 });
    expect(listFailures(db)).toEqual([]);
    // A session's date is the earliest any of its takes gives, whatever the order they are committed in.
    commitScore(db, record('c2', { a: 1 }), id('W1', '2', '2031-03-09'));
    commitScore(db, record('c3', { a: 1 }), id('W1', '2', '2031-03-02'));
    commitScore(db, record('c4', { a: 1 }), id('W1', '2', '2031-03-05'));
    expect(db.prepare("SELECT date FROM sessions WHERE label = '2'").get()).toEqual({ date: '2031-03-02' });
    db.close();
  });
});

describe('history', () => {
  it('pooledSem equals the sample SD for one group (simple-statistics) and pools sums of squares otherwise', () => {
    expect(pooledSem([[1, 2, 4, 7]]).sem).toBeCloseTo(sampleStandardDeviation([1, 2, 4, 7]), 12);
    // Groups [100, 102] and [104, 106]: squares 1+1 and 1+1 over 2 degrees of freedom, SEM = √2 (hand-computed).
    expect(pooledSem([[100, 102], [104, 106], [104.5]])).toEqual({ sem: Math.SQRT2, df: 2 });
    expect(pooledSem([[1], [2]]).sem).toBeNull();
    // MDC95 = 1.96 × √2 × SEM (Weir 2005; Haley & Fragala-Pinkham 2006): √2 × √2 × 1.96 = 3.92.
    expect(mdc95(Math.SQRT2)).toBeCloseTo(3.92, 12);
  });
  it('flags a change between sessions only beyond the MDC95, among scores of one model', () => {
    const db = openLedger(join(dir, 'h.sqlite'));
    const c = 'gait.cadence_steps_per_min';
    const put = (sha: string, v: number, session: string, date: string, model = NO_MODEL, at = '2031-01-01T00:00:00Z') =>
      commitScore(db, record(sha, { [c]: v }, model), id('H1', session, date), at);
    put('h1', 100, '1', '2031-01-01'); put('h2', 102, '1', '2031-01-01');
    put('h3', 104, '2', '2031-02-01'); put('h4', 106, '2', '2031-02-01');
    put('h5', 104.5, '3', '2031-03-01');
    // The same takes under another model, scored earlier, with values far away: never mixed in.
    const other: ModelRef = { file: 'm.json', file_sha256: 'ffff', used: true };
    put('h1', 50, '1', '2031-01-01', other, '2030-01-01T00:00:00Z');
    const h = subjectHistory(db, 'H1');
    expect(h.modelKey).toBe('none');
    expect(h.otherModels).toEqual(['ffff']);
    expect(h.sessions.map((s) => s.label)).toEqual(['1', '2', '3']);
    expect(h.reliability[c]!.sem).toBeCloseTo(Math.SQRT2, 12);
    expect(h.reliability[c]!.mdc95).toBeCloseTo(3.92, 12);
    const v = h.sessions.map((s) => s.values[c]!);
    expect(v.map((x) => x.mean)).toEqual([101, 105, 104.5]);
    // 105 − 101 = 4 > 3.92: beyond; 104.5 − 105 = −0.5: within (hand-computed).
    expect(v[1]).toMatchObject({ change: 4, beyondMdc: true });
    expect(v[2]).toMatchObject({ change: -0.5, beyondMdc: false });
    expect(v[0]!.change).toBeNull();
    const hOther = subjectHistory(db, 'H1', 'ffff');
    expect(hOther.sessions.map((s) => s.values[c]!.mean)).toEqual([50]);
    expect(hOther.reliability[c]!.mdc95).toBeNull();
    expect(() => subjectHistory(db, 'NOBODY')).toThrow(InputError);
    db.close();
  });
});

describe('forget', () => {
  it('removes every row of the subject, keeps the others, and leaves no trace of the code in the file', () => {
    const file = join(dir, 'f.sqlite');
    const db = openLedger(file);
    for (let i = 0; i < 40; i++) commitScore(db, record(`gone${i}`, { a: i }), id('ZEBRAFORGET', String(i % 3), '2031-01-01'));
    recordFailure(db, { sha256: 'gonebad', path: 'bad.bvh', bytes: 1 }, id('ZEBRAFORGET', '1', '2031-01-01'), NO_MODEL, 'bad', 't');
    commitScore(db, record('kept', { a: 1 }), id('KEEP1', '1', '2031-01-01'));
    const n = forgetSubject(db, 'ZEBRAFORGET');
    expect(n).toMatchObject({ subjects: 1, sessions: 3, takes: 41, scores: 40, failures: 1, score_values: 40 });
    expect(listScores(db).map((r) => r.subject)).toEqual(['KEEP1']);
    expect(db.prepare('SELECT count(*) AS n FROM takes').get()).toEqual({ n: 1 });
    expect(() => forgetSubject(db, 'ZEBRAFORGET')).toThrow(/not in this ledger/);
    db.close();
    const bytes = readFileSync(file).toString('latin1');
    expect(bytes.includes('ZEBRAFORGET')).toBe(false);
    if (existsSync(file + '-wal')) expect(readFileSync(file + '-wal').toString('latin1').includes('ZEBRAFORGET')).toBe(false);
  });
});

describe('merge', () => {
  it('adds scores and failures of each input, keeps the first score of a take, and leaves the inputs unchanged', () => {
    const a = join(dir, 'ma.sqlite'), b = join(dir, 'mb.sqlite'), out = join(dir, 'mout.sqlite');
    const da = openLedger(a), dbb = openLedger(b);
    commitScore(da, record('m1', { a: 1 }), id('M1', '1', '2031-01-01'));
    commitScore(da, record('m2', { a: 2 }), id('M1', '2', '2031-02-01'));
    commitScore(dbb, record('m2', { a: 99 }), id('M1', '2', '2031-02-01'));
    commitScore(dbb, record('m3', { a: 3 }), id('M2', '1', '2031-01-05'));
    recordFailure(dbb, { sha256: 'm4', path: 'm4.bvh', bytes: 1 }, id('M2', '1', '2031-01-05'), NO_MODEL, 'broken', 't');
    da.close(); dbb.close();
    const before = readFileSync(b);
    expect(mergeLedgers([a, b], out)).toEqual({ inputs: 2, scores: 3, already: 1, failures: 1 });
    expect(readFileSync(b).equals(before)).toBe(true);
    const m = openLedger(out);
    expect(listScores(m).map((r) => [r.subject, r.session, r.sha256, r.metrics.a])).toEqual([['M1', '1', 'm1', 1], ['M1', '2', 'm2', 2], ['M2', '1', 'm3', 3]]);
    expect(listFailures(m)).toMatchObject([{ path: 'm4.bvh', reason: 'broken', subject: 'M2' }]);
    m.close();
    expect(() => mergeLedgers([a, out], out)).toThrow(/also an input/);
    // Merging b again adds nothing: its scores are there, and its failure (same last attempt) is not counted twice.
    expect(mergeLedgers([b], out)).toEqual({ inputs: 1, scores: 0, already: 2, failures: 0 });
    const again = openLedger(out);
    expect(listFailures(again)).toMatchObject([{ path: 'm4.bvh', attempts: 1 }]);
    again.close();
  });

  it('a bad later input leaves no output, no private copy, and names the input', () => {
    const good = join(dir, 'mgood.sqlite'), newer = join(dir, 'mnewer.sqlite'), out = join(dir, 'mnever.sqlite');
    const g = openLedger(good);
    commitScore(g, record('n1', { a: 1 }), id('N1', '1', '2031-01-01'));
    g.close();
    const nw = openLedger(newer);
    nw.pragma('user_version = 99'); // a schema this version does not know
    nw.close();
    const copiesBefore = readdirSync(tmpdir()).filter((f) => f.startsWith('jointloom-merge-')).length;
    expect(() => mergeLedgers([good, newer], out)).toThrow(new RegExp(`^${newer.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: `));
    expect(existsSync(out)).toBe(false);
    expect(readdirSync(tmpdir()).filter((f) => f.startsWith('jointloom-merge-')).length).toBe(copiesBefore);
  });
});
