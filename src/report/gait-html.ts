// The gait report: one self-contained HTML page with angle curves over the gait cycle (left against
// right with SD bands and toe-off markers), the stride table, the symmetry table and the preprocessing.
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
  return linePlotSvg({ title: label, xLabel: 'Gait cycle (%)', yLabel: 'Angle (°)', x, series, markers });
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
<dt>Symmetry</dt><dd>index (R − L) / (0.5 (R + L)) × 100 (Robinson et al. 1987; positive: right larger); ratio R / L; symmetry angle (Zifchock et al. 2008). Computed for strictly positive magnitudes only.</dd>
</dl>`;
  const body = `${facts}
${warnings}
<h2>Joint angles over the gait cycle</h2>
<p class="sub">Mean of each side with a ±1 SD band; vertical lines mark each side's mean toe-off. ${sideHead('left')} solid, ${sideHead('right')} dashed.</p>
<div class="grid-plots">
${plots}
</div>
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
