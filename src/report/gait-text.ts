// The gait result as a short text table for the terminal, and its strides as CSV.
import type { NormsScore } from '../norms/score.js';
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
  if (d.norms) lines.push(...normsLines(d.norms));
  if (d.warnings.length) {
    lines.push('  warnings');
    for (const w of d.warnings) lines.push(`    ! ${w}`);
  }
  return lines.join('\n');
}

const ANGLE_SHORT: Record<string, string> = {
  pelvis_tilt: 'pelvis tilt', pelvis_obliquity: 'pelvis obliquity', pelvis_rotation: 'pelvis rotation', hip_flexion: 'hip flexion',
  hip_abduction: 'hip abduction', knee_flexion: 'knee flexion', ankle_dorsiflexion: 'ankle dorsiflexion', foot_progression: 'foot progression',
};

/** Returns the lines of the scores against a reference. */
function normsLines(n: NormsScore): string[] {
  const r = n.reference;
  const out: string[] = [];
  out.push(`  against ${r.file}${r.label ? ` (${r.label})` : ''}: band ${r.band_label}, ${r.band_strides} strides; take speed / sqrt(g L) ${fx(n.speed_dimensionless, 3)}`);
  if (r.note) out.push(`    note: ${r.note}`);
  out.push(`  gait profile score ${fx(n.gps.overall, 2)}° (left ${fx(n.gps.left, 2)}°, right ${fx(n.gps.right, 2)}°); MCID ${n.gps.mcid_deg}° (Baker et al. 2012); band's takes median ${fx(n.gps.reference_median, 2)}°, 95th pct ${fx(n.gps.reference_p95, 2)}°`);
  if (n.gdi) out.push(`  gait deviation index left ${fx(n.gdi.left.gdi, 1)}, right ${fx(n.gdi.right.gdi, 1)} (100 = reference mean, 10 = 1 SD; 8 curves, no hip rotation)`);
  else out.push(`  gait deviation index: ${n.gdi_note ?? 'none'}`);
  out.push(`  ${'GVS (°)'.padEnd(22)}${'left'.padStart(9)}${'right'.padStart(9)}   outside mean ± 2 SD`);
  for (const [k, v] of Object.entries(n.gvs)) {
    const o = n.outside[k]!;
    const runs = (['left', 'right'] as const).flatMap((s) => o[s].map(([a, b]) => `${s[0]!.toUpperCase()} ${a}-${b} %`)).join(', ');
    out.push(`  ${(ANGLE_SHORT[k] ?? k).padEnd(22)}${fx(v.left, 2).padStart(9)}${fx(v.right, 2).padStart(9)}   ${runs}`);
  }
  const far = Object.entries(n.parameters).filter(([, p]) => p.outside.length);
  if (far.length) out.push(`  parameters outside mean ± 2 SD: ${far.map(([k, p]) => `${k} (${p.outside.join(', ')})`).join('; ')}`);
  for (const w of n.warnings) out.push(`    ! ${w}`);
  if (n.gdi_note && n.gdi) out.push(`    note: ${n.gdi_note}`);
  return out;
}

/** Returns the stride table as CSV (one row a stride). */
export function stridesCsv(d: GaitReportData): string {
  const cols = ['side', 'pass', 'start_s', 'stride_time_s', 'stride_length_m', 'step_length_m', 'step_width_m', 'stance_pct', 'double_support_pct', 'speed_m_per_s', 'cadence_steps_per_min'];
  const rows = [cols.join(',')];
  for (const s of d.stride_table) rows.push(cols.map((c) => (s[c] === null || s[c] === undefined ? '' : String(s[c]))).join(','));
  return rows.join('\n') + '\n';
}
