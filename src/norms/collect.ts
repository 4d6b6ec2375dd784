// What a reference is built from and a take is scored on: per side, every cycle's angle curves and every
// per-stride parameter of one gait analysis.
import { REPORT_ANGLES, type GaitAnalysis } from '../gait/analyze.js';
import type { CycleAngleName } from '../gait/angles-cycles.js';
import type { Stride } from '../gait/params.js';
import type { SideName } from '../gait/types.js';
import { dimensionlessSpeed } from './strata.js';

/** Parameters a reference holds, each with its per-stride (or per-cycle) source. */
export const NORM_PARAMETERS = [
  'cadence_steps_per_min', 'speed_m_per_s', 'speed_dimensionless', 'stride_length_m', 'step_length_m',
  'stride_time_s', 'step_time_s', 'step_width_m', 'stance_pct', 'swing_pct', 'double_support_pct',
  ...REPORT_ANGLES.map((a) => `${a}_rom_deg`), 'knee_flexion_peak_swing_deg', 'toe_off_pct',
] as const;

const STRIDE_VALUE: Record<string, (s: Stride, leg: number) => number> = {
  cadence_steps_per_min: (s) => s.cadence_steps_per_min,
  speed_m_per_s: (s) => s.speed_m_per_s,
  speed_dimensionless: (s, leg) => dimensionlessSpeed(s.speed_m_per_s, leg),
  stride_length_m: (s) => s.strideLength_m,
  step_length_m: (s) => s.stepLength_m,
  stride_time_s: (s) => s.strideTime_s,
  step_time_s: (s) => s.stepTime_s,
  step_width_m: (s) => s.stepWidth_m,
  stance_pct: (s) => s.stance_pct,
  swing_pct: (s) => s.swing_pct,
  double_support_pct: (s) => s.doubleSupport_pct,
};

/** One side of one take: its cycles' curves (cycles × samples per angle) and per-stride parameter values. */
export interface SideSample {
  side: SideName;
  cycles: number;
  samples: number;
  curves: Record<CycleAngleName, Float64Array>;
  /** Per-cycle mean curve of each angle (NaN where no cycle has a value). */
  mean: Record<CycleAngleName, Float64Array>;
  parameters: Record<string, Float64Array>;
}

/** Both sides of one take with its walking speed. */
export interface TakeSample {
  file: string;
  /** Mean dimensionless speed over all strides (NaN when there are none). */
  speedDimensionless: number;
  left: SideSample;
  right: SideSample;
}

/** Returns the per-side cycle curves and parameter values of a gait analysis. */
export function sampleTake(a: GaitAnalysis, file: string): TakeSample {
  const leg = a.input.legLengthM;
  const side = (s: SideName): SideSample => {
    const cyc = a.cycles[s];
    const curves = {} as Record<CycleAngleName, Float64Array>;
    const mean = {} as Record<CycleAngleName, Float64Array>;
    let samples = 0;
    for (const name of REPORT_ANGLES) {
      const c = cyc.curves[name];
      curves[name] = c.curves;
      mean[name] = c.mean;
      samples = c.samples;
    }
    const strides = a.strides.filter((x) => x.side === s);
    const parameters: Record<string, Float64Array> = {};
    for (const [k, f] of Object.entries(STRIDE_VALUE)) parameters[k] = Float64Array.from(strides, (x) => f(x, leg));
    for (const name of REPORT_ANGLES) parameters[`${name}_rom_deg`] = cyc.rangeOfMotion[name];
    parameters.knee_flexion_peak_swing_deg = cyc.peakSwingKneeFlexion;
    parameters.toe_off_pct = cyc.toeOffPct;
    return { side: s, cycles: cyc.cycles.length, samples, curves, mean, parameters };
  };
  let n = 0, sum = 0;
  for (const x of a.strides) {
    const v = dimensionlessSpeed(x.speed_m_per_s, leg);
    if (Number.isFinite(v)) { n++; sum += v; }
  }
  return { file, speedDimensionless: n ? sum / n : NaN, left: side('left'), right: side('right') };
}

/** Returns the mean of the finite values (NaN when none). */
export function finiteMean(xs: ArrayLike<number>): number {
  let n = 0, s = 0;
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) { n++; s += xs[i]!; }
  return n ? s / n : NaN;
}
