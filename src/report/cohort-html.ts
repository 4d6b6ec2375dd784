// The cohort report: a self-contained HTML page of every scored take of one model, the flagged takes,
// the failures, the distribution of asymmetry scores and each subject's trend across sessions.
import type { CohortData, CohortTake } from './cohort-data.js';
import { histogramSvg, trendSvg } from './cohort-svg.js';
import { htmlPage, htmlTable } from './html.js';
import { escapeXml } from './svg.js';

const PALETTE = ['#3b6ea8', '#b3541e', '#0f7b74', '#7a4fa3', '#9a7b00', '#a23b5b', '#4f6b2b', '#5a6275'];
const fx = (v: number | null | undefined, d: number) => (v === null || v === undefined || !Number.isFinite(v) ? null : v.toFixed(d));

/** The asymmetry scores drawn as distributions. */
const ASYMMETRY_SCORES: readonly [string, string][] = [
  ['norms.gps_overall_deg', 'Gait profile score (°)'],
  ['gait.max_abs_si_pct', 'Largest |symmetry index| (%)'],
  ['coupling.asymmetry_score', 'Coupling asymmetry (model)'],
];

/** The numbers followed across sessions. */
const TRENDS: readonly [string, string][] = [
  ['gait.speed_m_per_s', 'Walking speed (m/s)'],
  ['gait.cadence_steps_per_min', 'Cadence (steps/min)'],
  ['norms.gps_overall_deg', 'Gait profile score (°)'],
  ['gait.max_abs_si_pct', 'Largest |symmetry index| (%)'],
];

function takeRows(takes: readonly CohortTake[]) {
  return takes.map((t) => [t.subject, t.session, t.date, t.path, { raw: `<code title="${escapeXml(t.sha256)}">${escapeXml(t.sha256.slice(0, 8))}</code>` },
    fx(t.metrics['gait.cadence_steps_per_min'], 1), fx(t.metrics['gait.speed_m_per_s'], 2),
    fx(t.metrics['gait.stance_pct_left'], 1), fx(t.metrics['gait.stance_pct_right'], 1),
    fx(t.metrics['norms.gps_overall_deg'], 2), fx(t.metrics['norms.gdi_left'], 1), fx(t.metrics['norms.gdi_right'], 1),
    fx(t.metrics['gait.max_abs_si_pct'], 1), fx(t.metrics['coupling.asymmetry_score'], 2), fx(t.metrics['forecast.mpjpe_1s_mm'], 1), t.flags.length]);
}

/** Returns per subject the session labels in order and each metric's session mean. */
function sessionMeans(takes: readonly CohortTake[], metric: string): Map<string, number[]> {
  const by = new Map<string, Map<string, { date: string; xs: number[] }>>();
  for (const t of takes) {
    if (t.subject === null) continue;
    const s = by.get(t.subject) ?? by.set(t.subject, new Map()).get(t.subject)!;
    const k = t.session ?? '';
    const e = s.get(k) ?? s.set(k, { date: t.date ?? '', xs: [] }).get(k)!;
    const v = t.metrics[metric];
    if (typeof v === 'number') e.xs.push(v);
  }
  const out = new Map<string, number[]>();
  for (const [subj, sessions] of [...by.entries()].sort(([a], [b]) => a.localeCompare(b))) {
    const ordered = [...sessions.entries()].sort(([la, a], [lb, b]) => a.date.localeCompare(b.date) || la.localeCompare(lb, 'en', { numeric: true }));
    out.set(subj, ordered.map(([, e]) => (e.xs.length ? e.xs.reduce((s, v) => s + v, 0) / e.xs.length : NaN)));
  }
  return out;
}

/** Returns the cohort report as one HTML document with the caution. */
export function cohortHtml(d: CohortData, caution: string): string {
  const subjects = new Set(d.takes.map((t) => t.subject).filter((s) => s !== null));
  const flagged = d.takes.filter((t) => t.flags.length);
  const facts = [
    ['Ledger', d.ledger], ['Scored takes', String(d.takes.length)], ['Subjects', String(subjects.size)], ['Failed takes', String(d.failures.length)],
    ['Tool version', d.toolVersion], ['Model', d.model.sha256 ? `${d.model.file ?? ''} (SHA-256 ${d.model.sha256.slice(0, 16)}…)` : 'none (model hash recorded as null)'],
    ['Model note', d.model.note],
    ...[...new Set(d.takes.map((t) => t.options))].map((o) => ['Options', o] as [string, string]),
    ['Generated', d.generatedAt],
  ];
  const body: string[] = [];
  body.push(`<style>.cohort td:nth-child(-n+5), .cohort th:nth-child(-n+5) { text-align: left; white-space: nowrap; } .cohort { overflow-x: auto; } .cohort table { font-size: 13px; } .cohort th, .cohort td { padding: 3px 5px; } .flagged td, .flagged th { text-align: left; }</style>`);
  body.push('<h2>Run</h2><dl class="facts">' + facts.map(([k, v]) => `<dt>${escapeXml(k!)}</dt><dd>${escapeXml(v!)}</dd>`).join('') + '</dl>');
  body.push('<h2>Scored takes</h2><div class="cohort">' + htmlTable(
    ['Subject', 'Session', 'Date', 'Take', 'SHA-256', 'Cadence', 'Speed (m/s)', 'Stance L %', 'Stance R %', 'GPS (°)', 'GDI L', 'GDI R', 'Max |SI| %', 'Coupling asym.', 'Forecast 1 s (mm)', 'Flags'], takeRows(d.takes)) + '</div>');
  body.push('<h2>Flagged takes</h2>' + (flagged.length
    ? '<div class="flagged">' + htmlTable(['Subject', 'Session', 'Take', 'Flags'], flagged.map((t) => [t.subject, t.session, t.path, { raw: t.flags.map((f) => escapeXml(f.text)).join('<br>') }])) + '</div>'
    : '<p>No take has a paired measure beyond |symmetry index| 10 %.</p>'));
  if (d.failures.length) body.push('<h2>Takes that could not be scored</h2><div class="flagged">' + htmlTable(['Take', 'Reason', 'Attempts'], d.failures.map((f) => [f.path, f.reason, f.attempts])) + '</div>');
  body.push('<h2>Distribution of asymmetry scores</h2><div class="grid-plots">' + ASYMMETRY_SCORES.map(([m, label]) =>
    histogramSvg(label, label, d.takes.map((t) => t.metrics[m]).filter((v): v is number => typeof v === 'number'))).join('') + '</div>');
  const trendPlots: string[] = [];
  for (const [m, label] of TRENDS) {
    const means = sessionMeans(d.takes, m);
    const n = Math.max(0, ...[...means.values()].map((v) => v.length));
    if (n < 2) continue;
    const series = [...means.entries()].map(([subj, ys], i) => ({ label: subj, y: ys, colour: PALETTE[i % PALETTE.length]! }));
    trendPlots.push(trendSvg(label, label, series));
  }
  body.push('<h2>Trends across sessions</h2>' + (trendPlots.length ? `<div class="grid-plots">${trendPlots.join('')}</div>` : '<p>No subject has two sessions yet.</p>') +
    '<p class="sub">Session means per subject. Whether a change is beyond the minimal detectable change is shown by <code>jointloom ledger history &lt;subject&gt;</code>.</p>');
  return htmlPage({
    title: 'Cohort report',
    subtitle: `${d.takes.length} scored takes of ${subjects.size} subjects`,
    caution,
    body: body.join('\n'),
    footer: `jointloom ${d.toolVersion} · model ${d.model.key} · generated ${d.generatedAt} · every row carries its take's SHA-256 and options in the CSV`,
  });
}
