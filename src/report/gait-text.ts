// The gait result as a short text table for the terminal, and its strides as CSV.
import type { GaitReportData } from './gait-html.js';

const ROWS: [string, string, number, string | null][] = [
  ['stride_time_s', 'stride time (s)', 3, 'stride_time_s'],
  ['step_time_s', 'step time (s)', 3, 'step_time_s'],
  ['stride_length_m', 'stride length (m)', 3, 'stride_length_m'],
  ['step_length_m', 'step length (m)', 3, 'step_length_m'],
  ['step_width_m', 'step width (m)', 3, null],
  ['stance_pct', 'stance (%)', 1, 'stance_pct'],
  ['swing_pct', 'swing (%)', 1, 'swing_pct'],
  ['double_support_pct', 'double support (%)', 1, null],
  ['speed_m_per_s', 'speed (m/s)', 2, null],
  ['cadence_steps_per_min', 'cadence (steps/min)', 1, null],
];

const fx = (v: number | null | undefined, d: number) => (v === null || v === undefined ? '–' : v.toFixed(d));

/** Returns the terminal summary of a gait result. */
export function gaitText(d: GaitReportData): string {
  const lines: string[] = [];
  const lp = d.preprocessing.lowpass_hz === null ? 'no low-pass' : `${d.preprocessing.lowpass_hz} Hz low-pass`;
  lines.push(`${d.file}: ${d.strides.left} left and ${d.strides.right} right strides, ${d.passes.length} walking pass${d.passes.length === 1 ? '' : 'es'}, ${lp}`);
  lines.push(`  cadence ${fx(d.cadence_steps_per_min, 1)} steps/min, speed ${fx(d.speed_m_per_s, 2)} m/s`);
  lines.push(`  ${''.padEnd(22)}${'left'.padStart(9)}${'right'.padStart(9)}${'SI %'.padStart(9)}`);
  for (const [key, label, dg, sym] of ROWS) {
    const si = sym ? d.symmetry[sym]?.symmetry_index_pct : null;
    lines.push(`  ${label.padEnd(22)}${fx(d.parameters.left[key]?.mean, dg).padStart(9)}${fx(d.parameters.right[key]?.mean, dg).padStart(9)}${(sym ? fx(si, 1) : '').padStart(9)}`);
  }
  const knee = d.symmetry.knee_flexion_peak_swing_deg;
  lines.push(`  ${'peak swing knee (°)'.padEnd(22)}${fx(d.knee_flexion_peak_swing_deg.left, 1).padStart(9)}${fx(d.knee_flexion_peak_swing_deg.right, 1).padStart(9)}${fx(knee?.symmetry_index_pct, 1).padStart(9)}`);
  for (const [k, label] of [['knee_flexion_rom_deg', 'knee range (°)'], ['hip_flexion_rom_deg', 'hip range (°)'], ['ankle_dorsiflexion_rom_deg', 'ankle range (°)']] as const) {
    const s = d.symmetry[k];
    lines.push(`  ${label.padEnd(22)}${fx(s?.left, 1).padStart(9)}${fx(s?.right, 1).padStart(9)}${fx(s?.symmetry_index_pct, 1).padStart(9)}`);
  }
  lines.push('  SI = (R - L) / (0.5 (R + L)) x 100, positive: right larger (Robinson et al. 1987)');
  if (d.asymmetry_flags.length) {
    lines.push(`  asymmetry beyond |SI| ${10} %`);
    for (const a of d.asymmetry_flags) lines.push(`    - ${a.text}`);
  }
  if (d.warnings.length) {
    lines.push('  warnings');
    for (const w of d.warnings) lines.push(`    ! ${w}`);
  }
  return lines.join('\n');
}

/** Returns the stride table as CSV (one row a stride). */
export function stridesCsv(d: GaitReportData): string {
  const cols = ['side', 'pass', 'start_s', 'stride_time_s', 'stride_length_m', 'step_length_m', 'step_width_m', 'stance_pct', 'double_support_pct', 'speed_m_per_s', 'cadence_steps_per_min'];
  const rows = [cols.join(',')];
  for (const s of d.stride_table) rows.push(cols.map((c) => (s[c] === null || s[c] === undefined ? '' : String(s[c]))).join(','));
  return rows.join('\n') + '\n';
}
