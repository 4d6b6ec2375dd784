// The side panel's walk summary, from the gait result (the JSON of `jointloom gait`); built with DOM
// nodes and text only (no HTML strings), so nothing in a take's names can inject markup.
import type { ViewGait } from '../../src/view/types.js';

type Num = number | null | undefined;
type Sided = { left: Num; right: Num } | undefined;

function el<K extends keyof HTMLElementTagNameMap>(tag: K, text?: string, cls?: string): HTMLElementTagNameMap[K] {
  const e = document.createElement(tag);
  if (text !== undefined) e.textContent = text;
  if (cls) e.className = cls;
  return e;
}

const fmt = (v: Num, digits: number) => (typeof v === 'number' && Number.isFinite(v) ? v.toFixed(digits) : '–');

/** Rows of the per-side table: label, key in the result, decimals, key in the symmetry table. */
const ROWS: readonly [string, string, number, string | null][] = [
  ['stance %', 'stance_pct', 1, 'stance_pct'],
  ['swing %', 'swing_pct', 1, 'swing_pct'],
  ['double support %', 'double_support_pct', 1, null],
  ['step length m', 'step_length_m', 3, 'step_length_m'],
  ['stride length m', 'stride_length_m', 3, 'stride_length_m'],
  ['step time s', 'step_time_s', 3, 'step_time_s'],
  ['stride time s', 'stride_time_s', 3, 'stride_time_s'],
  ['step width m', 'step_width_m', 3, null],
  ['peak swing knee flexion °', 'knee_flexion_peak_swing_deg', 1, 'knee_flexion_peak_swing_deg'],
];

/** Fills `root` with the walk summary, or with the reason there is none. */
export function renderSummary(root: HTMLElement, gait: ViewGait): void {
  root.replaceChildren();
  if (!gait.available) {
    root.append(el('p', 'No gait summary for this take.', 'muted'), el('p', gait.reason));
    return;
  }
  const r = gait.result as Record<string, unknown>;
  const strides = r.strides as Sided;
  const big = el('div', undefined, 'big');
  for (const [label, value] of [
    ['cadence steps/min', fmt(r.cadence_steps_per_min as Num, 1)],
    ['speed m/s', fmt(r.speed_m_per_s as Num, 2)],
    ['strides left / right', `${strides?.left ?? 0} / ${strides?.right ?? 0}`],
  ] as const) {
    const d = el('div');
    d.append(el('b', value), el('span', label, 'muted'));
    big.append(d);
  }
  root.append(big);

  root.append(el('h3', 'per side'));
  const table = el('table');
  const head = el('tr');
  head.append(el('th', ''), el('th', 'left', 'l'), el('th', 'right', 'r'), el('th', 'SI %'));
  table.append(head);
  const sym = (r.symmetry ?? {}) as Record<string, { symmetry_index_pct: Num }>;
  for (const [label, key, digits, symKey] of ROWS) {
    const v = r[key] as Sided;
    const tr = el('tr');
    const si = symKey ? sym[symKey]?.symmetry_index_pct : null;
    tr.append(el('td', label), el('td', fmt(v?.left, digits)), el('td', fmt(v?.right, digits)), el('td', symKey ? fmt(si, 1) : ''));
    table.append(tr);
  }
  root.append(table);
  root.append(el('p', 'SI: symmetry index 100·(R − L) / ½(R + L), Robinson et al. 1987; positive when right is larger.', 'muted'));

  const flags = (r.asymmetry_flags ?? []) as { text: string }[];
  root.append(el('h3', 'sides differ by more than 10 %'));
  if (flags.length) {
    const ul = el('ul');
    for (const f of flags) ul.append(el('li', f.text, 'flag'));
    root.append(ul);
  } else root.append(el('p', 'none', 'muted'));

  const warnings = (r.warnings ?? []) as string[];
  if (warnings.length) {
    root.append(el('h3', `notes (${warnings.length})`));
    const ul = el('ul');
    for (const w of warnings) ul.append(el('li', w, 'muted'));
    root.append(ul);
  }
}
