// The side panel's forecast section: where the forecast starts and, when the take holds the recorded
// future, its mean per-joint error against the stride-mean baseline; DOM nodes and text only.
import type { ViewForecastInfo } from '../../src/view/types.js';
import type { ForecastState } from './forecast-control.js';

function el<K extends keyof HTMLElementTagNameMap>(tag: K, text?: string, cls?: string): HTMLElementTagNameMap[K] {
  const e = document.createElement(tag);
  if (text !== undefined) e.textContent = text;
  if (cls) e.className = cls;
  return e;
}

/** Methods listed in the error table, with their labels. */
const METHODS: readonly [string, string][] = [
  ['model', 'coupling model'],
  ['stride_mean', 'stride mean'],
  ['last_stride', 'last stride'],
  ['constant_velocity', 'constant velocity'],
  ['zero_motion', 'standing still'],
];

const mm = (v: number | undefined) => (typeof v === 'number' && Number.isFinite(v) ? v.toFixed(0) : '–');

/** Fills `root` with the forecast section for `state` (info null: no model was given). */
export function renderForecastPanel(root: HTMLElement, info: ViewForecastInfo | null, state: ForecastState): void {
  root.replaceChildren();
  if (!info) {
    root.append(el('p', 'no model given: forecast off', 'muted'), el('p', 'Start the viewer with --model FILE (a model from `jointloom fit`) to draw its forecast.', 'muted'));
    return;
  }
  const note = el('p', `${info.model} · the next ${info.horizonS} s from the current time, after ${info.observeS} s observed`, 'muted');
  switch (state.kind) {
    case 'off':
      root.append(note, el('p', 'Tick "forecast" or press F to draw it.', 'muted'));
      return;
    case 'early':
      root.append(note, el('p', `The forecast starts at ${state.firstS.toFixed(2)} s: move on past it.`));
      return;
    case 'waiting':
      root.append(note, el('p', `forecasting from ${state.fromS.toFixed(2)} s …`, 'muted'));
      return;
    case 'error':
      root.append(note, el('p', state.message, 'flag'));
      return;
    case 'shown':
      break;
  }
  const f = state.forecast;
  root.append(el('p', `from ${f.time_s.toFixed(2)} s · mean and ${f.samples.length} samples`, 'muted'));
  const s = f.scores;
  if (!s) {
    root.append(el('p', 'The take ends within this forecast second: no recorded future to score it against.', 'muted'));
    return;
  }
  const h1 = s.horizons_s.indexOf(1);
  const big = el('div', undefined, 'big');
  for (const [label, value] of [
    ['model error at 1 s, mm', mm(s.mpjpe_mm.model?.[h1])],
    ['stride mean at 1 s, mm', mm(s.mpjpe_mm.stride_mean?.[h1])],
    ['in 90 % band', s.coverage_90 === null ? '–' : `${Math.round(100 * s.coverage_90)} %`],
  ] as const) {
    const d = el('div');
    d.append(el('b', value), el('span', label, 'muted'));
    big.append(d);
  }
  root.append(big);
  const table = el('table');
  const head = el('tr');
  head.append(el('th', 'joint error, mm'), ...s.horizons_s.map((h) => el('th', `${h} s`)));
  table.append(head);
  for (const [key, label] of METHODS) {
    const e = s.mpjpe_mm[key];
    if (!e) continue;
    const tr = el('tr', undefined, key === 'model' ? 'forecast-row' : undefined);
    tr.append(el('td', label), ...e.map((v) => el('td', mm(v))));
    table.append(tr);
  }
  root.append(table);
  root.append(el('p', 'Error against what the take recorded; a check of the model, not a clinical measure.', 'muted'));
}
