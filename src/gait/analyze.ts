// The gait analysis of one take: input, events, strides, angles, cycles and symmetry, in one result
// whose plain-data form is what `jointloom gait --json` prints and the HTML report draws.
import type { ImportedTake } from '../skeleton/import.js';
import { angleCycles, type CycleAngleName, type SideCycleAngles } from './angles-cycles.js';
import { jointAngles } from './angles.js';
import { CONTACT_BIAS_S, TOE_OFF_BIAS_S } from './calibration.js';
import { detectEvents, type EventOptions } from './events.js';
import { detectionFromEvents } from './events-review.js';
import { DEFAULT_LOWPASS_HZ, prepareGait, type GaitInput } from './input.js';
import { computeStrides, summarizeStrides, type Spatiotemporal, type Stride, type StrideParameter } from './params.js';
import { curveSymmetry, valuesSymmetry, type ValuesSymmetry } from './symmetry.js';
import type { EventDetection, GaitEvent, SideName } from './types.js';
import type { Summary } from './stats.js';

export interface GaitOptions {
  /** Low-pass cutoff in Hz, or null for no filter (default 6 Hz). */
  lowpassHz?: number | null;
  /** Leave out the first and last steps of each pass (default true). */
  steadyOnly?: boolean;
  /** Events given by the user (from an events file) instead of detected ones. */
  events?: GaitEvent[];
  eventOptions?: EventOptions;
}

/** Every figure of a gait analysis, still with typed arrays. */
export interface GaitAnalysis {
  input: GaitInput;
  detection: EventDetection;
  strides: Stride[];
  parameters: Spatiotemporal;
  cycles: Record<SideName, SideCycleAngles>;
  warnings: string[];
  options: { lowpassHz: number | null; steadyOnly: boolean; eventsFrom: 'detected' | 'file' };
}

/** Angles drawn and tabulated, in report order. */
export const REPORT_ANGLES: readonly CycleAngleName[] = [
  'pelvis_tilt', 'pelvis_obliquity', 'pelvis_rotation',
  'hip_flexion', 'hip_abduction', 'knee_flexion', 'ankle_dorsiflexion', 'foot_progression',
];

/** Human labels of the angles, with their positive direction. */
export const ANGLE_LABELS: Record<CycleAngleName, string> = {
  pelvis_tilt: 'Pelvis tilt (+ anterior)',
  pelvis_obliquity: 'Pelvis obliquity (+ this side up)',
  pelvis_rotation: 'Pelvis rotation (+ this side forward)',
  hip_flexion: 'Hip flexion (+ flexion)',
  hip_abduction: 'Hip abduction (+ abduction)',
  knee_flexion: 'Knee flexion (+ flexion)',
  ankle_dorsiflexion: 'Ankle dorsiflexion (+ dorsiflexion)',
  foot_progression: 'Foot progression (+ toe out)',
};

/** Returns the whole gait analysis of an imported take; throws InputError when there is no walking. */
export function analyzeGait(imported: ImportedTake, options: GaitOptions = {}): GaitAnalysis {
  const lowpassHz = options.lowpassHz === undefined ? DEFAULT_LOWPASS_HZ : options.lowpassHz;
  const steadyOnly = options.steadyOnly ?? true;
  const input = prepareGait(imported, lowpassHz);
  const eventOptions = { ...options.eventOptions, steadyOnly };
  const detection = options.events ? detectionFromEvents(input, options.events, eventOptions) : detectEvents(input, eventOptions);
  const strides = computeStrides(input, detection);
  const parameters = summarizeStrides(input, strides);
  const series = jointAngles(input, detection.direction);
  const cycles = angleCycles(series, detection.events, { steadyOnly });
  const warnings = [...imported.warnings, ...detection.warnings, ...parameters.warnings, ...series.warnings];
  return { input, detection, strides, parameters, cycles, warnings, options: { lowpassHz, steadyOnly, eventsFrom: options.events ? 'file' : 'detected' } };
}

const r3 = (v: number | null) => (v === null || !Number.isFinite(v) ? null : Math.round(v * 1000) / 1000);
const arr = (a: ArrayLike<number>) => Array.from(a, (v) => r3(v));
const sideMean = (s: Summary) => r3(s.mean);

/** The symmetry of one paired measure, ready for JSON. */
export interface SymmetryEntry {
  left: number | null;
  right: number | null;
  symmetry_index_pct: number | null;
  symmetry_ratio: number | null;
  symmetry_angle_pct: number | null;
  note: string | null;
}

function symmetryEntry(v: ValuesSymmetry): SymmetryEntry {
  return {
    left: r3(v.leftMean), right: r3(v.rightMean),
    symmetry_index_pct: r3(v.index.value), symmetry_ratio: r3(v.ratio.value), symmetry_angle_pct: r3(v.angle.value),
    note: v.index.reason,
  };
}

/** Stride parameters paired for symmetry: strictly positive magnitudes only (durations, lengths, shares). */
const SYMMETRY_PARAMETERS: readonly [StrideParameter, (s: Stride) => number][] = [
  ['step_length_m', (s) => s.stepLength_m],
  ['stride_length_m', (s) => s.strideLength_m],
  ['step_time_s', (s) => s.stepTime_s],
  ['stride_time_s', (s) => s.strideTime_s],
  ['stance_pct', (s) => s.stance_pct],
  ['swing_pct', (s) => s.swing_pct],
];

/** Returns the symmetry table: stride parameters, sagittal ranges of motion and peak swing knee flexion. */
export function symmetryTable(a: GaitAnalysis): Record<string, SymmetryEntry> {
  const out: Record<string, SymmetryEntry> = {};
  const L = a.strides.filter((s) => s.side === 'left'), R = a.strides.filter((s) => s.side === 'right');
  for (const [name, f] of SYMMETRY_PARAMETERS) out[name] = symmetryEntry(valuesSymmetry(L.map(f), R.map(f)));
  for (const angle of ['hip_flexion', 'knee_flexion', 'ankle_dorsiflexion'] as const)
    out[`${angle}_rom_deg`] = symmetryEntry(valuesSymmetry(a.cycles.left.rangeOfMotion[angle], a.cycles.right.rangeOfMotion[angle]));
  out.knee_flexion_peak_swing_deg = symmetryEntry(valuesSymmetry(a.cycles.left.peakSwingKneeFlexion, a.cycles.right.peakSwingKneeFlexion));
  return out;
}

/** |SI| above which a paired measure is flagged as asymmetric (common practice: about 10 %). */
export const ASYMMETRY_FLAG_PCT = 10;

/** A paired measure whose sides differ beyond the flag threshold, with the side that is smaller. */
export interface AsymmetryFlag {
  measure: string;
  smaller_side: SideName;
  symmetry_index_pct: number;
  text: string;
}

/** Returns the measures of the symmetry table whose |SI| exceeds the threshold, largest first. */
export function asymmetryFlags(table: Record<string, SymmetryEntry>, labels: Record<string, string> = {}): AsymmetryFlag[] {
  const out: AsymmetryFlag[] = [];
  for (const [measure, e] of Object.entries(table)) {
    const si = e.symmetry_index_pct;
    if (si === null || Math.abs(si) <= ASYMMETRY_FLAG_PCT) continue;
    const smaller: SideName = si < 0 ? 'right' : 'left';
    const larger = smaller === 'left' ? 'right' : 'left';
    const name = labels[measure] ?? measure.replace(/_rom_deg$/, ' range').replace(/_(m|s|pct|deg)$/, '').replace(/_/g, ' ');
    out.push({ measure, smaller_side: smaller, symmetry_index_pct: si, text: `${smaller} ${name} is smaller than ${larger} (symmetry index ${si.toFixed(1)} %)` });
  }
  return out.sort((a, b) => Math.abs(b.symmetry_index_pct) - Math.abs(a.symmetry_index_pct));
}

function mean(xs: ArrayLike<number>): number | null {
  let n = 0, s = 0;
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) { n++; s += xs[i]!; }
  return n ? s / n : null;
}

/** Returns the plain-data result (the JSON of `jointloom gait`), with provenance. */
export function gaitResultJson(a: GaitAnalysis, provenance: { tool: string; version: string; file: string }): Record<string, unknown> {
  const p = a.parameters;
  const pick = (k: StrideParameter) => ({ left: sideMean(p.left.summary[k]), right: sideMean(p.right.summary[k]) });
  const sym = symmetryTable(a);
  const byKind = (side: SideName, kind: GaitEvent['kind']) =>
    a.detection.events.filter((e) => e.side === side && e.kind === kind).map((e) => r3(e.time));
  const curves: Record<string, unknown> = {};
  const curveSym: Record<string, unknown> = {};
  for (const name of REPORT_ANGLES) {
    const side = (s: SideName) => ({ mean: arr(a.cycles[s].curves[name].mean), sd: arr(a.cycles[s].curves[name].sd), cycles: a.cycles[s].cycles.length });
    curves[name] = { left: side('left'), right: side('right') };
    const cs = curveSymmetry(a.cycles.left.curves[name].mean, a.cycles.right.curves[name].mean);
    curveSym[name] = cs.correlation === null ? { correlation: null, lag_pct: null, note: (cs as { reason: string }).reason } : { correlation: r3(cs.correlation), lag_pct: r3((cs as { lagPct: number }).lagPct), note: null };
  }
  const summaryJson = (s: Summary) => ({ mean: r3(s.mean), sd: r3(s.sd), cv_pct: r3(s.cv_pct), n: s.n });
  const sideParams = (side: SideName) =>
    Object.fromEntries(Object.entries(p[side].summary).map(([k, v]) => [k, summaryJson(v)]));
  const rom = (side: SideName) => Object.fromEntries(REPORT_ANGLES.map((n) => [n, r3(mean(a.cycles[side].rangeOfMotion[n]))]));
  return {
    tool: provenance.tool,
    version: provenance.version,
    file: provenance.file,
    fps: r3(a.input.fps),
    frames: a.input.frames,
    duration_s: r3(a.input.frames / a.input.fps),
    leg_length_m: r3(a.input.legLengthM),
    preprocessing: {
      lowpass_hz: a.options.lowpassHz,
      filter: a.options.lowpassHz === null ? 'none' : 'zero-lag fourth-order Butterworth (second order run forward and backward, cutoff corrected for the double pass)',
      steady_state_only: a.options.steadyOnly,
      events_from: a.options.eventsFrom,
      event_method: 'coordinate method (Zeni et al. 2008), cross-checked by foot-centre vertical velocity (O\'Connor et al. 2007)',
      event_bias_s: { initial_contact: CONTACT_BIAS_S, toe_off: TOE_OFF_BIAS_S },
    },
    cadence_steps_per_min: r3(p.cadence_steps_per_min.mean),
    speed_m_per_s: r3(p.speed_m_per_s.mean),
    strides: { left: p.left.strides.length, right: p.right.strides.length },
    stance_pct: pick('stance_pct'),
    swing_pct: pick('swing_pct'),
    double_support_pct: pick('double_support_pct'),
    step_length_m: pick('step_length_m'),
    stride_length_m: pick('stride_length_m'),
    stride_time_s: pick('stride_time_s'),
    step_time_s: pick('step_time_s'),
    step_width_m: pick('step_width_m'),
    speed_dimensionless: pick('speed_dimensionless'),
    knee_flexion_peak_swing_deg: { left: r3(mean(a.cycles.left.peakSwingKneeFlexion)), right: r3(mean(a.cycles.right.peakSwingKneeFlexion)) },
    symmetry_index_pct: Object.fromEntries(Object.entries(sym).map(([k, v]) => [k, v.symmetry_index_pct])),
    symmetry: sym,
    asymmetry_flags: asymmetryFlags(sym),
    curve_symmetry: curveSym,
    parameters: { left: sideParams('left'), right: sideParams('right') },
    range_of_motion_deg: { left: rom('left'), right: rom('right') },
    toe_off_pct: { left: r3(mean(a.cycles.left.toeOffPct)), right: r3(mean(a.cycles.right.toeOffPct)) },
    curves,
    events: {
      left: { initial_contact: byKind('left', 'initial_contact'), toe_off: byKind('left', 'toe_off') },
      right: { initial_contact: byKind('right', 'initial_contact'), toe_off: byKind('right', 'toe_off') },
    },
    passes: a.detection.passes.map((q) => ({ index: q.index, start_s: r3(q.startFrame / a.input.fps), end_s: r3(q.endFrame / a.input.fps) })),
    excluded: a.detection.excluded.map((x) => ({ start_s: r3(x.startFrame / a.input.fps), end_s: r3(x.endFrame / a.input.fps), reason: x.reason })),
    stride_table: a.strides.map((s) => ({
      side: s.side, pass: s.pass, start_s: r3(s.startFrame / a.input.fps), stride_time_s: r3(s.strideTime_s), stride_length_m: r3(s.strideLength_m),
      step_length_m: r3(s.stepLength_m), step_width_m: r3(s.stepWidth_m), stance_pct: r3(s.stance_pct), double_support_pct: r3(s.doubleSupport_pct),
      speed_m_per_s: r3(s.speed_m_per_s), cadence_steps_per_min: r3(s.cadence_steps_per_min),
    })),
    warnings: a.warnings,
  };
}
