// The score record: everything one take yields, as plain data, with its provenance. Numbers that a
// ledger, a CSV or a trend needs live in `metrics` under "<stage>.<name>"; each stage may also leave a
// small `detail` object. A new stage (the forecast surprise timeline, the coupling asymmetry) adds its
// own metric names and detail key; nothing else in the record changes.

/** Format name and version of a score record. */
export const RECORD_FORMAT = 'jointloom-score';
export const RECORD_VERSION = 1;

/** The model a score was made with; `file_sha256` is null when no model was given. */
export interface ModelRef {
  file: string | null;
  file_sha256: string | null;
  /** Whether any stage used the model (the forecast stage, when the take is long enough). */
  used: boolean;
}

/** Where a record comes from: the tool, the model, the take and the options that made it. */
export interface Provenance {
  tool: string;
  tool_version: string;
  model: ModelRef;
  take_sha256: string;
  options: ScoreOptionsJson;
  stages: { name: string; version: number }[];
}

/** The scoring options as recorded. */
export interface ScoreOptionsJson {
  lowpass_hz: number | null;
  steady_only: boolean;
  norms_file: string | null;
  norms_sha256: string | null;
}

/** One asymmetry or deviation flag a stage raised. */
export interface ScoreFlag {
  stage: string;
  measure: string;
  value: number;
  text: string;
}

/** The whole result of scoring one take. */
export interface ScoreRecord {
  format: typeof RECORD_FORMAT;
  version: number;
  take: { path: string; sha256: string; bytes: number; frames: number; fps: number; duration_s: number };
  provenance: Provenance;
  metrics: Record<string, number | null>;
  flags: ScoreFlag[];
  detail: Record<string, unknown>;
  warnings: string[];
}

/** The model key of a record in the ledger: the model file's SHA-256, or "none". */
export function modelKey(model: ModelRef): string {
  return model.file_sha256 ?? 'none';
}
