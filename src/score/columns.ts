// The score columns: every metric name of the stages in order, with a label and unit for tables.
import { DEFAULT_STAGES, type ScoreStage } from './stages.js';

/** Labels of the metrics, "<stage>.<name>" → short human label. */
export const METRIC_LABELS: Record<string, string> = {
  'gait.cadence_steps_per_min': 'Cadence (steps/min)',
  'gait.speed_m_per_s': 'Speed (m/s)',
  'gait.strides_left': 'Strides L', 'gait.strides_right': 'Strides R',
  'gait.stride_length_m_left': 'Stride length L (m)', 'gait.stride_length_m_right': 'Stride length R (m)',
  'gait.step_length_m_left': 'Step length L (m)', 'gait.step_length_m_right': 'Step length R (m)',
  'gait.stance_pct_left': 'Stance L (%)', 'gait.stance_pct_right': 'Stance R (%)',
  'gait.double_support_pct_left': 'Double support L (%)', 'gait.double_support_pct_right': 'Double support R (%)',
  'gait.step_width_m': 'Step width (m)',
  'gait.max_abs_si_pct': 'Largest |symmetry index| (%)',
  'gait.asymmetry_flags': 'Asymmetry flags',
  'norms.gps_left_deg': 'GPS L (°)', 'norms.gps_right_deg': 'GPS R (°)', 'norms.gps_overall_deg': 'GPS (°)',
  'norms.gdi_left': 'GDI L', 'norms.gdi_right': 'GDI R',
  'forecast.forecast_points': 'Forecasts', 'forecast.mpjpe_1s_mm': 'Forecast error at 1 s (mm)',
  'forecast.stride_mean_1s_mm': 'Stride-mean error at 1 s (mm)', 'forecast.coverage_90': '90 % band coverage',
  'forecast.surprise_median': 'Median surprise', 'forecast.irregular_steps': 'Irregular steps',
  'coupling.asymmetry_score': 'Coupling asymmetry', 'coupling.asymmetry_ci_low': 'Coupling asymmetry, 95 % low',
  'coupling.asymmetry_ci_high': 'Coupling asymmetry, 95 % high', 'coupling.side_right': 'Coupling side (1 = right)',
  'coupling.control_p90': 'Controls\' 90th percentile',
};

/** Returns every metric name the stages write, in stage order. */
export function metricNames(stages: readonly ScoreStage[] = DEFAULT_STAGES): string[] {
  return stages.flatMap((s) => s.metrics.map((m) => `${s.name}.${m}`));
}

/** Returns the label of a metric (its name when none is catalogued). */
export function metricLabel(name: string): string {
  return METRIC_LABELS[name] ?? name;
}
