// The cohort as CSV: one row per score with its provenance and every metric column.
import type { CohortTake } from './cohort-data.js';

/** Returns a CSV field quoted when needed (RFC 4180). */
export function csvField(v: string | number | null): string {
  if (v === null) return '';
  const s = String(v);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Returns the CSV of the takes with the given metric columns (names as in the ledger). */
export function cohortCsv(takes: readonly CohortTake[], metrics: readonly string[]): string {
  const head = ['subject', 'session', 'date', 'take', 'take_sha256', 'model', 'tool_version', 'scored_at', 'options', ...metrics, 'flags'];
  const lines = [head.join(',')];
  for (const t of takes) {
    lines.push([t.subject, t.session, t.date, t.path, t.sha256, t.modelKey, t.toolVersion, t.scoredAt, t.options,
      ...metrics.map((m) => t.metrics[m] ?? null), t.flags.map((f) => f.text).join('; ')].map(csvField).join(','));
  }
  return lines.join('\n') + '\n';
}
