// The norms file: a versioned JSON reference of angle curves, parameters, profile-score spread and the
// deviation-index model, per band (all speeds and, when built with speed bands, each speed stratum).
// Reading checks the format tag, the version and every shape, and refuses anything else with an InputError.
import { readFileSync } from 'node:fs';
import { InputError } from '../errors/index.js';
import { STRATA, type StratumName } from './strata.js';

/** Format tag of a norms file. */
export const NORMS_FORMAT = 'jointloom-norms';
/** Version written; readers accept this version only. */
export const NORMS_VERSION = 1;
/** Label every output carries when the reference is synthetic. */
export const SYNTHETIC_LABEL = 'synthetic reference, not clinical';

export type BandName = 'all' | StratumName;
export const BAND_NAMES: readonly BandName[] = ['all', ...STRATA];

/** Mean, SD and count of one scalar. */
export interface ScalarNorm { mean: number | null; sd: number | null; n: number }

/** One angle curve of the reference: per-sample mean and SD over the strides, and how many strides. */
export interface CurveNorm {
  mean: number[];
  sd: number[];
  /** Fewest strides with a value at any one sample. */
  strides: number;
}

/** The deviation-index model of a band (Schwartz and Rozumalski 2008, adapted; see gdi.ts). */
export interface DeviationModel {
  curves: string[];
  samples_per_curve: number;
  features: number;
  /** Share of the control strides' sum of squares the kept features hold. */
  retained: number;
  /** Control mean in feature space (features values). */
  feature_mean: number[];
  /** Control mean gait vector (curves × samples_per_curve values). */
  vector_mean: number[];
  /** Row-major features × (curves × samples_per_curve). */
  basis: number[];
  /** Mean and SD of ln(distance) of the control strides from the control mean. */
  ln_distance: { mean: number; sd: number };
  strides: number;
}

/** How the profile score spreads over the band's own takes (each take side scored against the band). */
export interface ProfileSpread {
  takes: number;
  gps_median: number;
  gps_p95: number;
  /** Per angle, the 95th percentile of the take sides' gait variable scores. */
  gvs_p95: Record<string, number>;
}

/** One band of the reference. */
export interface NormsBand {
  /** Strides (one side's gait cycles) of the band's takes, both sides together. */
  strides: number;
  takes: number;
  speed_dimensionless: { mean: number; sd: number | null; min: number; max: number };
  curves: Record<string, CurveNorm>;
  parameters: Record<string, ScalarNorm>;
  profile: ProfileSpread | null;
  deviation: DeviationModel | null;
  /** Why the deviation model is missing, or null. */
  deviation_note: string | null;
}

/** One control take as recorded in the provenance. */
export interface NormsTake {
  file: string;
  sha256: string;
  speed_dimensionless: number;
  stratum: StratumName;
  strides: { left: number; right: number };
}

export interface NormsProvenance {
  synthetic: boolean;
  label: string | null;
  tool: string;
  tool_version: string;
  /** ISO date of the build, or null (the shipped reference carries a fixed build label instead). */
  date: string | null;
  build: string | null;
  description: string;
  analysis: { lowpass_hz: number | null; steady_state_only: boolean };
  takes: NormsTake[];
}

/** The whole norms file. */
export interface NormsFile {
  format: typeof NORMS_FORMAT;
  version: typeof NORMS_VERSION;
  provenance: NormsProvenance;
  speed_strata: { measure: string; slow_below: number; fast_above: number; source: string };
  samples: number;
  angles: string[];
  bands: Partial<Record<BandName, NormsBand>>;
  skipped_bands: { band: BandName; strides: number; reason: string }[];
}

/** Returns the norms file as JSON text (stable key order, one trailing newline). */
export function normsJson(n: NormsFile): string {
  return JSON.stringify(n) + '\n';
}

/** Returns the norms read from a file; throws InputError for a missing, corrupt or wrong file. */
export function readNormsFile(path: string): NormsFile {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(`${path}: cannot read the norms file (${code === 'ENOENT' ? 'no such file' : code ?? 'error'}).`);
  }
  return parseNorms(text, path);
}

/** Returns the norms parsed and checked from JSON text; throws InputError naming `file` and the first fault. */
export function parseNorms(text: string, file: string): NormsFile {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new InputError(`${file}: not a norms file: the JSON does not parse (${(e as Error).message}).`);
  }
  const fail = (where: string, what: string): never => {
    throw new InputError(`${file}: not a valid norms file: ${where} ${what}.`);
  };
  if (!isObj(raw)) return fail('the top level', 'is not an object');
  if (raw.format !== NORMS_FORMAT) return fail('"format"', `is ${JSON.stringify(raw.format ?? null)}, expected "${NORMS_FORMAT}" (is this a jointloom reference built by \`jointloom norms build\`?)`);
  if (raw.version !== NORMS_VERSION)
    return fail('"version"', `is ${JSON.stringify(raw.version ?? null)}; this jointloom reads version ${NORMS_VERSION}${typeof raw.version === 'number' && raw.version > NORMS_VERSION ? ' (the file is from a newer jointloom)' : ''}`);
  const samples = raw.samples;
  if (!Number.isInteger(samples) || (samples as number) < 2) return fail('"samples"', 'is not a whole number of at least 2');
  const S = samples as number;
  if (!Array.isArray(raw.angles) || raw.angles.length === 0 || !raw.angles.every((a) => typeof a === 'string')) return fail('"angles"', 'is not a list of angle names');
  const angles = raw.angles as string[];
  const prov = raw.provenance;
  if (!isObj(prov)) return fail('"provenance"', 'is missing');
  if (typeof prov.synthetic !== 'boolean') return fail('"provenance.synthetic"', 'is not true or false');
  if (!Array.isArray(prov.takes)) return fail('"provenance.takes"', 'is not a list');
  if (!isObj(prov.analysis)) return fail('"provenance.analysis"', 'is missing');
  const strata = raw.speed_strata;
  if (!isObj(strata) || !isNum(strata.slow_below) || !isNum(strata.fast_above)) return fail('"speed_strata"', 'lacks its thresholds');
  if (!isObj(raw.bands)) return fail('"bands"', 'is missing');
  const bands = raw.bands as Record<string, unknown>;
  if (!isObj(bands.all)) return fail('"bands.all"', 'is missing');
  for (const [name, b] of Object.entries(bands)) {
    if (!(BAND_NAMES as readonly string[]).includes(name)) return fail(`band "${name}"`, 'is not one of all, slow, self_selected, fast');
    checkBand(b, `bands.${name}`, S, angles, fail);
  }
  if (!Array.isArray(raw.skipped_bands)) return fail('"skipped_bands"', 'is not a list');
  return raw as unknown as NormsFile;
}

type Fail = (where: string, what: string) => never;

function checkBand(b: unknown, at: string, S: number, angles: string[], fail: Fail): void {
  if (!isObj(b)) return fail(`"${at}"`, 'is not an object');
  if (!Number.isInteger(b.strides) || (b.strides as number) < 1) fail(`"${at}.strides"`, 'is not a positive whole number');
  if (!isObj(b.curves)) return fail(`"${at}.curves"`, 'is missing');
  for (const a of angles) {
    const c = (b.curves as Record<string, unknown>)[a];
    if (!isObj(c)) return fail(`"${at}.curves.${a}"`, 'is missing');
    if (!numArray(c.mean, S)) fail(`"${at}.curves.${a}.mean"`, `is not ${S} numbers`);
    if (!numArray(c.sd, S)) fail(`"${at}.curves.${a}.sd"`, `is not ${S} numbers`);
  }
  if (!isObj(b.parameters)) fail(`"${at}.parameters"`, 'is missing');
  if (!isObj(b.speed_dimensionless)) fail(`"${at}.speed_dimensionless"`, 'is missing');
  const d = b.deviation;
  if (d !== null) {
    if (!isObj(d)) return fail(`"${at}.deviation"`, 'is not an object or null');
    const k = d.features, m = d.samples_per_curve;
    if (!Number.isInteger(k) || (k as number) < 1 || !Number.isInteger(m) || (m as number) < 2) return fail(`"${at}.deviation"`, 'has a bad feature or sample count');
    if (!Array.isArray(d.curves) || !d.curves.every((c) => angles.includes(c as string))) return fail(`"${at}.deviation.curves"`, 'names angles the reference does not hold');
    const p = (d.curves as string[]).length * (m as number);
    if (!numArray(d.feature_mean, k as number)) fail(`"${at}.deviation.feature_mean"`, `is not ${k} numbers`);
    if (!numArray(d.vector_mean, p)) fail(`"${at}.deviation.vector_mean"`, `is not ${p} numbers`);
    if (!numArray(d.basis, (k as number) * p)) fail(`"${at}.deviation.basis"`, `is not ${(k as number) * p} numbers`);
    if (!isObj(d.ln_distance) || !isNum(d.ln_distance.mean) || !isNum(d.ln_distance.sd) || !((d.ln_distance.sd as number) > 0))
      fail(`"${at}.deviation.ln_distance"`, 'lacks a mean and a positive SD');
  }
}

function isObj(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}
function isNum(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}
function numArray(v: unknown, n: number): boolean {
  return Array.isArray(v) && v.length === n && v.every(isNum);
}
