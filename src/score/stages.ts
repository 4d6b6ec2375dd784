// The stages of scoring, in order. Each reads the shared context (the imported take, results of the
// stages before it) and returns its metrics, flags and a small detail object. The forecast surprise
// timeline (forecast-stage.ts) and the coupling asymmetry (coupling-stage.ts) follow them.
import { analyzeGait, gaitResultJson, type GaitAnalysis } from '../gait/analyze.js';
import type { NormsFile } from '../norms/format.js';
import { scoreAgainstNorms } from '../norms/score.js';
import type { DomainCheck } from '../model/domain.js';
import type { Track } from '../motion/track.js';
import type { ImportedTake } from '../skeleton/import.js';
import { COUPLING_STAGE } from './coupling-stage.js';
import { FORECAST_STAGE } from './forecast-stage.js';
import type { ScoreFlag } from './record.js';

/** What every stage can read; stages fill in their own results for the stages after them. */
export interface StageContext {
  imported: ImportedTake;
  lowpassHz: number | null;
  steadyOnly: boolean;
  norms: { file: string; data: NormsFile } | null;
  /** The coupling model file (the forecast stage reads it), or null for no model-based stage. */
  modelFile: string | null;
  gait?: GaitAnalysis;
  gaitJson?: Record<string, unknown>;
  /** The take as a model-rate track, built once for the model-based stages (model-cache.ts modelTrack). */
  track?: Track;
  /** Whether the take lies in the model's straight-walking domain, checked once (model-cache.ts takeDomain). */
  domain?: DomainCheck;
}

/** The output of one stage. */
export interface StageResult {
  metrics: Record<string, number | null>;
  flags?: ScoreFlag[];
  detail?: unknown;
  warnings?: string[];
  /** True when the stage used the model. */
  usedModel?: boolean;
}

/** One scoring stage. `metrics` lists the names it writes (without the stage prefix). */
export interface ScoreStage {
  name: string;
  version: number;
  metrics: readonly string[];
  run(ctx: StageContext): StageResult;
}

type Pair = { left: number | null; right: number | null };

/** The gait stage: spatiotemporal parameters, symmetry indices and asymmetry flags. */
export const GAIT_STAGE: ScoreStage = {
  name: 'gait',
  version: 1,
  metrics: [
    'cadence_steps_per_min', 'speed_m_per_s', 'strides_left', 'strides_right',
    'stride_length_m_left', 'stride_length_m_right', 'step_length_m_left', 'step_length_m_right',
    'stance_pct_left', 'stance_pct_right', 'double_support_pct_left', 'double_support_pct_right',
    'step_width_m', 'max_abs_si_pct', 'asymmetry_flags',
  ],
  run(ctx): StageResult {
    const a = analyzeGait(ctx.imported, { lowpassHz: ctx.lowpassHz, steadyOnly: ctx.steadyOnly });
    const j = gaitResultJson(a, { tool: 'jointloom', version: '', file: ctx.imported.path });
    ctx.gait = a;
    ctx.gaitJson = j;
    const p = (k: string) => j[k] as Pair;
    const strides = j.strides as { left: number; right: number };
    const si = j.symmetry_index_pct as Record<string, number | null>;
    let maxSi: number | null = null, maxMeasure: string | null = null;
    for (const [k, v] of Object.entries(si)) if (v !== null && (maxSi === null || Math.abs(v) > maxSi)) { maxSi = Math.abs(v); maxMeasure = k; }
    const flags = (j.asymmetry_flags as { measure: string; symmetry_index_pct: number; text: string }[]).map((f) => ({ stage: 'gait', measure: f.measure, value: f.symmetry_index_pct, text: f.text }));
    const width = p('step_width_m');
    const widths = [width.left, width.right].filter((v): v is number => v !== null);
    return {
      metrics: {
        cadence_steps_per_min: j.cadence_steps_per_min as number | null,
        speed_m_per_s: j.speed_m_per_s as number | null,
        strides_left: strides.left, strides_right: strides.right,
        stride_length_m_left: p('stride_length_m').left, stride_length_m_right: p('stride_length_m').right,
        step_length_m_left: p('step_length_m').left, step_length_m_right: p('step_length_m').right,
        stance_pct_left: p('stance_pct').left, stance_pct_right: p('stance_pct').right,
        double_support_pct_left: p('double_support_pct').left, double_support_pct_right: p('double_support_pct').right,
        step_width_m: widths.length ? widths.reduce((s, v) => s + v, 0) / widths.length : null,
        max_abs_si_pct: maxSi,
        asymmetry_flags: flags.length,
      },
      flags,
      detail: { max_abs_si_measure: maxMeasure, symmetry_index_pct: si },
      warnings: j.warnings as string[],
    };
  },
};

/** The norms stage: gait profile and deviation scores against the reference (skipped without one). */
export const NORMS_STAGE: ScoreStage = {
  name: 'norms',
  version: 1,
  metrics: ['gps_left_deg', 'gps_right_deg', 'gps_overall_deg', 'gdi_left', 'gdi_right'],
  run(ctx): StageResult {
    if (!ctx.norms || !ctx.gait) return { metrics: {}, detail: { reference: null } };
    const s = scoreAgainstNorms(ctx.gait, ctx.norms.data, ctx.norms.file);
    return {
      metrics: {
        gps_left_deg: s.gps.left, gps_right_deg: s.gps.right, gps_overall_deg: s.gps.overall,
        gdi_left: s.gdi?.left.gdi ?? null, gdi_right: s.gdi?.right.gdi ?? null,
      },
      detail: { reference: s.reference.file, band: s.reference.band, synthetic: s.reference.synthetic, stratum: s.stratum, gdi_note: s.gdi_note },
      warnings: s.warnings,
    };
  },
};

/** The stages every batch runs, in order. */
export const DEFAULT_STAGES: readonly ScoreStage[] = [GAIT_STAGE, NORMS_STAGE, FORECAST_STAGE, COUPLING_STAGE];
