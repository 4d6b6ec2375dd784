// A subject's trend across sessions: per session the mean of each key number over its takes; the
// SEM pooled from repeated takes within sessions; MDC95 = 1.96 × √2 × SEM; a change between
// consecutive sessions is flagged only when it exceeds the MDC95, and only among scores of one model.
import { InputError } from '../errors/index.js';
import type { Ledger } from './open.js';
import { listScores, type ScoreRow } from './query.js';

/** The key numbers a history follows. */
export const TREND_METRICS: readonly string[] = [
  'gait.cadence_steps_per_min', 'gait.speed_m_per_s', 'gait.stride_length_m_left', 'gait.stride_length_m_right',
  'gait.stance_pct_left', 'gait.stance_pct_right', 'gait.max_abs_si_pct', 'norms.gps_overall_deg', 'norms.gdi_left', 'norms.gdi_right',
];

/** One metric in one session. */
export interface SessionValue { mean: number | null; n: number; change: number | null; beyondMdc: boolean | null }

/** The history of one subject under one model. */
export interface SubjectHistory {
  subject: string;
  modelKey: string;
  otherModels: string[];
  sessions: { label: string; date: string | null; takes: number; values: Record<string, SessionValue> }[];
  /** Per metric: SEM (pooled within-session SD), its degrees of freedom, and MDC95; null without repeated takes. */
  reliability: Record<string, { sem: number | null; df: number; mdc95: number | null }>;
}

/** Returns the pooled within-session SD of groups of repeated values (null without any group of two), with its degrees of freedom. */
export function pooledSem(groups: readonly (readonly number[])[]): { sem: number | null; df: number } {
  let ss = 0, df = 0;
  for (const g of groups) {
    if (g.length < 2) continue;
    const m = g.reduce((s, v) => s + v, 0) / g.length;
    for (const v of g) ss += (v - m) ** 2;
    df += g.length - 1;
  }
  return { sem: df > 0 ? Math.sqrt(ss / df) : null, df };
}

/** Returns the minimal detectable change at 95 % confidence for a SEM: 1.96 × √2 × SEM. */
export function mdc95(sem: number): number {
  return 1.96 * Math.SQRT2 * sem;
}

/** Returns the history of `subject` under `modelKey` (default: the model of its latest score). */
export function subjectHistory(db: Ledger, subject: string, modelKey?: string): SubjectHistory {
  const all = listScores(db, { subject });
  if (!all.length) throw new InputError(`no scores for subject "${subject}" in this ledger.`);
  const latest = [...all].sort((a, b) => a.scoredAt.localeCompare(b.scoredAt)).pop()!;
  const key = modelKey ?? latest.modelKey;
  const rows = all.filter((r) => r.modelKey === key);
  if (!rows.length) throw new InputError(`no scores for subject "${subject}" with model ${key}.`);
  const otherModels = [...new Set(all.map((r) => r.modelKey).filter((k) => k !== key))].sort();
  const bySession = new Map<string, ScoreRow[]>();
  for (const r of rows) {
    const k = r.session ?? '';
    (bySession.get(k) ?? bySession.set(k, []).get(k)!).push(r);
  }
  const order = [...bySession.entries()].sort(([la, a], [lb, b]) => (a[0]!.date ?? '').localeCompare(b[0]!.date ?? '') || la.localeCompare(lb, 'en', { numeric: true }));
  const reliability: SubjectHistory['reliability'] = {};
  for (const m of TREND_METRICS) {
    const groups = order.map(([, rs]) => rs.map((r) => r.metrics[m]).filter((v): v is number => typeof v === 'number'));
    const p = pooledSem(groups);
    reliability[m] = { sem: p.sem, df: p.df, mdc95: p.sem === null ? null : mdc95(p.sem) };
  }
  const sessions: SubjectHistory['sessions'] = [];
  let prev: Record<string, number | null> = {};
  for (const [label, rs] of order) {
    const values: Record<string, SessionValue> = {};
    const now: Record<string, number | null> = {};
    for (const m of TREND_METRICS) {
      const xs = rs.map((r) => r.metrics[m]).filter((v): v is number => typeof v === 'number');
      const mean = xs.length ? xs.reduce((s, v) => s + v, 0) / xs.length : null;
      now[m] = mean;
      const before = prev[m];
      const change = mean !== null && before !== null && before !== undefined ? mean - before : null;
      const mdc = reliability[m]!.mdc95;
      values[m] = { mean, n: xs.length, change, beyondMdc: change === null || mdc === null ? null : Math.abs(change) > mdc };
    }
    prev = now;
    sessions.push({ label, date: rs[0]!.date, takes: rs.length, values });
  }
  return { subject, modelKey: key, otherModels, sessions, reliability };
}
