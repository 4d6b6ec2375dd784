// `jointloom batch` run as a child process, as a user runs it: resuming after SIGKILL, bad takes,
// an unwritable output folder, two batches on one ledger, shards merged, and the exit statuses.
import { spawn } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { metricNames } from '../../src/score/columns.js';
import { cohortSpecs, writeTakes } from '../score/fixtures.js';
import { writeTinyModel } from '../view/tiny-model.js';

/** Numbers per score: every metric of the default stages (gait, norms, forecast, coupling). */
const PER_SCORE = metricNames().length;

const repo = resolve(import.meta.dirname, '..', '..');
const dir = mkdtempSync(join(tmpdir(), 'jointloom-batch-'));
const takes = join(dir, 'takes');
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface Run { code: number | null; signal: NodeJS.Signals | null; stdout: string; stderr: string }

/** Starts `jointloom <args>` from source; returns the child and a promise of its result. */
function start(args: string[]) {
  const child = spawn(process.execPath, ['--import', 'tsx', join(repo, 'src', 'cli', 'main.ts'), ...args], { cwd: repo, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '', stderr = '';
  child.stdout.on('data', (d) => (stdout += String(d)));
  child.stderr.on('data', (d) => (stderr += String(d)));
  const done = new Promise<Run>((res) => child.on('close', (code, signal) => res({ code, signal, stdout, stderr })));
  return { child, done };
}
const jointloom = (args: string[]) => start(args).done;

/** Returns the ledger's rows as comparable plain data (no ids, no times). */
function dump(file: string) {
  const db = new Database(file, { readonly: true });
  try {
    const scores = db.prepare(`SELECT sub.code AS subject, se.label AS session, se.date, t.path, t.sha256, s.model_key, s.tool_version, s.options_json,
        (SELECT group_concat(name || '=' || coalesce(value, 'null'), ';') FROM (SELECT name, value FROM score_values v WHERE v.score_id = s.id ORDER BY name)) AS vals
      FROM scores s JOIN takes t ON t.id = s.take_id JOIN sessions se ON se.id = t.session_id JOIN subjects sub ON sub.id = se.subject_id ORDER BY t.sha256, s.model_key`).all();
    const failures = db.prepare('SELECT t.path, f.reason FROM failures f JOIN takes t ON t.id = f.take_id ORDER BY t.path').all();
    return { scores, failures };
  } finally { db.close(); }
}
const count = (file: string, sql: string): number => {
  const db = new Database(file, { readonly: true, timeout: 5000 });
  try { return (db.prepare(sql).get() as { n: number }).n; } finally { db.close(); }
};

const N = 8;
beforeAll(() => { writeTakes(takes, cohortSpecs(N)); });

describe('jointloom batch', () => {
  it('killed with SIGKILL after the first commit and run again, scores every take exactly once and redoes none', async () => {
    const ledger = join(dir, 'kill.sqlite');
    const { child, done } = start(['batch', takes, '--ledger', ledger, '--workers', '1', '--quiet']);
    // Poll the ledger (WAL lets a reader in beside the writer) until one take is committed, then kill.
    let seen = 0;
    for (let i = 0; i < 600 && seen === 0 && child.exitCode === null; i++) {
      await new Promise((r) => setTimeout(r, 100));
      if (existsSync(ledger)) { try { seen = count(ledger, 'SELECT count(*) AS n FROM scores'); } catch { /* still being created */ } }
    }
    child.kill('SIGKILL');
    const killed = await done;
    expect(killed.signal).toBe('SIGKILL');
    const before = new Database(ledger, { readonly: true }).prepare('SELECT s.id, t.sha256, s.scored_at FROM scores s JOIN takes t ON t.id = s.take_id ORDER BY s.id').all() as { id: number; sha256: string; scored_at: string }[];
    expect(before.length).toBeGreaterThanOrEqual(1);
    expect(before.length).toBeLessThan(N); // killed halfway, not after the end
    const again = await jointloom(['batch', takes, '--ledger', ledger, '--workers', '2', '--json']);
    expect(again.code).toBe(0);
    const s = JSON.parse(again.stdout);
    expect(s.skipped).toBe(before.length);
    expect(s.scored).toBe(N - before.length);
    expect(count(ledger, 'SELECT count(*) AS n FROM scores')).toBe(N);
    expect(count(ledger, 'SELECT count(DISTINCT take_id) AS n FROM scores')).toBe(N);
    expect(count(ledger, 'SELECT count(*) AS n FROM takes')).toBe(N);
    expect(count(ledger, 'SELECT count(*) AS n FROM failures')).toBe(0);
    // Every score has all its numbers (every column of the default stages): none half-written.
    expect(count(ledger, 'SELECT count(*) AS n FROM score_values')).toBe(N * PER_SCORE);
    const after = new Database(ledger, { readonly: true }).prepare('SELECT s.id, t.sha256, s.scored_at FROM scores s JOIN takes t ON t.id = s.take_id ORDER BY s.id').all();
    expect(after.slice(0, before.length)).toEqual(before); // finished takes were not redone
  });

  it('a model file is recorded by its SHA-256; the same takes under another model are scored again, beside the old scores', async () => {
    const ledger = join(dir, 'kill.sqlite'); // N scores with the shipped model, from the test above
    const bad = join(dir, 'bad-model.json');
    writeFileSync(bad, 'abc');
    const refused = await jointloom(['batch', takes, '--ledger', ledger, '--model', bad, '--json']);
    // A corrupt model file is refused before any work, naming the file.
    expect(refused.code).toBe(1);
    expect(refused.stderr).toContain(bad);
    const model = await writeTinyModel(dir);
    const r = await jointloom(['batch', takes, '--ledger', ledger, '--model', model, '--workers', '2', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const s = JSON.parse(r.stdout);
    // The key is the file's SHA-256, checked against node:crypto.
    expect(s.model_key).toBe(createHash('sha256').update(readFileSync(model)).digest('hex'));
    expect(s.provenance.model).toMatchObject({ file: model, file_sha256: s.model_key });
    expect(s.scored).toBe(N);
    expect(count(ledger, 'SELECT count(*) AS n FROM scores')).toBe(2 * N);
    expect(count(ledger, `SELECT count(*) AS n FROM scores WHERE model_key = '${s.model_key}'`)).toBe(N);
    // The schema's 'none' row, the shipped model and the tiny one.
    expect(count(ledger, 'SELECT count(*) AS n FROM models')).toBe(3);
  });

  it('records a corrupt take and a take without subject with their reasons, scores the others and exits 3', async () => {
    const mixed = join(dir, 'mixed');
    mkdirSync(mixed, { recursive: true });
    for (const f of ['T01-1-0', 'T01-1-1']) { copyFileSync(join(takes, `${f}.bvh`), join(mixed, `${f}.bvh`)); copyFileSync(join(takes, `${f}.json`), join(mixed, `${f}.json`)); }
    const text = readFileSync(join(takes, 'T01-2-2.bvh'), 'utf8');
    writeFileSync(join(mixed, 'broken.bvh'), text.slice(0, Math.floor(text.length / 2)) + '\n12.5 x7 3\n');
    copyFileSync(join(takes, 'T01-2-2.json'), join(mixed, 'broken.json'));
    copyFileSync(join(takes, 'T01-2-3.bvh'), join(mixed, 'nobody.bvh')); // no sidecar, not in <subject>/<session>/
    const ledger = join(dir, 'mixed.sqlite'), out = join(dir, 'mixed-out');
    const r = await jointloom(['batch', mixed, '--ledger', ledger, '--out', out]);
    expect(r.code).toBe(3);
    expect(r.stdout).toMatch(/2 scored, 0 already in the ledger, 2 failed/);
    expect(r.stderr).toMatch(/broken\.bvh: not scored: broken\.bvh:\d+:\d+: expected/);
    expect(r.stderr).toMatch(/nobody\.bvh: not scored: .*no subject and session/);
    expect(dump(ledger).failures).toHaveLength(2);
    expect(count(ledger, 'SELECT count(*) AS n FROM scores')).toBe(2);
    const html = readFileSync(join(out, 'cohort-report.html'), 'utf8');
    expect(html).toContain('Takes that could not be scored');
    expect(html).toContain('not a diagnostic device');
    expect(readFileSync(join(out, 'cohort.csv'), 'utf8').trim().split('\n')).toHaveLength(3); // header and two takes
    // Run again: the good takes are skipped, the bad ones tried and counted again.
    const r2 = await jointloom(['batch', mixed, '--ledger', ledger, '--json']);
    expect(r2.code).toBe(3);
    expect(JSON.parse(r2.stdout)).toMatchObject({ scored: 0, skipped: 2 });
    expect(count(ledger, 'SELECT max(attempts) AS n FROM failures')).toBe(2);
  });

  it('with every take bad exits 1; with no takes it exits 1 naming the folder', async () => {
    const bad = join(dir, 'allbad');
    mkdirSync(bad, { recursive: true });
    writeFileSync(join(bad, 'x.bvh'), 'HIERARCHY\nROOT');
    writeFileSync(join(bad, 'x.json'), JSON.stringify({ subject: 'B1', session: 1 }));
    expect((await jointloom(['batch', bad, '--ledger', join(dir, 'allbad.sqlite'), '--quiet'])).code).toBe(1);
    const empty = join(dir, 'empty');
    mkdirSync(empty, { recursive: true });
    const r = await jointloom(['batch', empty, '--ledger', join(dir, 'empty.sqlite')]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/no BVH takes found/);
  });

  it('an unwritable output folder is a clear error before any work', async () => {
    const file = join(dir, 'a-file');
    writeFileSync(file, 'x');
    const ledger = join(dir, 'never.sqlite');
    const r = await jointloom(['batch', takes, '--ledger', ledger, '--out', join(file, 'report')]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/the output folder cannot be written .*nothing was scored/);
    expect(r.stderr.split('\n').filter(Boolean)).toHaveLength(1);
    expect(existsSync(ledger)).toBe(false);
  });

  it('two batches on one ledger at the same time leave every take scored once', async () => {
    const ledger = join(dir, 'both.sqlite');
    const [a, b] = await Promise.all([
      jointloom(['batch', takes, '--ledger', ledger, '--workers', '1', '--json']),
      jointloom(['batch', takes, '--ledger', ledger, '--workers', '1', '--json']),
    ]);
    expect(a.code, a.stderr).toBe(0);
    expect(b.code, b.stderr).toBe(0);
    const sa = JSON.parse(a.stdout), sb = JSON.parse(b.stdout);
    expect(sa.scored + sb.scored).toBe(N);
    expect(sa.scored + sa.skipped + sa.already).toBe(N);
    expect(count(ledger, 'SELECT count(*) AS n FROM scores')).toBe(N);
    expect(count(ledger, 'SELECT count(DISTINCT take_id) AS n FROM scores')).toBe(N);
    expect(count(ledger, 'SELECT count(*) AS n FROM score_values')).toBe(N * PER_SCORE);
    const db = new Database(ledger, { readonly: true });
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
    expect(db.pragma('foreign_key_check')).toEqual([]);
    db.close();
  });

  it('shard runs merged equal one unsharded run', async () => {
    const whole = join(dir, 'whole.sqlite'), s1 = join(dir, 's1.sqlite'), s2 = join(dir, 's2.sqlite'), merged = join(dir, 'merged.sqlite');
    const [rw, r1, r2] = await Promise.all([
      jointloom(['batch', takes, '--ledger', whole, '--workers', '1', '--json']),
      jointloom(['batch', takes, '--ledger', s1, '--workers', '1', '--shard', '1/2', '--json']),
      jointloom(['batch', takes, '--ledger', s2, '--workers', '1', '--shard', '2/2', '--json']),
    ]);
    for (const r of [rw, r1, r2]) expect(r.code, r.stderr).toBe(0);
    const j1 = JSON.parse(r1.stdout), j2 = JSON.parse(r2.stdout);
    expect(j1.in_shard + j2.in_shard).toBe(N);
    expect(j1.in_shard).toBeGreaterThan(0);
    expect(j2.in_shard).toBeGreaterThan(0);
    const m = await jointloom(['ledger', 'merge', s1, s2, '-o', merged]);
    expect(m.code, m.stderr).toBe(0);
    expect(m.stdout).toMatch(new RegExp(`${N} scores added`));
    expect(dump(merged)).toEqual(dump(whole));
    expect(dump(merged).scores).toHaveLength(N);
  });
});
