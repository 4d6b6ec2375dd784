// A take scored against a reference: the band chosen by walking speed, its curves for drawing, where the
// take's mean curves leave mean ± 2 SD, the gait variable and profile scores (the movement analysis profile),
// the deviation index per side, and each parameter against the band. Plain data, ready for JSON.
import { REPORT_ANGLES, type GaitAnalysis } from '../gait/analyze.js';
import type { SideName } from '../gait/types.js';
import { chooseBand } from './bands.js';
import { NORM_PARAMETERS, finiteMean, sampleTake, type SideSample } from './collect.js';
import { GDI_SAMPLES, deviationIndex, gaitVector } from './deviation.js';
import { SYNTHETIC_LABEL, type BandName, type DeviationModel, type NormsFile } from './format.js';
import { GPS_MCID_DEG, profileScores } from './profile.js';
import { STRATUM_LABELS, type StratumName } from './strata.js';

/** How many SDs from the reference mean a value may lie before it is marked (common practice: 2). */
export const OUTSIDE_SD = 2;

/** The deviation index of one side. */
export interface SideDeviation { gdi: number | null; strides: number; coverage: number | null }

/** Every score of a take against a reference. */
export interface NormsScore {
  reference: {
    file: string;
    synthetic: boolean;
    label: string | null;
    built: string | null;
    tool_version: string;
    takes: number;
    band: BandName;
    band_label: string;
    band_strides: number;
    band_takes: number;
    note: string | null;
  };
  speed_dimensionless: number | null;
  stratum: StratumName | null;
  /** Reference mean and SD of each curve (the band drawn under the plots). */
  curves: Record<string, { mean: number[]; sd: number[] }>;
  /** Runs of the cycle (percent, inclusive) where the side's mean curve lies outside mean ± 2 SD. */
  outside: Record<string, Record<SideName, [number, number][]>>;
  /** The movement analysis profile: GVS per curve and side, GPS per side and overall. */
  gvs: Record<string, Record<SideName, number | null>>;
  /** Per curve, the 95th percentile of the GVS of the band's own take sides (null when not recorded). */
  gvs_reference_p95: Record<string, number> | null;
  gps: { left: number | null; right: number | null; overall: number | null; mcid_deg: number; reference_median: number | null; reference_p95: number | null; curves_per_side: number };
  gdi: { left: SideDeviation; right: SideDeviation; features: number; retained: number; curves: string[]; band: BandName; note: string } | null;
  gdi_note: string | null;
  parameters: Record<string, { left: number | null; right: number | null; mean: number | null; sd: number | null; n: number; z_left: number | null; z_right: number | null; outside: SideName[] }>;
  warnings: string[];
}

const r3 = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? null : Math.round(v * 1000) / 1000);

/** Returns the scores of an analysed take against the reference read from `file`. */
export function scoreAgainstNorms(a: GaitAnalysis, norms: NormsFile, file: string): NormsScore {
  const sample = sampleTake(a, a.input.path);
  const v = Number.isFinite(sample.speedDimensionless) ? sample.speedDimensionless : null;
  const choice = chooseBand(norms, v);
  const band = choice.band;
  const warnings: string[] = [];
  const an = norms.provenance.analysis;
  if (an.lowpass_hz !== a.options.lowpassHz || an.steady_state_only !== a.options.steadyOnly)
    warnings.push(`the reference was built with low-pass ${an.lowpass_hz ?? 'off'} and ${an.steady_state_only ? 'steady-state strides only' : 'every step'}, this take with low-pass ${a.options.lowpassHz ?? 'off'} and ${a.options.steadyOnly ? 'steady-state strides only' : 'every step'}; scores compare unlike processing.`);
  const curves: NormsScore['curves'] = {};
  const outside: NormsScore['outside'] = {};
  for (const ang of REPORT_ANGLES) {
    const c = band.curves[ang]!;
    curves[ang] = { mean: c.mean, sd: c.sd };
    outside[ang] = { left: outsideRuns(sample.left.mean[ang], c.mean, c.sd), right: outsideRuns(sample.right.mean[ang], c.mean, c.sd) };
  }
  const prof = profileScores({ left: sample.left.mean, right: sample.right.mean }, band.curves, REPORT_ANGLES);
  const gvs: NormsScore['gvs'] = Object.fromEntries(REPORT_ANGLES.map((ang) => [ang, { left: r3(prof.gvs[ang]!.left), right: r3(prof.gvs[ang]!.right) }]));

  let gdi: NormsScore['gdi'] = null, gdiNote: string | null = null;
  let model: DeviationModel | null = band.deviation, modelBand: BandName = choice.name;
  if (!model && choice.name !== 'all' && norms.bands.all!.deviation) {
    model = norms.bands.all!.deviation;
    modelBand = 'all';
    gdiNote = `the ${choice.name} band has no deviation model (${band.deviation_note}); the deviation index uses the band of all speeds.`;
  }
  if (model) {
    const left = sideDeviation(model, sample.left), right = sideDeviation(model, sample.right);
    gdi = {
      left, right, features: model.features, retained: r3(model.retained)!, curves: model.curves, band: modelBand,
      note: `${model.curves.length} curves at ${model.samples_per_curve} samples each (no hip rotation is measured, so the paper's 9 curves are 8 here); features from the reference's own control strides; mean of the side's per-stride indices.`,
    };
    for (const s of ['left', 'right'] as const)
      if (gdi[s].coverage !== null && gdi[s].coverage! < 0.5)
        warnings.push(`the deviation features hold only ${Math.round(100 * gdi[s].coverage!)} % of the ${s} side's departure from the control mean; its deviation index understates the departure (see the profile score).`);
  } else gdiNote = `no deviation index: ${band.deviation_note ?? 'the reference holds no deviation model'}.`;

  const parameters: NormsScore['parameters'] = {};
  for (const p of NORM_PARAMETERS) {
    const ref = band.parameters[p];
    if (!ref) continue;
    const l = finiteMean(sample.left.parameters[p] ?? []), rr = finiteMean(sample.right.parameters[p] ?? []);
    const z = (x: number) => (ref.mean !== null && ref.sd && Number.isFinite(x) ? (x - ref.mean) / ref.sd : null);
    const zl = z(l), zr = z(rr);
    const out: SideName[] = [];
    if (zl !== null && Math.abs(zl) > OUTSIDE_SD) out.push('left');
    if (zr !== null && Math.abs(zr) > OUTSIDE_SD) out.push('right');
    parameters[p] = { left: r3(l), right: r3(rr), mean: ref.mean, sd: ref.sd, n: ref.n, z_left: r3(zl), z_right: r3(zr), outside: out };
  }
  const prov = norms.provenance;
  return {
    reference: {
      file, synthetic: prov.synthetic, label: prov.synthetic ? SYNTHETIC_LABEL : prov.label, built: prov.date ?? prov.build,
      tool_version: prov.tool_version, takes: prov.takes.length,
      band: choice.name, band_label: STRATUM_LABELS[choice.name], band_strides: band.strides, band_takes: band.takes, note: choice.note,
    },
    speed_dimensionless: r3(v),
    stratum: choice.stratum,
    curves,
    outside,
    gvs,
    gvs_reference_p95: band.profile?.gvs_p95 ?? null,
    gps: {
      left: r3(prof.gps.left), right: r3(prof.gps.right), overall: r3(prof.gps.overall), mcid_deg: GPS_MCID_DEG,
      reference_median: band.profile?.gps_median ?? null, reference_p95: band.profile?.gps_p95 ?? null, curves_per_side: REPORT_ANGLES.length,
    },
    gdi,
    gdi_note: gdiNote,
    parameters,
    warnings,
  };
}

/** Returns the mean per-stride deviation index of one side, with the mean coverage. */
function sideDeviation(m: DeviationModel, s: SideSample): SideDeviation {
  const curves = m.curves.map((c) => s.curves[c as keyof SideSample['curves']]);
  const x = new Float64Array(m.curves.length * m.samples_per_curve);
  let n = 0, g = 0, cov = 0;
  for (let k = 0; k < s.cycles; k++) {
    if (!gaitVector(curves, k * s.samples, s.samples, x, m.samples_per_curve ?? GDI_SAMPLES)) continue;
    const d = deviationIndex(m, x);
    if (!Number.isFinite(d.gdi)) continue;
    n++; g += d.gdi; cov += d.coverage;
  }
  return { gdi: n ? r3(g / n) : null, strides: n, coverage: n ? r3(cov / n) : null };
}

/** Returns the runs [from %, to %] of samples where the curve lies outside mean ± 2 SD. */
export function outsideRuns(y: ArrayLike<number>, mean: readonly number[], sd: readonly number[], k = OUTSIDE_SD): [number, number][] {
  const S = mean.length, runs: [number, number][] = [];
  let start = -1;
  const pct = (i: number) => Math.round((1000 * 100 * i) / (S - 1)) / 1000;
  for (let i = 0; i <= S; i++) {
    const out = i < S && Number.isFinite(y[i]!) && Math.abs(y[i]! - mean[i]!) > k * sd[i]!;
    if (out && start < 0) start = i;
    if (!out && start >= 0) { runs.push([pct(start), pct(i - 1)]); start = -1; }
  }
  return runs;
}
