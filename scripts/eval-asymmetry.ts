// Validates the coupling asymmetry of a model (default: the shipped one) on the asymmetry validation
// cohort of src/synth/cohort.ts (seeds disjoint from training and from the forecast evaluation): invented
// controls with natural left/right differences; one-sided impairments of every kind made by the walker
// (first arm); normal takes whose hip, knee, ankle or shoulder rotation channels are narrowed afterwards
// (second arm, src/bvh/damp.ts). It prints, for the coupling score and beside it the best classic symmetry
// index, relative phase and vector coding measure, the ROC AUC per severity stratum with bootstrap
// intervals, side and joint naming, severity correlation, the factor probes, the mirror, symmetric-take
// and speed-sweep tests, and the same key figures for each ablation model given with --ablation.
//
// Run: npm run eval:asymmetry [-- --json] [--model FILE] [--ablation NAME=FILE ...] [--quick] [--workers N] [--results FILE]
// (--results writes every subject's raw reading of the main model, with its arm, kind, side and severity, as JSON.)
import { renameSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { parseArgs } from 'node:util';
import { Piscina } from 'piscina';
import { progressBar } from '../src/cli/progress.js';
import { defaultModelPath } from '../src/model/default-model.js';
import { loadModel } from '../src/model/modelfile.js';
import { mirrorCouples } from '../src/analysis/coupling-asymmetry.js';
import { DEFAULT_PAIRS } from '../src/motion/roles.js';
import { asymmetryCohort, jointOfKind, SEVERITY_STRATA, type AsymmetrySubject } from '../src/synth/cohort.js';
import type { AsymmetryTakeResult } from './asymmetry-take.js';
import { aucInterval, icc1, proportionInterval, quantile, ridgeProbeR2, rocAuc, spearman } from './eval-stats.js';

const { values: v } = parseArgs({
  options: {
    model: { type: 'string' }, ablation: { type: 'string', multiple: true }, json: { type: 'boolean' }, quick: { type: 'boolean' },
    workers: { type: 'string' }, quiet: { type: 'boolean' }, results: { type: 'string' },
  },
});
const modelPath = v.model ?? defaultModelPath();
const ablations = (v.ablation ?? []).map((a) => {
  const k = a.indexOf('=');
  if (k <= 0) throw new Error(`--ablation takes NAME=FILE, got ${a}`);
  return { name: a.slice(0, k), path: a.slice(k + 1) };
});
for (const m of [modelPath, ...ablations.map((a) => a.path)]) loadModel(m); // refuse a bad file before any work
const workers = Number(v.workers ?? Math.max(1, availableParallelism()));

const cohort = asymmetryCohort(v.quick ? { controls: 20, perStratum: 2, editPerStratum: 2 } : {});
// An exactly symmetric walker (no natural differences) and one symmetric walker at eight speeds.
const extra = (id: string, speed: number): AsymmetrySubject => ({
  id, arm: 'control', kind: null, side: null, severity: 0,
  options: { seed: 45000, subjectSeed: 45000, asymmetry: 0, duration: 30, frameRate: 60, speed, cadence: Math.round(100 + (18 * (speed - 0.95)) / 0.5) },
});
const symmetric = extra('VS001', 1.2);
const sweep = [0.9, 1.0, 1.1, 1.2, 1.3, 1.4, 1.5, 1.6].map((s, i) => extra(`VW${String(i + 1).padStart(3, '0')}`, s));
const mirrorIds = new Set(cohort.filter((s, i) => s.arm !== 'control' && i % 3 === 0).map((s) => s.id));

interface Candidate { name: string; family: 'coupling' | 'distance' | 'SI' | 'CRP' | 'VC' }
// The pair distance's row: shown beside the take score, never counted as a classic measure.
const DISTANCE: Candidate = { name: 'coupling pair distance', family: 'distance' };

async function scoreAll(path: string, label: string): Promise<Map<string, AsymmetryTakeResult>> {
  const pool = new Piscina({ filename: new URL('./asymmetry-worker.ts', import.meta.url).href, execArgv: ['--import', 'tsx'], minThreads: workers, maxThreads: workers });
  const subjects = [...cohort, symmetric, ...sweep];
  const bar = progressBar(label, Boolean(v.quiet || v.json));
  let done = 0;
  const out = new Map<string, AsymmetryTakeResult>();
  try {
    await Promise.all(subjects.map(async (s) => {
      const r = (await pool.run({ subject: s, modelPath: path, mirror: mirrorIds.has(s.id) })) as AsymmetryTakeResult;
      out.set(s.id, r);
      bar.update(++done, subjects.length, s.id);
    }));
  } finally {
    bar.stop();
    await pool.destroy();
  }
  return out;
}

const r3 = (x: number) => Math.round(x * 1000) / 1000;
const byArm = (arm: AsymmetrySubject['arm']) => cohort.filter((s) => s.arm === arm);
const inStratum = (s: AsymmetrySubject, lo: number, hi: number) => s.severity >= lo && s.severity < hi + (hi >= 0.4 ? 1e-9 : 0);

/** Returns a candidate's score for a subject (null where not measurable). */
function scoreOf(r: AsymmetryTakeResult, c: Candidate): number | null {
  return c.family === 'coupling' ? r.score : c.family === 'distance' ? r.distance : r.classic[c.name] ?? null;
}

/** AUC of impaired (subjects `pos`) against the controls, with its interval; subjects lacking the score are left out. */
function auc(results: Map<string, AsymmetryTakeResult>, c: Candidate, pos: AsymmetrySubject[]): { auc: number; ci: [number, number]; n: [number, number] } {
  const get = (ss: AsymmetrySubject[]) => ss.map((s) => scoreOf(results.get(s.id)!, c)).filter((x): x is number => x !== null && Number.isFinite(x));
  const p = get(pos), n = get(byArm('control'));
  return { auc: r3(rocAuc(p, n)), ci: aucInterval(p, n, 1000, 17).map(r3) as [number, number], n: [p.length, n.length] };
}

/** Returns the classic candidate of a family with the highest AUC on both arms' impaired subjects of 20 % and more. */
function bestOf(results: Map<string, AsymmetryTakeResult>, family: Candidate['family']): Candidate {
  const names = new Set<string>();
  for (const r of results.values()) for (const k of Object.keys(r.classic)) if (k.startsWith(`${family} `)) names.add(k);
  const pos = cohort.filter((s) => s.arm !== 'control' && s.severity >= 0.2);
  let best: Candidate = { name: [...names][0]!, family }, bestAuc = -1;
  for (const name of [...names].sort()) {
    const a = auc(results, { name, family }, pos).auc;
    if (a > bestAuc) { bestAuc = a; best = { name, family }; }
  }
  return best;
}

/** Returns the subjects grouped by "arm:kind", in first-seen order. */
function byKind(ss: readonly AsymmetrySubject[]): Map<string, AsymmetrySubject[]> {
  const out = new Map<string, AsymmetrySubject[]>();
  for (const s of ss) { const k = `${s.arm}:${s.kind}`; out.set(k, [...(out.get(k) ?? []), s]); }
  return out;
}


/** Every figure of one model. */
function summarise(results: Map<string, AsymmetryTakeResult>) {
  const coupling: Candidate = { name: 'coupling score', family: 'coupling' };
  // Beside the take score, the pair distance it replaces when the model file holds a joint discriminant.
  const candidates = [coupling, DISTANCE, bestOf(results, 'SI'), bestOf(results, 'CRP'), bestOf(results, 'VC')];
  const cellName = (c: Candidate) => (c.family === 'coupling' ? 'coupling' : c.family === 'distance' ? c.name : `${c.family}: ${c.name}`);
  const strata: { name: string; lo: number; hi: number }[] = [
    ...SEVERITY_STRATA.map(([lo, hi]) => ({ name: `${Math.round(lo * 100)}-${Math.round(hi * 100)} %`, lo, hi })),
    { name: '≥ 20 %', lo: 0.2, hi: 0.4 },
  ];
  const aucTable = (['synth', 'edit'] as const).map((arm) => ({
    arm,
    strata: strata.map((st) => ({ stratum: st.name, cells: Object.fromEntries(candidates.map((c) => [cellName(c), auc(results, c, byArm(arm).filter((s) => inStratum(s, st.lo, st.hi)))])) })),
  }));
  const impaired = cohort.filter((s) => s.arm !== 'control');
  const sideHits = (ss: AsymmetrySubject[]) => ss.map((s) => results.get(s.id)!.side === s.side);
  const rate = (h: boolean[]) => ({ rate: r3(h.filter(Boolean).length / Math.max(1, h.length)), ci: proportionInterval(h, 1000, 5).map(r3), n: h.length });
  const side = { all: rate(sideHits(impaired)), synth: rate(sideHits(byArm('synth'))), edit: rate(sideHits(byArm('edit'))), severity20: rate(sideHits(impaired.filter((s) => s.severity >= 0.2))) };
  const jointKinds = impaired.filter((s) => jointOfKind(s.kind) !== null);
  const jointHits = (ss: AsymmetrySubject[]) => ss.map((s) => results.get(s.id)!.joint === jointOfKind(s.kind));
  const jointGroups = [...byKind(jointKinds)];
  const joint = {
    all: rate(jointHits(jointKinds)),
    perKind: Object.fromEntries(jointGroups.map(([k, ss]) => [k, rate(jointHits(ss))])),
    named: Object.fromEntries(jointGroups.map(([k, ss]) => {
      const counts: Record<string, number> = {};
      for (const s of ss) { const j = results.get(s.id)!.joint; counts[j] = (counts[j] ?? 0) + 1; }
      return [k, counts];
    })),
  };
  // The carried-node rule on the same subjects, beside the attribution the model file names (learned profiles when it holds them).
  const attribution = results.get(impaired[0]!.id)!.attribution;
  const nodeRule = {
    side: rate(impaired.map((s) => results.get(s.id)!.nodeRule.side === s.side)).rate,
    joint: rate(jointKinds.map((s) => results.get(s.id)!.nodeRule.joint === jointOfKind(s.kind))).rate,
  };
  const severity = Object.fromEntries([...byKind(impaired)].map(([k, ss]) => [k, r3(spearman(ss.map((s) => s.severity), ss.map((s) => results.get(s.id)!.score)))]));
  // Probes on the static factors: severity from the absolute mirror differences of the take's means.
  const couples = mirrorCouples(), P = DEFAULT_PAIRS.count, S = results.get(cohort[0]!.id)!.staticDims, D = results.get(cohort[0]!.id)!.dynamicDims;
  const features = (r: AsymmetryTakeResult) => Float64Array.from(couples.flatMap((p) => Array.from({ length: S }, (_, s) => Math.abs(r.staticMean[p * S + s]! - r.staticMean[DEFAULT_PAIRS.mirror[p]! * S + s]!))));
  const probeSubjects = cohort.filter((s) => s.arm !== 'edit');
  const sevProbe = ridgeProbeR2(probeSubjects.map((s) => features(results.get(s.id)!)), probeSubjects.map((s) => s.severity), probeSubjects.map((s) => s.id));
  // Phase probe on the controls' non-overlapping windows: labelled dynamic dimensions (0, 1) against the others.
  const rows: { x: Float64Array; xOther: Float64Array; sin: number; cos: number; g: string }[] = [];
  for (const s of byArm('control')) {
    const r = results.get(s.id)!;
    r.phase.forEach((ph, w) => {
      if (!Number.isFinite(ph)) return;
      const lab: number[] = [], oth: number[] = [];
      for (let p = 0; p < P; p++) for (let d = 0; d < D; d++) (d < 2 ? lab : oth).push(r.dynamicWindows[(w * P + p) * D + d]!);
      rows.push({ x: Float64Array.from(lab), xOther: Float64Array.from(oth), sin: Math.sin(2 * Math.PI * ph), cos: Math.cos(2 * Math.PI * ph), g: s.id });
    });
  }
  const phaseR2 = (pick: (r: (typeof rows)[number]) => Float64Array) => r3((ridgeProbeR2(rows.map(pick), rows.map((r) => r.sin), rows.map((r) => r.g), { lambdas: [1, 100, 10000] }).r2 + ridgeProbeR2(rows.map(pick), rows.map((r) => r.cos), rows.map((r) => r.g), { lambdas: [1, 100, 10000] }).r2) / 2);
  const phase = { labelled: D >= 2 ? phaseR2((r) => r.x) : null, other: D > 2 ? phaseR2((r) => r.xOther) : null, windows: rows.length };
  // ICC(1) of every static factor over the non-overlapping windows of each take (first arm and controls).
  const iccs: number[] = [];
  for (let i = 0; i < P * S; i++) {
    const groups = probeSubjects.map((s) => {
      const r = results.get(s.id)!, W = r.staticWindows.length / (P * S);
      return Array.from({ length: W }, (_, w) => r.staticWindows[w * P * S + i]!);
    });
    iccs.push(icc1(groups));
  }
  const icc = { median: r3(quantile(iccs, 0.5)), p10: r3(quantile(iccs, 0.1)), share_at_least_0_9: r3(iccs.filter((x) => x >= 0.9).length / iccs.length) };
  // Mirror test, the symmetric take and the speed sweep.
  const mirrored = impaired.filter((s) => mirrorIds.has(s.id)).map((s) => results.get(s.id)!);
  const mirror = {
    takes: mirrored.length,
    side_flipped: r3(mirrored.filter((r) => r.mirror!.side !== r.side).length / Math.max(1, mirrored.length)),
    swap_error_median: r3(quantile(mirrored.map((r) => r.mirror!.swapError), 0.5)),
    raw_swap_error_median: r3(quantile(mirrored.map((r) => r.mirror!.rawSwapError), 0.5)),
    static_range_median: r3(quantile(mirrored.map((r) => r.mirror!.staticRange), 0.5)),
    score_change_median: r3(quantile(mirrored.map((r) => Math.abs(r.mirror!.score - r.score)), 0.5)),
  };
  const controlScores = byArm('control').map((s) => results.get(s.id)!.score);
  const mean = controlScores.reduce((a, b) => a + b, 0) / controlScores.length;
  const controlSd = Math.sqrt(controlScores.reduce((a, b) => a + (b - mean) ** 2, 0) / (controlScores.length - 1));
  const sweepScores = sweep.map((s) => results.get(s.id)!.score);
  return {
    candidates: candidates.map((c) => (c.family === 'coupling' ? 'coupling score' : cellName(c))),
    auc: aucTable, side, joint, attribution, carried_node_rule: nodeRule, severity_spearman: severity,
    probes: { severity_r2: r3(sevProbe.r2), severity_subjects: probeSubjects.length, phase_r2: phase, static_icc: icc },
    mirror,
    symmetric: { score: r3(results.get(symmetric.id)!.score), control_p10: r3(quantile(controlScores, 0.1)) },
    speed_sweep: { speeds: sweep.map((s) => s.options.speed), scores: sweepScores.map(r3), range: r3(Math.max(...sweepScores) - Math.min(...sweepScores)), control_sd: r3(controlSd) },
    controls: { n: controlScores.length, median: r3(quantile(controlScores, 0.5)), p90: r3(quantile(controlScores, 0.9)) },
  };
}
type Summary = ReturnType<typeof summarise>;

/** The acceptance checks of one summary. */
function acceptance(s: Summary) {
  const pooled = (arm: number) => s.auc[arm]!.strata.find((x) => x.stratum === '≥ 20 %')!.cells;
  const checks: { check: string; value: string; pass: boolean }[] = [];
  for (const [arm, name] of [[0, 'walker-made'], [1, 'edited afterwards']] as const) {
    const c = pooled(arm).coupling!;
    checks.push({ check: `AUC ≥ 0.95 with lower bound ≥ 0.9, severities ≥ 20 %, ${name}`, value: `${c.auc} (${c.ci[0]}-${c.ci[1]})`, pass: c.auc >= 0.95 && c.ci[0] >= 0.9 });
  }
  let within = true;
  for (const arm of s.auc) for (const st of arm.strata) {
    const c = st.cells.coupling!;
    for (const [k, x] of Object.entries(st.cells)) if (k !== 'coupling' && k !== DISTANCE.name && c.auc < x.auc - (x.ci[1] - x.ci[0]) / 2) within = false;
  }
  checks.push({ check: 'in no stratum below the best classic measure by more than its interval', value: within ? 'holds' : 'fails somewhere (see the table)', pass: within });
  checks.push({ check: 'side named for ≥ 90 % of impaired subjects', value: `${(s.side.all.rate * 100).toFixed(1)} %`, pass: s.side.all.rate >= 0.9 });
  const perKind = Object.entries(s.joint.perKind);
  checks.push({ check: 'most affected joint named for ≥ 70 % of the joint-range kinds', value: `${(s.joint.all.rate * 100).toFixed(1)} % (${perKind.map(([k, x]) => `${k} ${(x.rate * 100).toFixed(0)}`).join(', ')})`, pass: s.joint.all.rate >= 0.7 });
  const rhos = Object.values(s.severity_spearman);
  checks.push({ check: 'Spearman of severity with score ≥ 0.7 within each kind', value: `min ${Math.min(...rhos).toFixed(2)}`, pass: rhos.every((x) => x >= 0.7) });
  checks.push({ check: 'static factors predict severity (probe R² ≥ 0.5)', value: String(s.probes.severity_r2), pass: s.probes.severity_r2 >= 0.5 });
  checks.push({ check: 'static factors\' ICC within a take ≥ 0.9 (median over factors)', value: String(s.probes.static_icc.median), pass: s.probes.static_icc.median >= 0.9 });
  checks.push({ check: 'mirroring flips the side', value: `${(s.mirror.side_flipped * 100).toFixed(0)} % of ${s.mirror.takes}`, pass: s.mirror.side_flipped >= 0.9 });
  checks.push({ check: 'mirroring swaps each pair\'s factors with its mirror\'s (largest difference ≤ 10 % of the factors\' range)', value: `${s.mirror.swap_error_median} of ${s.mirror.static_range_median}`, pass: s.mirror.swap_error_median <= 0.1 * s.mirror.static_range_median });
  checks.push({ check: 'an exactly symmetric take below the controls\' 10th percentile', value: `${s.symmetric.score} vs ${s.symmetric.control_p10}`, pass: s.symmetric.score < s.symmetric.control_p10 });
  checks.push({ check: 'a speed sweep moves the score by less than the controls\' SD', value: `${s.speed_sweep.range} vs ${s.speed_sweep.control_sd}`, pass: s.speed_sweep.range < s.speed_sweep.control_sd });
  return checks;
}

const t0 = performance.now();
const mainResults = await scoreAll(modelPath, 'model');
if (v.results) {
  const tmp = `${v.results}.tmp-${process.pid}`;
  writeFileSync(tmp, JSON.stringify([...cohort, symmetric, ...sweep].map((s) => ({ id: s.id, arm: s.arm, kind: s.kind, side: s.side, severity: s.severity, result: mainResults.get(s.id) }))));
  renameSync(tmp, v.results);
}
const main = summarise(mainResults);
const ablationRows: { name: string; path: string; summary: Summary }[] = [];
for (const a of ablations) ablationRows.push({ ...a, summary: summarise(await scoreAll(a.path, a.name)) });
const checks = acceptance(main);
const elapsed = (performance.now() - t0) / 1000;
const keyFigures = (s: Summary) => ({
  auc_synth_20: s.auc[0]!.strata.at(-1)!.cells.coupling!.auc,
  auc_edit_20: s.auc[1]!.strata.at(-1)!.cells.coupling!.auc,
  side: s.side.all.rate, joint: s.joint.all.rate, spearman_min: Math.min(...Object.values(s.severity_spearman)),
  severity_r2: s.probes.severity_r2, phase_r2_labelled: s.probes.phase_r2.labelled, phase_r2_other: s.probes.phase_r2.other, icc: s.probes.static_icc.median,
});

if (v.json) {
  process.stdout.write(JSON.stringify({
    model: modelPath, subjects: { controls: byArm('control').length, walker_impaired: byArm('synth').length, edited: byArm('edit').length }, elapsed_s: Math.round(elapsed),
    ...main, acceptance: checks, ablations: [{ name: 'model', path: modelPath, ...keyFigures(main) }, ...ablationRows.map((a) => ({ name: a.name, path: a.path, ...keyFigures(a.summary) }))],
  }, null, 2) + '\n');
} else {
  const out: string[] = [];
  out.push(`eval:asymmetry — ${modelPath}`, `${byArm('control').length} controls, ${byArm('synth').length} walker-impaired, ${byArm('edit').length} edited afterwards (all invented); ${Math.round(elapsed)} s`, '');
  out.push(`controls' coupling scores: median ${main.controls.median}, 90th percentile ${main.controls.p90}`);
  for (const arm of main.auc) {
    out.push('', `ROC AUC, impaired vs controls, ${arm.arm === 'synth' ? 'impaired by the walker' : 'narrowed after the fact'} (95 % bootstrap interval; n impaired/controls):`);
    const names = Object.keys(arm.strata[0]!.cells);
    for (const name of names) {
      const cells = arm.strata.map((st) => { const x = st.cells[name]!; return `${st.stratum}: ${x.auc.toFixed(3)} (${x.ci[0].toFixed(2)}-${x.ci[1].toFixed(2)}; ${x.n[0]}/${x.n[1]})`; });
      out.push(`  ${name.padEnd(40)} ${cells.join('  ')}`);
    }
  }
  out.push('', `side named: ${(main.side.all.rate * 100).toFixed(1)} % of ${main.side.all.n} (walker-made ${(main.side.synth.rate * 100).toFixed(1)} %, edited ${(main.side.edit.rate * 100).toFixed(1)} %, severities ≥ 20 % ${(main.side.severity20.rate * 100).toFixed(1)} %)`);
  out.push(`joint named: ${(main.joint.all.rate * 100).toFixed(1)} % (chance 25 %); per kind:`);
  for (const [k, x] of Object.entries(main.joint.perKind)) out.push(`  ${k.padEnd(16)} ${(x.rate * 100).toFixed(0).padStart(3)} %  named: ${Object.entries(main.joint.named[k]!).map(([j, n]) => `${j} ${n}`).join(', ')}`);
  out.push(`joint and side named by ${main.attribution === 'profiles' ? 'the learned joint discriminant (fitted on the development cohort, seeds 60000+, 62000+, 65000+)' : 'the carried-node rule'}; the carried-node rule on the same subjects: side ${(main.carried_node_rule.side * 100).toFixed(1)} %, joint ${(main.carried_node_rule.joint * 100).toFixed(1)} %`);
  out.push(`Spearman severity vs score: ${Object.entries(main.severity_spearman).map(([k, x]) => `${k} ${x}`).join(', ')}`);
  out.push(`probes: severity from static factors R² ${main.probes.severity_r2} (${main.probes.severity_subjects} subjects, grouped 5-fold ridge); gait phase from dynamic factors R² labelled ${main.probes.phase_r2.labelled}, other dimensions ${main.probes.phase_r2.other} (${main.probes.phase_r2.windows} windows); static ICC(1) median ${main.probes.static_icc.median}, 10th percentile ${main.probes.static_icc.p10}, share ≥ 0.9 ${main.probes.static_icc.share_at_least_0_9}`);
  out.push(`mirror: side flipped on ${(main.mirror.side_flipped * 100).toFixed(0)} % of ${main.mirror.takes}; largest factor swap difference median ${main.mirror.swap_error_median} mirror-averaged, ${main.mirror.raw_swap_error_median} raw encoder (factor range ${main.mirror.static_range_median}); score change median ${main.mirror.score_change_median}`);
  out.push(`symmetric take: ${main.symmetric.score} (controls' 10th percentile ${main.symmetric.control_p10}); speed sweep ${main.speed_sweep.speeds.join('/')} m/s: scores ${main.speed_sweep.scores.join(' ')}, range ${main.speed_sweep.range} (controls' SD ${main.speed_sweep.control_sd})`);
  out.push('', 'ablations (coupling score; AUC at severities ≥ 20 %):');
  out.push(`  ${'model'.padEnd(22)} ${'AUC walker'.padStart(10)} ${'AUC edit'.padStart(9)} ${'side'.padStart(6)} ${'joint'.padStart(6)} ${'ρ min'.padStart(6)} ${'sev R²'.padStart(7)} ${'phase R² lab/other'.padStart(19)} ${'ICC'.padStart(6)}`);
  for (const [name, s] of [['model', main] as const, ...ablationRows.map((a) => [a.name, a.summary] as const)]) {
    const k = keyFigures(s);
    out.push(`  ${name.padEnd(22)} ${k.auc_synth_20.toFixed(3).padStart(10)} ${k.auc_edit_20.toFixed(3).padStart(9)} ${k.side.toFixed(2).padStart(6)} ${k.joint.toFixed(2).padStart(6)} ${k.spearman_min.toFixed(2).padStart(6)} ${k.severity_r2.toFixed(2).padStart(7)} ${`${k.phase_r2_labelled ?? '-'}/${k.phase_r2_other ?? '-'}`.padStart(19)} ${k.icc.toFixed(2).padStart(6)}`);
  }
  if (!ablationRows.length) out.push('  (no ablation models given: --ablation no-match-pairing=FILE --ablation no-restricted-labeling=FILE)');
  out.push('', 'acceptance:');
  for (const c of checks) out.push(`  ${c.pass ? 'PASS' : 'MISS'}  ${c.check}: ${c.value}`);
  out.push('', 'Invented subjects only. jointloom is a research and quality aid, not a diagnostic device; results are reviewed by a qualified clinician.');
  process.stdout.write(out.join('\n') + '\n');
}
