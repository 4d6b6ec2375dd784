// Building a reference from control takes: per band, every angle curve's per-sample mean and SD over the
// strides, every parameter's mean and SD, the spread of the profile score over the band's own takes, and the
// deviation-index model when the band holds enough strides.
import { REPORT_ANGLES } from '../gait/analyze.js';
import { InputError } from '../errors/index.js';
import { CYCLE_SAMPLES } from '../gait/normalize.js';
import { NORM_PARAMETERS, type SideSample, type TakeSample } from './collect.js';
import { GDI_FEATURES, GDI_SAMPLES, fitDeviationModel, gaitVector } from './deviation.js';
import {
  NORMS_FORMAT, NORMS_VERSION, SYNTHETIC_LABEL,
  type BandName, type CurveNorm, type NormsBand, type NormsFile, type NormsProvenance, type ScalarNorm,
} from './format.js';
import { profileScores, quantile } from './profile.js';
import { FAST_ABOVE, SLOW_BELOW, STRATA, stratumOf } from './strata.js';

/** Fewest strides a band needs: the profile score's guidance of about 20 (as the issue quotes it; not checked against the paper). */
export const GPS_MIN_STRIDES = 20;
/** Fewest strides for the deviation-index model: about 90 (as the issue quotes it; not checked against the paper). */
export const GDI_MIN_STRIDES = 90;

/** A control take to build from: its sample and the file facts for the provenance. */
export interface ControlTake {
  sample: TakeSample;
  sha256: string;
}

export interface BuildOptions {
  speedBands: boolean;
  synthetic: boolean;
  tool_version: string;
  date: string | null;
  build: string | null;
  description: string;
  analysis: { lowpass_hz: number | null; steady_state_only: boolean };
}

/** Returns the reference built from the control takes and the notes on bands left out; throws InputError when too few strides. */
export function buildNorms(controls: readonly ControlTake[], o: BuildOptions): { norms: NormsFile; notes: string[] } {
  if (controls.length === 0) throw new InputError('no control takes given; a reference needs at least one take of walking.');
  const noSpeed = controls.filter((c) => !Number.isFinite(c.sample.speedDimensionless));
  if (noSpeed.length) throw new InputError(`${noSpeed[0]!.sample.file}: no usable stride, so its walking speed is unknown; leave the take out of the reference.`);
  const notes: string[] = [];
  const all = buildBand(controls.map((c) => c.sample));
  if (all.strides < GPS_MIN_STRIDES)
    throw new InputError(
      `the control takes hold only ${all.strides} strides (left and right cycles together); a reference band needs at least ${GPS_MIN_STRIDES} for the profile score. Add control takes.`);
  const bands: NormsFile['bands'] = { all };
  const skipped: NormsFile['skipped_bands'] = [];
  if (o.speedBands) {
    for (const s of STRATA) {
      const members = controls.filter((c) => stratumOf(c.sample.speedDimensionless) === s).map((c) => c.sample);
      const strides = members.reduce((n, m) => n + m.left.cycles + m.right.cycles, 0);
      if (strides < GPS_MIN_STRIDES) {
        const reason = `${strides} strides, fewer than the ${GPS_MIN_STRIDES} a band needs for the profile score`;
        skipped.push({ band: s, strides, reason });
        notes.push(`speed band ${s} left out: ${reason}.`);
        continue;
      }
      bands[s] = buildBand(members);
    }
  }
  for (const [name, b] of Object.entries(bands) as [BandName, NormsBand][])
    if (b.deviation === null) notes.push(`band ${name}: no deviation index: ${b.deviation_note}.`);
  const provenance: NormsProvenance = {
    synthetic: o.synthetic,
    label: o.synthetic ? SYNTHETIC_LABEL : null,
    tool: 'jointloom',
    tool_version: o.tool_version,
    date: o.date,
    build: o.build,
    description: o.description,
    analysis: o.analysis,
    takes: controls.map((c) => ({
      file: c.sample.file, sha256: c.sha256, speed_dimensionless: r(c.sample.speedDimensionless, 1e4),
      stratum: stratumOf(c.sample.speedDimensionless)!, strides: { left: c.sample.left.cycles, right: c.sample.right.cycles },
    })),
  };
  const norms: NormsFile = {
    format: NORMS_FORMAT,
    version: NORMS_VERSION,
    provenance,
    speed_strata: {
      measure: 'speed / sqrt(g * leg length), leg length hip to ankle at rest, g = 9.80665 m/s^2',
      slow_below: SLOW_BELOW,
      fast_above: FAST_ABOVE,
      source: 'dimensionless speed after Hof 1996; thresholds chosen from the synthetic cohort and the usual 1.0 and 1.6 m/s edges of slow and fast adult walking',
    },
    samples: CYCLE_SAMPLES,
    angles: [...REPORT_ANGLES],
    bands,
    skipped_bands: skipped,
  };
  return { norms, notes };
}

/** Returns one band built from the take samples it holds. */
export function buildBand(members: readonly TakeSample[]): NormsBand {
  const sides: SideSample[] = members.flatMap((m) => [m.left, m.right]);
  const S = CYCLE_SAMPLES;
  const curves: Record<string, CurveNorm> = {};
  const strides = sides.reduce((n, sd) => n + sd.cycles, 0);
  for (const a of REPORT_ANGLES) {
    const sum = new Float64Array(S), n = new Int32Array(S), ss = new Float64Array(S);
    for (const sd of sides) {
      const c = sd.curves[a];
      for (let k = 0; k < sd.cycles; k++) for (let i = 0; i < S; i++) { const v = c[k * S + i]!; if (Number.isFinite(v)) { sum[i] += v; n[i]++; } }
    }
    const mean = Float64Array.from(sum, (s, i) => s / n[i]!);
    for (const sd of sides) {
      const c = sd.curves[a];
      for (let k = 0; k < sd.cycles; k++) for (let i = 0; i < S; i++) { const v = c[k * S + i]!; if (Number.isFinite(v)) ss[i] += (v - mean[i]!) ** 2; }
    }
    let minN = Infinity;
    for (let i = 0; i < S; i++) minN = Math.min(minN, n[i]!);
    curves[a] = { mean: Array.from(mean, (v) => r(v, 1e4)), sd: Array.from(ss, (v, i) => r(Math.sqrt(v / (n[i]! - 1)), 1e4)), strides: minN };
  }
  const parameters: Record<string, ScalarNorm> = {};
  for (const p of NORM_PARAMETERS) {
    const xs: number[] = [];
    for (const sd of sides) for (const v of sd.parameters[p] ?? []) if (Number.isFinite(v)) xs.push(v);
    parameters[p] = scalar(xs, 1e6);
  }
  const speeds = members.map((m) => m.speedDimensionless);
  const sp = scalar(speeds, 1e4);
  const band: NormsBand = {
    strides,
    takes: members.length,
    speed_dimensionless: { mean: sp.mean ?? NaN, sd: sp.sd, min: r(Math.min(...speeds), 1e4), max: r(Math.max(...speeds), 1e4) },
    curves,
    parameters,
    profile: null,
    deviation: null,
    deviation_note: null,
  };
  band.profile = profileSpread(members, band);
  const dev = deviationFor(sides);
  band.deviation = dev.model;
  band.deviation_note = dev.note;
  return band;
}

/** Returns the spread of the GPS and GVS over the band's own takes (each take against the band itself). */
function profileSpread(members: readonly TakeSample[], band: NormsBand): NormsBand['profile'] {
  if (!members.length) return null;
  const gps: number[] = [];
  const gvs: Record<string, number[]> = Object.fromEntries(REPORT_ANGLES.map((a) => [a, []]));
  for (const m of members) {
    const s = profileScores({ left: m.left.mean, right: m.right.mean }, band.curves, REPORT_ANGLES);
    gps.push(s.gps.overall);
    for (const a of REPORT_ANGLES) gvs[a]!.push(s.gvs[a]!.left, s.gvs[a]!.right);
  }
  return {
    takes: members.length,
    gps_median: r(quantile(gps, 0.5), 1e4),
    gps_p95: r(quantile(gps, 0.95), 1e4),
    gvs_p95: Object.fromEntries(REPORT_ANGLES.map((a) => [a, r(quantile(gvs[a]!, 0.95), 1e4)])),
  };
}

/** Returns the deviation model of the band's strides, or null with the reason. */
function deviationFor(sides: readonly SideSample[]): { model: NormsBand['deviation']; note: string | null } {
  const p = REPORT_ANGLES.length * GDI_SAMPLES;
  const total = sides.reduce((n, s) => n + s.cycles, 0);
  const rows = new Float64Array(total * p);
  const v = new Float64Array(p);
  let n = 0;
  for (const sd of sides) {
    const curves = REPORT_ANGLES.map((a) => sd.curves[a]);
    for (let k = 0; k < sd.cycles; k++) if (gaitVector(curves, k * sd.samples, sd.samples, v)) rows.set(v, n++ * p);
  }
  if (n < GDI_MIN_STRIDES) return { model: null, note: `${n} complete strides, fewer than the ${GDI_MIN_STRIDES} the deviation index needs` };
  const m = fitDeviationModel(rows.subarray(0, n * p), n, p, GDI_FEATURES, [...REPORT_ANGLES], GDI_SAMPLES);
  return {
    model: {
      ...m,
      retained: r(m.retained, 1e6),
      feature_mean: m.feature_mean.map((x) => r(x, 1e6)),
      vector_mean: m.vector_mean.map((x) => r(x, 1e4)),
      basis: m.basis.map((x) => r(x, 1e8)),
      ln_distance: { mean: r(m.ln_distance.mean, 1e8), sd: r(m.ln_distance.sd, 1e8) },
    },
    note: null,
  };
}

function scalar(xs: readonly number[], q: number): ScalarNorm {
  const n = xs.length;
  if (n === 0) return { mean: null, sd: null, n };
  const mean = xs.reduce((s, v) => s + v, 0) / n;
  const sd = n > 1 ? Math.sqrt(xs.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1)) : null;
  return { mean: r(mean, q), sd: sd === null ? null : r(sd, q), n };
}

/** Returns v rounded to 1/q (−0 written as 0). */
function r(v: number, q: number): number {
  const x = Math.round(v * q) / q;
  return x === 0 ? 0 : x;
}
