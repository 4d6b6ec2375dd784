// `jointloom ledger history|export|report|forget|merge` in-process on a ledger filled by a batch.
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { commitScore } from '../../src/ledger/store.js';
import { openLedger } from '../../src/ledger/open.js';
import { RECORD_FORMAT, type ScoreRecord } from '../../src/score/record.js';
import { cohortSpecs, writeTakes } from '../score/fixtures.js';
import { runCli } from './run.js';

const dir = mkdtempSync(join(tmpdir(), 'jointloom-ledger-cli-'));
const takes = join(dir, 'takes');
const ledger = join(dir, 'l.sqlite');
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// Four takes of T01: two in session 1, two in session 2 (sidecars), scored in-process by one worker thread.
beforeAll(async () => {
  writeTakes(takes, cohortSpecs(4, 4300));
  const r = await runCli(['batch', takes, '--ledger', ledger, '--workers', '1', '--quiet', '--json']);
  expect(r.code, r.stderr).toBe(0);
});

describe('jointloom ledger', () => {
  it('history lists the sessions with the MDC95 from repeated takes, and a usage error for an unknown subject', async () => {
    const r = await runCli(['ledger', 'history', 'T01', '--ledger', ledger, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const h = JSON.parse(r.stdout);
    expect(h.sessions.map((s: { label: string; takes: number }) => [s.label, s.takes])).toEqual([['1', 2], ['2', 2]]);
    const rel = h.reliability['gait.cadence_steps_per_min'];
    expect(rel.df).toBe(2); // (2 − 1) + (2 − 1) degrees of freedom (hand-computed)
    expect(rel.mdc95).toBeCloseTo(1.96 * Math.SQRT2 * rel.sem, 12); // MDC95 = 1.96 × √2 × SEM
    const v = h.sessions[1].values['gait.cadence_steps_per_min'];
    expect(v.beyondMdc).toBe(Math.abs(v.change) > rel.mdc95);
    const text = await runCli(['ledger', 'history', 'T01', '--ledger', ledger]);
    expect(text.stdout).toMatch(/Cadence \(steps\/min\)\s+\(MDC95 [\d.]+\)/);
    const none = await runCli(['ledger', 'history', 'NOBODY', '--ledger', ledger]);
    expect(none.code).toBe(1);
    expect(none.stderr).toMatch(/no scores for subject "NOBODY"/);
    const missing = await runCli(['ledger', 'history']);
    expect(missing.code).toBe(2);
  });
  it('export writes one CSV row per score with provenance and the score columns; new columns appear without a schema change', async () => {
    // A record with a column no stage writes yet (as a forecast stage would add), committed beside the others.
    const db = openLedger(ledger);
    const extra: ScoreRecord = {
      format: RECORD_FORMAT, version: 1, take: { path: 'future.bvh', sha256: 'f00d', bytes: 1, frames: 1, fps: 100, duration_s: 0.01 },
      provenance: { tool: 'jointloom', tool_version: 'x', model: { file: 'm.json', file_sha256: 'beef', used: true }, take_sha256: 'f00d', options: { lowpass_hz: 6, steady_only: true, norms_file: null, norms_sha256: null }, stages: [] },
      metrics: { 'forecast.surprise_max': 2.5 }, flags: [], detail: {}, warnings: [],
    };
    commitScore(db, extra, { subject: 'T09', session: '1', date: null, from: 'sidecar' });
    db.close();
    const csv = join(dir, 'all.csv');
    const r = await runCli(['ledger', 'export', '--csv', csv, '--ledger', ledger]);
    expect(r.code, r.stderr).toBe(0);
    const lines = readFileSync(csv, 'utf8').trim().split('\n');
    expect(lines).toHaveLength(1 + 5);
    const head = lines[0]!.split(',');
    expect(head.slice(0, 5)).toEqual(['subject', 'session', 'date', 'take', 'take_sha256']);
    expect(head).toContain('gait.cadence_steps_per_min');
    expect(head).toContain('forecast.surprise_max');
    const only = await runCli(['ledger', 'export', '--csv', '-', '--ledger', ledger, '--model', 'beef']);
    expect(only.stdout.trim().split('\n')).toHaveLength(2);
    expect(only.stdout).toMatch(/T09,1,,future\.bvh,f00d,beef/);
  });
  it('report writes the cohort HTML and CSV of one model\'s scores (default: the latest score\'s model); an unknown model is refused', async () => {
    const rows = (await runCli(['ledger', 'export', '--csv', '-', '--ledger', ledger])).stdout.trim().split('\n').slice(1);
    const batchKey = rows.find((l) => l.startsWith('T01,'))!.split(',')[5]!;
    expect(batchKey).toMatch(/^[0-9a-f]{64}$/); // the batch scored with the shipped model, keyed by its SHA-256
    const out = join(dir, 'report');
    const r = await runCli(['ledger', 'report', '--out', out, '--ledger', ledger, '--model', batchKey]);
    expect(r.code, r.stderr).toBe(0);
    const html = readFileSync(join(out, 'cohort-report.html'), 'utf8');
    expect(html).toContain('Trends across sessions');
    expect(html).toContain('not a diagnostic device');
    expect(html).not.toMatch(/<script|https?:\/\//); // self-contained, no scripts or network
    const csv = readFileSync(join(out, 'cohort.csv'), 'utf8').trim().split('\n').slice(1);
    expect(csv.filter((l) => l.startsWith('T01,'))).toHaveLength(4);
    // The record committed by the export test above is the latest score, under model key "beef".
    const latest = join(dir, 'report-latest');
    expect((await runCli(['ledger', 'report', '--out', latest, '--ledger', ledger])).code).toBe(0);
    expect(readFileSync(join(latest, 'cohort.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(',')[0])).toEqual(['T09']);
    const unknown = join(dir, 'report-unknown');
    const bad = await runCli(['ledger', 'report', '--out', unknown, '--ledger', ledger, '--model', 'cafe']);
    expect(bad.code).toBe(1);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
    expect(bad.stderr).toMatch(/no scores under model cafe; the ledger holds .*beef/);
    expect(existsSync(join(unknown, 'cohort-report.html'))).toBe(false);
  });
  it('forget removes the subject and says what went', async () => {
    const r = await runCli(['ledger', 'forget', 'T01', '--ledger', ledger]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/4 takes, 2 sessions, 4 scores/);
    expect((await runCli(['ledger', 'history', 'T01', '--ledger', ledger])).code).toBe(1);
    expect(existsSync(ledger)).toBe(true);
  });
  it('help carries the caution and the exit statuses of batch', async () => {
    const r = await runCli(['batch', '--help']);
    expect(r.stdout).toMatch(/3 some takes failed/);
    expect(r.stdout).toMatch(/not a diagnostic device/);
  });
});
