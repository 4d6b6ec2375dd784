// The gait report: one self-contained HTML page with angle curves over the gait cycle (left against
// right with SD bands and toe-off markers, over the reference band when a reference is used), the scores
// against the reference, the stride table, the symmetry table and the preprocessing.
import type { NormsScore } from '../norms/score.js';
import { escapeXml, linePlotSvg, type PlotSeries } from './svg.js';
import { htmlPage, htmlTable } from './html.js';

/** Line colours and dash patterns that tell the sides apart without colour too. */
export const SIDE_STYLE = {
  left: { colour: '#0f7b74', dash: '', label: 'Left (solid)' },
  right: { colour: '#b3541e', dash: '7 4', label: 'Right (dashed)' },
} as const;

interface CurveJson { mean: (number | null)[]; sd: (number | null)[]; cycles: number }
type SideKey = 'left' | 'right';

/** The parts of `jointloom gait --json` the report reads. */
export interface GaitReportData {
  file: string;
  version: string;
  fps: number;
  frames: number;
  duration_s: number;
  leg_length_m: number;
  preprocessing: { lowpass_hz: number | null; filter: string; steady_state_only: boolean; events_from: string; event_method: string };
  cadence_steps_per_min: number | null;
  speed_m_per_s: number | null;
  strides: Record<SideKey, number>;
  parameters: Record<SideKey, Record<string, { mean: number | null; sd: number | null; cv_pct: number | null; n: number }>>;
  knee_flexion_peak_swing_deg: Record<SideKey, number | null>;
  range_of_motion_deg: Record<SideKey, Record<string, number | null>>;
  toe_off_pct: Record<SideKey, number | null>;
  symmetry: Record<string, { left: number | null; right: number | null; symmetry_index_pct: number | null; symmetry_ratio: number | null; symmetry_angle_pct: number | null; note: string | null }>;
  asymmetry_flags: { measure: string; smaller_side: SideKey; symmetry_index_pct: number; text: string }[];
  curve_symmetry: Record<string, { correlation: number | null; lag_pct: number | null; note: string | null }>;
  curves: Record<string, Record<SideKey, CurveJson>>;
  stride_table: Record<string, number | string | null>[];
  passes: { index: number; start_s: number | null; end_s: number | null }[];
  excluded: { start_s: number | null; end_s: number | null; reason: string }[];
  warnings: string[];
  /** Scores against a reference, null when none is used (absent in results made before references). */
  norms?: NormsScore | null;
}

const PARAM_ROWS: [string, string, number][] = [
  ['cadence_steps_per_min', 'Cadence (steps/min)', 1],
  ['speed_m_per_s', 'Speed (m/s)', 2],
  ['speed_dimensionless', 'Speed / √(g·leg length)', 3],
  ['stride_length_m', 'Stride length (m)', 3],
  ['step_length_m', 'Step length (m)', 3],
  ['stride_time_s', 'Stride time (s)', 3],
  ['step_time_s', 'Step time (s)', 3],
  ['step_width_m', 'Step width (m)', 3],
  ['stance_pct', 'Stance (% cycle)', 1],
  ['swing_pct', 'Swing (% cycle)', 1],
  ['double_support_pct', 'Double support (% cycle)', 1],
];

const SYMMETRY_LABELS: Record<string, string> = {
  step_length_m: 'Step length (m)',
  stride_length_m: 'Stride length (m)',
  step_time_s: 'Step time (s)',
  stride_time_s: 'Stride time (s)',
  stance_pct: 'Stance (% cycle)',
  swing_pct: 'Swing (% cycle)',
  hip_flexion_rom_deg: 'Hip flexion range (°)',
  knee_flexion_rom_deg: 'Knee flexion range (°)',
  ankle_dorsiflexion_rom_deg: 'Ankle dorsiflexion range (°)',
  knee_flexion_peak_swing_deg: 'Peak swing knee flexion (°)',
};

function f(v: number | null | undefined, digits: number): string | null {
  return v === null || v === undefined || !Number.isFinite(v) ? null : v.toFixed(digits);
}

function num(a: (number | null)[]): number[] {
  return a.map((v) => (v === null ? NaN : v));
}

/** Returns the SVG plot of one angle: mean of each side with ±1 SD band and its mean toe-off. */
function anglePlot(d: GaitReportData, name: string, label: string): string {
  const c = d.curves[name]!;
  const x = Array.from({ length: c.left.mean.length }, (_, i) => (100 * i) / (c.left.mean.length - 1));
  const series: PlotSeries[] = (['left', 'right'] as const).map((s) => ({
    label: `${SIDE_STYLE[s].label}, ${c[s].cycles} cycles`,
    y: num(c[s].mean),
    band: num(c[s].sd),
    colour: SIDE_STYLE[s].colour,
    dash: SIDE_STYLE[s].dash,
  }));
  const markers = (['left', 'right'] as const)
    .filter((s) => d.toe_off_pct[s] !== null)
    .map((s) => ({ x: d.toe_off_pct[s]!, label: `${s === 'left' ? 'L' : 'R'} toe-off`, colour: SIDE_STYLE[s].colour, dash: s === 'left' ? '2 3' : '8 3 2 3' }));
  const ref = d.norms?.curves[name];
  const reference = ref
    ? { lower: ref.mean.map((m, i) => m - ref.sd[i]!), upper: ref.mean.map((m, i) => m + ref.sd[i]!), label: 'Reference ±1 SD' }
    : undefined;
  const plot = linePlotSvg({ title: label, xLabel: 'Gait cycle (%)', yLabel: 'Angle (°)', x, series, markers, reference });
  return d.norms ? `<div class="plot-with-strip">${plot}${outsideStrip(d.norms, name, label)}</div>` : plot;
}

/** Plot geometry of linePlotSvg the strip lines up with: width and the left and right margins. */
const PLOT_W = 480, PLOT_ML = 56, PLOT_MR = 12;

/** Returns a thin SVG strip under a plot: per side, the parts of the cycle where the mean curve is outside the reference mean ± 2 SD. */
function outsideStrip(n: NormsScore, name: string, label: string): string {
  const X = (pct: number) => PLOT_ML + (pct / 100) * (PLOT_W - PLOT_ML - PLOT_MR);
  const rows = (['left', 'right'] as const).map((s, k) => {
    const y = 6 + k * 13;
    const runs = n.outside[name]?.[s] ?? [];
    const bars = runs.map(([a, b]) => `<rect x="${X(a).toFixed(1)}" y="${y}" width="${Math.max(2, X(b) - X(a)).toFixed(1)}" height="9" fill="${SIDE_STYLE[s].colour}"${s === 'right' ? ' fill-opacity="0.75"' : ''}><title>${s} ${a}–${b} % outside ±2 SD</title></rect>`).join('');
    return `<text x="${PLOT_ML - 6}" y="${y + 8}" class="strip-label" text-anchor="end">${s === 'left' ? 'L' : 'R'}</text><rect x="${PLOT_ML}" y="${y}" width="${PLOT_W - PLOT_ML - PLOT_MR}" height="9" class="strip-track"/>${bars}`;
  }).join('');
  const total = (['left', 'right'] as const).reduce((t, s) => t + (n.outside[name]?.[s].length ?? 0), 0);
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${PLOT_W} 44" class="band-strip" role="img" aria-label="${escapeXml(`${label}: cycle outside the reference mean ± 2 SD`)}">${rows}<text x="${PLOT_ML}" y="41" class="strip-note">${total ? 'Filled: mean curve outside reference mean ± 2 SD' : 'Within reference mean ± 2 SD over the whole cycle'}</text></svg>`;
}

/** Returns the movement analysis profile as an SVG bar chart: per curve, left and right GVS bars with the reference takes' 95th percentile; then the GPS of each side and overall, with one MCID drawn past the overall bar. */
function profileChartSvg(n: NormsScore, labels: Record<string, string>, p95: Record<string, number> | null): string {
  const names = Object.keys(n.gvs);
  type Row = { label: string; bars: { v: number | null; colour: string; opacity: number; name: string }[]; mark: number | null };
  const L = { colour: SIDE_STYLE.left.colour, opacity: 1, name: 'left' }, R = { colour: SIDE_STYLE.right.colour, opacity: 0.72, name: 'right' };
  const rows: Row[] = names.map((k) => ({ label: (labels[k] ?? k).replace(/ \(.*\)$/, ''), bars: [{ ...L, v: n.gvs[k]!.left }, { ...R, v: n.gvs[k]!.right }], mark: p95?.[k] ?? null }));
  rows.push({ label: 'Gait profile score', bars: [{ ...L, v: n.gps.left }, { ...R, v: n.gps.right }, { colour: '#1d2433', opacity: 0.85, name: 'overall', v: n.gps.overall }], mark: n.gps.reference_p95 });
  const W = 700, ml = 160, mr = 70, top = 34, barH = 10, gap = 2, pad = 8;
  const rowH = (r: Row) => r.bars.length * (barH + gap) + pad;
  const plotH = rows.reduce((h, r) => h + rowH(r), 0);
  const H = top + plotH + 50;
  let hi = 1;
  for (const r of rows) for (const v of [...r.bars.map((b) => b.v), r.mark]) if (v !== null && v > hi) hi = v;
  if (n.gps.overall !== null) hi = Math.max(hi, n.gps.overall + n.gps.mcid_deg);
  const step = hi > 20 ? 5 : hi > 8 ? 2 : 1;
  const xmax = Math.ceil(hi / step) * step;
  const X = (v: number) => ml + (v / xmax) * (W - ml - mr);
  const parts = [`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" class="profile-chart" role="img" aria-label="Movement analysis profile">`,
    `<text x="10" y="20" class="plot-title">Gait variable scores: RMS difference from the reference mean (°)</text>`];
  for (let t = 0; t <= xmax + 1e-9; t += step)
    parts.push(`<line x1="${X(t).toFixed(1)}" x2="${X(t).toFixed(1)}" y1="${top - 4}" y2="${top + plotH}" class="grid"/><text x="${X(t).toFixed(1)}" y="${top + plotH + 14}" class="tick" text-anchor="middle">${t}</text>`);
  let y = top;
  rows.forEach((r, i) => {
    const last = i === rows.length - 1;
    const h = rowH(r);
    if (last) parts.push(`<line x1="10" x2="${W - 10}" y1="${y - 3}" y2="${y - 3}" class="sep"/>`);
    parts.push(`<text x="${ml - 8}" y="${y + h / 2 + 2}" class="row-label${last ? ' strong' : ''}" text-anchor="end">${escapeXml(r.label)}</text>`);
    r.bars.forEach((b, k) => {
      if (b.v === null) return;
      const by = y + pad / 2 + k * (barH + gap);
      parts.push(`<rect x="${ml}" y="${by}" width="${Math.max(1, X(b.v) - ml).toFixed(1)}" height="${barH}" fill="${b.colour}" fill-opacity="${b.opacity}"><title>${b.name} ${b.v.toFixed(2)}°</title></rect>`);
      if (b.name === 'overall') {
        parts.push(`<line x1="${X(b.v).toFixed(1)}" x2="${X(b.v + n.gps.mcid_deg).toFixed(1)}" y1="${by + barH / 2}" y2="${by + barH / 2}" class="mcid"><title>one MCID (${n.gps.mcid_deg}°) past the overall score</title></line>`);
        parts.push(`<text x="${(X(b.v + n.gps.mcid_deg) + 4).toFixed(1)}" y="${by + 9}" class="value">${b.v.toFixed(1)} overall</text>`);
      } else parts.push(`<text x="${(X(b.v) + 4).toFixed(1)}" y="${by + 9}" class="value">${b.v.toFixed(1)}</text>`);
    });
    if (r.mark !== null) parts.push(`<line x1="${X(r.mark).toFixed(1)}" x2="${X(r.mark).toFixed(1)}" y1="${y + 1}" y2="${y + h - 1}" class="p95"><title>reference takes' 95th percentile ${r.mark.toFixed(2)}°</title></line>`);
    y += h;
  });
  const ly = H - 12;
  let lx = 10;
  const item = (sym: string, text: string) => { parts.push(sym.replace(/LX/g, String(lx)).replace(/LY/g, String(ly)), `<text x="${lx + 20}" y="${ly}" class="legend">${escapeXml(text)}</text>`); lx += 28 + text.length * 6.1; };
  item(`<rect x="LX" y="${ly - 9}" width="14" height="9" fill="${SIDE_STYLE.left.colour}"/>`, 'Left');
  item(`<rect x="LX" y="${ly - 9}" width="14" height="9" fill="${SIDE_STYLE.right.colour}" fill-opacity="0.72"/>`, 'Right');
  item(`<rect x="LX" y="${ly - 9}" width="14" height="9" fill="#1d2433" fill-opacity="0.85"/>`, 'Both sides');
  item(`<line x1="${lx + 7}" x2="${lx + 7}" y1="${ly - 11}" y2="${ly + 1}" class="p95"/>`, "Reference takes' 95th percentile");
  item(`<line x1="${lx}" x2="${lx + 16}" y1="${ly - 4}" y2="${ly - 4}" class="mcid"/>`, `MCID ${n.gps.mcid_deg}° (Baker et al. 2012)`);
  parts.push('</svg>');
  return parts.join('');
}

/** Extra styles of the reference parts (the page shell's sheet stays as it is). */
const NORMS_STYLE = `<style>
.plot-with-strip { display: flex; flex-direction: column; gap: 0; }
.plot-with-strip .plot { border-bottom-left-radius: 0; border-bottom-right-radius: 0; }
.band-strip { width: 100%; height: auto; display: block; background: #fff; border: 1px solid var(--rule); border-top: none; border-radius: 0 0 4px 4px; }
.band-strip .strip-track { fill: #f0f1f5; }
.band-strip .strip-label, .band-strip .strip-note { font-size: 10px; fill: var(--muted); }
.profile-chart { width: 100%; max-width: 820px; height: auto; display: block; border: 1px solid var(--rule); border-radius: 4px; background: #fff; }
.profile-chart .plot-title { font-size: 13px; font-weight: 600; fill: var(--ink); }
.profile-chart .row-label { font-size: 12px; fill: var(--ink); }
.profile-chart .row-label.strong { font-weight: 700; }
.profile-chart .tick, .profile-chart .value, .profile-chart .legend { font-size: 11px; fill: var(--muted); }
.profile-chart .grid { stroke: #eceef3; }
.profile-chart .sep { stroke: #b9bfcc; }
.profile-chart .p95 { stroke: #3d4352; stroke-width: 2; stroke-dasharray: 3 2; }
.profile-chart .mcid { stroke: #6b4fa3; stroke-width: 3; }
.ref-label { border-left: 4px solid #8c93a3; background: #f1f2f5; padding: 8px 14px; margin: 8px 0; font-weight: 600; }
td.outside { background: #fbe9e0; font-weight: 600; }
</style>`;

const NORM_PARAM_LABELS: [string, string, number][] = [
  ['speed_dimensionless', 'Speed / √(g·leg length)', 3],
  ['speed_m_per_s', 'Speed (m/s)', 2],
  ['cadence_steps_per_min', 'Cadence (steps/min)', 1],
  ['stride_length_m', 'Stride length (m)', 3],
  ['step_length_m', 'Step length (m)', 3],
  ['stride_time_s', 'Stride time (s)', 3],
  ['step_width_m', 'Step width (m)', 3],
  ['stance_pct', 'Stance (% cycle)', 1],
  ['double_support_pct', 'Double support (% cycle)', 1],
  ['hip_flexion_rom_deg', 'Hip flexion range (°)', 1],
  ['knee_flexion_rom_deg', 'Knee flexion range (°)', 1],
  ['ankle_dorsiflexion_rom_deg', 'Ankle dorsiflexion range (°)', 1],
  ['knee_flexion_peak_swing_deg', 'Peak swing knee flexion (°)', 1],
  ['pelvis_obliquity_rom_deg', 'Pelvis obliquity range (°)', 1],
  ['pelvis_rotation_rom_deg', 'Pelvis rotation range (°)', 1],
];

/** Returns the report section of scores against the reference. */
function normsSection(n: NormsScore, labels: Record<string, string>, p95: Record<string, number> | null): string {
  const r = n.reference;
  const label = r.label ? `<p class="ref-label">${escapeXml(r.label[0]!.toUpperCase() + r.label.slice(1))}: the bands and scores below compare this take with ${r.synthetic ? 'synthetic controls from jointloom\'s walker' : 'the control takes of the reference'}${r.synthetic ? ', not with people. Build your clinic\'s own reference from its control takes with `jointloom norms build`.' : '.'}</p>` : '';
  const fx = (v: number | null | undefined, dg: number) => (v === null || v === undefined || !Number.isFinite(v) ? null : v.toFixed(dg));
  const facts = `<dl class="facts">
<dt>Reference</dt><dd>${escapeXml(r.file)} (${r.takes} control takes; built ${escapeXml(r.built ?? 'undated')}, jointloom ${escapeXml(r.tool_version)})</dd>
<dt>Band</dt><dd>${escapeXml(r.band_label)}: ${r.band_takes} takes, ${r.band_strides} strides; this take ${fx(n.speed_dimensionless, 3) ?? '–'} (speed / √(g·leg length), Hof 1996)${r.note ? `<br>${escapeXml(r.note)}` : ''}</dd>
<dt>Gait profile score</dt><dd><strong>${fx(n.gps.overall, 2) ?? '–'}°</strong> (left ${fx(n.gps.left, 2) ?? '–'}°, right ${fx(n.gps.right, 2) ?? '–'}°); minimal clinically important difference ${n.gps.mcid_deg}° (Baker et al. 2012); the band's own takes: median ${fx(n.gps.reference_median, 2) ?? '–'}°, 95th percentile ${fx(n.gps.reference_p95, 2) ?? '–'}°</dd>
<dt>Gait deviation index</dt><dd>${n.gdi ? `<strong>left ${fx(n.gdi.left.gdi, 1) ?? '–'}, right ${fx(n.gdi.right.gdi, 1) ?? '–'}</strong> (100 = reference mean, 10 points = 1 SD; ${n.gdi.features} features, ${n.gdi.left.strides} + ${n.gdi.right.strides} strides). ${escapeXml(n.gdi.note)}` : escapeXml(n.gdi_note ?? '–')}${n.gdi && n.gdi_note ? `<br>${escapeXml(n.gdi_note)}` : ''}</dd>
</dl>`;
  const warn = n.warnings.map((w) => `<p class="warn">${escapeXml(w)}</p>`).join('\n');
  const mapTable = htmlTable(['Curve', 'Left GVS °', 'Right GVS °', 'Reference takes 95th pct °', 'Outside ±2 SD (left)', 'Outside ±2 SD (right)'], [
    ...Object.entries(n.gvs).map(([k, v]) => [labels[k] ?? k, fx(v.left, 2), fx(v.right, 2), fx(p95?.[k], 2),
      n.outside[k]!.left.map(([a, b]) => `${a}–${b} %`).join(', ') || '–', n.outside[k]!.right.map(([a, b]) => `${a}–${b} %`).join(', ') || '–']),
    [{ raw: '<strong>Gait profile score</strong>' }, fx(n.gps.left, 2), fx(n.gps.right, 2), fx(n.gps.reference_p95, 2), { raw: `overall <strong>${fx(n.gps.overall, 2) ?? '–'}</strong>` }, ''],
  ]);
  const cell = (v: number | null, z: number | null, dg: number) => (v === null ? null : z !== null && Math.abs(z) > 2 ? { raw: `<span title="z = ${z.toFixed(1)}">${v.toFixed(dg)}</span>` } : v.toFixed(dg));
  const prow = NORM_PARAM_LABELS.filter(([k]) => n.parameters[k]).map(([k, lab, dg]) => {
    const p = n.parameters[k]!;
    return [lab, cell(p.left, p.z_left, dg), fx(p.z_left, 1), cell(p.right, p.z_right, dg), fx(p.z_right, 1), p.mean === null ? null : `${p.mean.toFixed(dg)} ± ${p.sd === null ? '–' : p.sd.toFixed(dg)}`, p.n];
  });
  let ptable = htmlTable(['Parameter', 'Left', 'Left z', 'Right', 'Right z', 'Reference mean ± SD', 'Reference n'], prow);
  // Mark the cells beyond ±2 SD (the cells carrying a z title).
  ptable = ptable.replace(/<td><span title="z = /g, '<td class="outside"><span title="z = ');
  return `${NORMS_STYLE}
<h2>Against the reference</h2>
${label}
${facts}
${warn}
<h3>Movement analysis profile</h3>
${profileChartSvg(n, labels, p95)}
${mapTable}
<h3>Parameters against the reference</h3>
<p class="sub">z = (take − reference mean) / reference SD; shaded cells lie outside mean ± 2 SD.</p>
${ptable}`;
}

/** Returns the whole report page. */
export function gaitReportHtml(d: GaitReportData, labels: Record<string, string>, caution: string): string {
  const sideHead = (s: SideKey) => `<span class="side-${s}">${s === 'left' ? 'Left' : 'Right'}</span>`;
  const facts = `<dl class="facts">
<dt>Take</dt><dd>${escapeXml(d.file)}</dd>
<dt>Frames</dt><dd>${d.frames} at ${f(d.fps, 2)} Hz (${f(d.duration_s, 1)} s)</dd>
<dt>Leg length</dt><dd>${f(d.leg_length_m, 3)} m (hip to ankle, rest pose)</dd>
<dt>Strides used</dt><dd>left ${d.strides.left}, right ${d.strides.right}</dd>
<dt>Walking passes</dt><dd>${d.passes.length}${d.excluded.length ? `; left out: ${d.excluded.map((x) => `${f(x.start_s, 1)}–${f(x.end_s, 1)} s ${escapeXml(x.reason)}`).join(', ')}` : ''}</dd>
<dt>Cadence</dt><dd>${f(d.cadence_steps_per_min, 1) ?? '–'} steps/min</dd>
<dt>Speed</dt><dd>${f(d.speed_m_per_s, 2) ?? '–'} m/s</dd>
</dl>`;
  const warnings = d.warnings.length ? d.warnings.map((w) => `<p class="warn">${escapeXml(w)}</p>`).join('\n') : '';
  const paramTable = htmlTable(
    ['Parameter', 'Left mean', 'Left SD', 'Left CV %', 'Right mean', 'Right SD', 'Right CV %'],
    PARAM_ROWS.map(([key, label, dg]) => {
      const l = d.parameters.left[key], r = d.parameters.right[key];
      return [label, f(l?.mean, dg), f(l?.sd, dg), f(l?.cv_pct, 1), f(r?.mean, dg), f(r?.sd, dg), f(r?.cv_pct, 1)];
    }),
  );
  const symTable = htmlTable(
    ['Measure', 'Left', 'Right', 'Symmetry index %', 'Ratio R/L', 'Symmetry angle %'],
    Object.entries(d.symmetry).map(([k, v]) => [
      SYMMETRY_LABELS[k] ?? k, f(v.left, 3), f(v.right, 3),
      v.note ? { raw: `<span title="${escapeXml(v.note)}">not computed</span>` } : f(v.symmetry_index_pct, 2),
      f(v.symmetry_ratio, 3), f(v.symmetry_angle_pct, 2),
    ]),
  );
  const curveTable = htmlTable(
    ['Angle curve', 'Correlation (best shift)', 'Lag of right, % cycle', 'Left range °', 'Right range °'],
    Object.entries(d.curve_symmetry).map(([k, v]) => [labels[k] ?? k, f(v.correlation, 3), f(v.lag_pct, 0), f(d.range_of_motion_deg.left[k], 1), f(d.range_of_motion_deg.right[k], 1)]),
  );
  const strideRows = d.stride_table.map((s) => [
    { raw: sideHead(s.side as SideKey) }, s.pass as number, f(s.start_s as number, 2), f(s.stride_time_s as number, 3), f(s.stride_length_m as number, 3),
    f(s.step_length_m as number, 3), f(s.step_width_m as number, 3), f(s.stance_pct as number, 1), f(s.double_support_pct as number, 1), f(s.speed_m_per_s as number, 2),
  ]);
  const strideTable = htmlTable(['Side', 'Pass', 'Start s', 'Stride time s', 'Stride length m', 'Step length m', 'Step width m', 'Stance %', 'Double support %', 'Speed m/s'], strideRows);
  const plots = Object.keys(d.curves).map((k) => anglePlot(d, k, labels[k] ?? k)).join('\n');
  const p = d.preprocessing;
  const prep = `<dl class="facts">
<dt>Low-pass filter</dt><dd>${p.lowpass_hz === null ? 'off' : `${p.lowpass_hz} Hz, ${escapeXml(p.filter)}`}, on joint positions</dd>
<dt>Gait events</dt><dd>${p.events_from === 'file' ? 'read from a reviewed events file; ' : ''}${escapeXml(p.event_method)}, bias-corrected on a synthetic calibration cohort</dd>
<dt>Steady state</dt><dd>${p.steady_state_only ? 'first and last steps of each walking pass left out' : 'every step used'}</dd>
<dt>Angles</dt><dd>from segment frames built on the joint centres, zero at the file's rest (standing) pose; positive directions as labelled</dd>
${d.norms ? `<dt>Reference scores</dt><dd>gait variable score: RMS over the 101 samples of (take mean − reference mean); gait profile score: RMS of the variable scores over 8 curves a side (Baker et al. 2009; the paper's 9 include hip rotation, which is not measured); deviation index after Schwartz and Rozumalski 2008 on the same 8 curves at 51 samples, with features from the reference's own control strides. Foot progression samples beyond ±60° (a near-vertical foot around toe-off) are left out of the scores.</dd>` : ''}
<dt>Symmetry</dt><dd>index (R − L) / (0.5 (R + L)) × 100 (Robinson et al. 1987; positive: right larger); ratio R / L; symmetry angle (Zifchock et al. 2008). Computed for strictly positive magnitudes only.</dd>
</dl>`;
  const body = `${facts}
${warnings}
<h2>Joint angles over the gait cycle</h2>
<p class="sub">Mean of each side with a ±1 SD band; vertical lines mark each side's mean toe-off. ${sideHead('left')} solid, ${sideHead('right')} dashed.${d.norms ? ` Grey: the reference mean ± 1 SD (${escapeXml(d.norms.reference.band_label)}${d.norms.reference.label ? `, ${escapeXml(d.norms.reference.label)}` : ''}); the strip under each plot fills where the side's mean curve leaves the reference mean ± 2 SD.` : ''}</p>
<div class="grid-plots">
${plots}
</div>
${d.norms ? normsSection(d.norms, labels, d.norms.gvs_reference_p95) : ''}
<h2>Spatiotemporal parameters</h2>
${paramTable}
<h2>Symmetry</h2>
${d.asymmetry_flags.length ? `<p>Beyond |symmetry index| 10 %: ${d.asymmetry_flags.map((a) => escapeXml(a.text)).join('; ')}.</p>` : '<p>No paired measure differs by more than 10 % between the sides.</p>'}
${symTable}
${curveTable}
<h2>Strides</h2>
${strideTable}
<h2>Preprocessing and methods</h2>
${prep}`;
  return htmlPage({
    title: 'Gait report',
    subtitle: `${d.file}, analysed by jointloom ${d.version}`,
    caution,
    body,
    footer: `jointloom ${d.version}. Figures depend on the skeleton's joint centres and the event detection; review the events (--events-out) before relying on them.`,
  });
}
