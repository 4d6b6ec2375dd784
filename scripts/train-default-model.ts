// Trains the default coupling model shipped with the package (src/model/default-model.json) and its
// retrained no-coupling twin on the fixed synthetic training cohort (src/synth/cohort.ts: 32 invented
// subjects of 30 s, normal gait with natural variability plus one-sided impairments and highly variable
// walkers), on two threads. Same seed, same machine: the same weights.
//
// Run: npm run train:default [-- --epochs N] [--subjects N] [--seconds S] [--seed N] [--output FILE] [--json] [--quiet]
// (--norms-only recomputes the normative coupling figures of an existing file, --spread-only its forecast spread calibration
// on the held-out training subjects and the calibration cohort (src/synth/cohort.ts),
// --readout-only its pair readouts and then its spread calibration; experiments: [--config '{"reconSteps": 10}'] [--lr 0.001] [--no-twin]; the shipped model uses none of them)
import { statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { Worker } from 'node:worker_threads';
import { progressBar } from '../src/cli/progress.js';
import type { TrainingTake } from '../src/model/batch.js';
import { loadModel, modelToJson, saveModel } from '../src/model/modelfile.js';
import { fitPair, postFitInput, runSplit, savePair, twinOf } from '../src/model/pair-fit.js';
import { postFit } from '../src/model/post-fit.js';
import { readoutSummaryJson, type ReadoutOutcome } from '../src/model/readout-fit.js';
import type { TrainingSummary } from '../src/model/train.js';
import { calibrationCohort, normativeCohort, trainingCohort } from '../src/synth/cohort.js';
import { COUPLING_NORMS_KEY, couplingNorms, type CouplingNorms } from '../src/analysis/coupling-asymmetry.js';
import { JOINT_PROFILES_KEY } from '../src/analysis/joint-profiles.js';
import type { CouplingModel } from '../src/model/model.js';
import type { TakeFactors } from '../src/analysis/factors.js';
import type { NormsWorkerData } from './norms-worker.js';
import { tsWorkerEntry } from '../src/model/worker-entry.js';
import { modelSpec } from '../src/model/model-spec.js';
import { cohortTrack, walkerFactors } from './model-cohort.js';

/** The recipe of the shipped model: every figure here is stored in the model file's summary too. */
export const DEFAULT_RECIPE = { subjects: 32, seconds: 30, epochs: 4, seed: 1, windowStride: 6, threads: 2, calibrationSubjects: 16 } as const;

const { values: v } = parseArgs({
  options: {
    epochs: { type: 'string' }, subjects: { type: 'string' }, seconds: { type: 'string' }, seed: { type: 'string' },
    output: { type: 'string' }, json: { type: 'boolean' }, quiet: { type: 'boolean' }, config: { type: 'string' }, 'norms-only': { type: 'boolean' }, 'spread-only': { type: 'boolean' }, 'readout-only': { type: 'boolean' }, lr: { type: 'string' }, twin: { type: 'boolean', default: true }, 'no-twin': { type: 'boolean' },
  },
});
const num = (s: string | undefined, d: number) => (s === undefined ? d : Number(s));
const recipe = {
  ...DEFAULT_RECIPE,
  subjects: num(v.subjects, DEFAULT_RECIPE.subjects), seconds: num(v.seconds, DEFAULT_RECIPE.seconds),
  epochs: num(v.epochs, DEFAULT_RECIPE.epochs), seed: num(v.seed, DEFAULT_RECIPE.seed),
};
const output = v.output ?? join(dirname(fileURLToPath(import.meta.url)), '..', 'src', 'model', 'default-model.json');

const t0 = performance.now();
const cohort = trainingCohort(recipe.subjects, recipe.seconds);
// Each take with its causal gait phase, so restricted labeling ties two dynamic dimensions to it.
const takes: TrainingTake[] = cohort.map((s) => { const c = cohortTrack(s); return { track: c.track, subject: s.id, phase: c.phase }; });
// The spread calibration subjects: the training sequence's next subjects, never trained on, so the spread
// is calibrated on every group of the training mix (the held-out training subjects hold no variable walker).
const calibrationTakes = (): TrainingTake[] => calibrationCohort(recipe.subjects, recipe.calibrationSubjects, recipe.seconds)
  .map((s) => ({ track: cohortTrack(s, { phase: false }).track, subject: s.id, phase: null }));
/**
 * Returns the normative coupling figures under a model: the normative cohort's walkers, never trained on;
 * with two threads the second half of the walkers on a worker thread (norms-worker.ts; the same figures).
 */
async function cohortNorms(model: CouplingModel): Promise<CouplingNorms> {
  const walkers = normativeCohort(), half = recipe.threads > 1 ? walkers.length >> 1 : walkers.length;
  const data: NormsWorkerData | null = half < walkers.length ? { model: modelSpec(model), from: half, to: walkers.length } : null;
  const worker = data ? new Worker(tsWorkerEntry(fileURLToPath(new URL('./norms-worker.ts', import.meta.url))).code, { workerData: data, eval: true }) : null;
  const theirs = new Promise<TakeFactors[]>((resolve, reject) => {
    if (!worker) return resolve([]);
    worker.once('message', (m: { factors?: TakeFactors[]; error?: string }) => (m.error !== undefined ? reject(new Error(`norms worker failed: ${m.error}`)) : resolve(m.factors!)));
    worker.once('error', reject);
    worker.once('exit', (code) => reject(new Error(`norms worker stopped (exit code ${code}) before it answered`)));
  });
  theirs.catch(() => undefined); // seen below; not left unobserved when this thread's share fails first
  try {
    const mine = walkerFactors(model, walkers.slice(0, half));
    return couplingNorms([...mine, ...(await theirs)]);
  } finally {
    await worker?.terminate();
  }
}
if (v['norms-only']) {
  // Recompute only the normative coupling figures of an existing model file (weights untouched).
  const loaded = loadModel(output);
  const n = await cohortNorms(loaded.model);
  // The joint discriminant is fitted on differences scaled by the old figures: it is dropped (refit it).
  const { [JOINT_PROFILES_KEY]: stale, ...kept } = loaded.extras;
  saveModel(output, loaded.model, loaded.training, { ...kept, [COUPLING_NORMS_KEY]: n });
  console.log(`${output}: normative coupling figures from ${n.subjects} normal walkers (control take scores median ${n.controlScoreP50.toFixed(2)}, 90th percentile ${n.controlScoreP90.toFixed(2)})${stale ? '; its joint discriminant was fitted under the old figures and is dropped: run npm run fit:joint-profiles' : ''}`);
  process.exit(0);
}
/** Returns one line on a readout fit: its ridge weight and the held-out knot error before and after (leg lengths: the cohort's leg lengths differ). */
function readoutLine(name: string, o: ReadoutOutcome | null): string {
  const r = readoutSummaryJson(o);
  if (!r) return `${name}: no readout (no stride prior)`;
  const milli = (x: number | null) => (x === null ? '-' : (1000 * x).toFixed(1));
  const kept = r.kept ? `lambda ${r.lambda}` : `none kept: ${r.dropped}`;
  const pair = (e: { before: number; after: number } | null) => `${milli(e?.before ?? null)} -> ${milli(e?.after ?? null)}`;
  const perWeight = (xs: { lambda: number; error: number }[]) => xs.map((e) => `${e.lambda}: ${milli(e.error)}`).join(', ');
  const robust = r.jitter_threshold !== null ? `lambda ${r.robust_lambda} above a jitter of ${milli(r.jitter_threshold)}` : 'not used';
  return [
    `${name} readout (${r.senders ?? '-'}): ${kept}; ${r.train_windows} training windows`,
    `held-out knot error ${pair(r.valid_knot_error_clean)} milli-leg-lengths on ${r.valid_windows} windows (${perWeight(r.valid_knot_error)})`,
    `with mild capture jitter ${pair(r.valid_knot_error_mild)}, with full ${pair(r.valid_knot_error_jittered)} (standard readout alone ${milli(r.valid_knot_error_jittered_clean_only)})`,
    `robust readout ${robust} (${perWeight(r.robust_valid_knot_error)})`,
  ].join('; ');
}
if (v['spread-only'] || v['readout-only']) {
  // Refit the pair readouts (with --readout-only) and recalibrate the forecast spread of an existing model file and its
  // twin on the held-out training subjects (weights, normative figures and joint discriminant untouched: the factors do not change).
  const loaded = loadModel(output), twin = twinOf(loaded, output);
  const validSubjects = loaded.training?.validSubjects;
  if (!validSubjects?.length) throw new Error(`${output}: the model file names no held-out subjects to calibrate on`);
  const options = { validSubjects, windowStride: recipe.windowStride };
  const split = runSplit(takes, options, loaded.model);
  const extra = calibrationTakes();
  const before = { k: loaded.model.spreadScale, adapt: loaded.model.spreadAdapt };
  const post = await postFit(loaded.model, twin, postFitInput(split, options, loaded.training, extra, Boolean(v['readout-only'])), recipe.threads);
  if (v['readout-only']) {
    console.log(readoutLine('model', post.model.readout));
    console.log(readoutLine('twin', post.twin?.readout ?? null));
  }
  const windows = post.model.windows;
  const extras = twin ? { ...loaded.extras, no_coupling: modelToJson(twin, (loaded.extras.no_coupling as { training?: TrainingSummary | null }).training ?? null) } : loaded.extras;
  saveModel(output, loaded.model, loaded.training, extras);
  const a = loaded.model.spreadAdapt;
  console.log(`${output}: spread recalibrated on ${windows} windows of ${validSubjects.length} held-out and ${extra.length} calibration subjects: scale ${before.k.toFixed(3)}${before.adapt ? ` (exponent ${before.adapt.exponent})` : ''} -> ${loaded.model.spreadScale.toFixed(3)}, exponent ${a ? a.exponent : 0}${a ? `, reference backcast ${a.reference.toFixed(4)} leg lengths` : ''}${twin ? `; twin ${twin.spreadScale.toFixed(3)}, exponent ${twin.spreadAdapt?.exponent ?? 0}` : ''}`);
  process.exit(0);
}
const tCohort = performance.now() - t0;
const bar = progressBar('train', Boolean(v.quiet || v.json));
let phase = 'model';
// Start of each phase in order (model, twin, post-fit, then the normative figures), for the wall time of each.
const marks: [string, number][] = [];
const pair = await fitPair(takes, {
  config: v.config ? (JSON.parse(v.config) as Record<string, never>) : undefined, learningRate: v.lr ? Number(v.lr) : undefined, twin: !v['no-twin'],
  epochs: recipe.epochs, seed: recipe.seed, windowStride: recipe.windowStride, threads: recipe.threads, calibrationTakes: calibrationTakes(),
  onPhase: (p) => { phase = p; marks.push([p, performance.now()]); },
  onProgress: (p) => bar.update(p.epoch * p.stepsPerEpoch + p.step, p.epochs * p.stepsPerEpoch, `${phase} epoch ${p.epoch + 1}/${p.epochs} loss ${p.trainLoss.toFixed(3)}${Number.isFinite(p.validLoss) ? ` held-out ${p.validLoss.toFixed(3)}` : ''}`),
});
bar.stop();
// Normative coupling figures from the normative cohort (48 walkers of their own seeds, never trained on).
marks.push(['norms', performance.now()]);
const norms = await cohortNorms(pair.model);
savePair(output, pair, { [COUPLING_NORMS_KEY]: norms });
const seconds = (performance.now() - t0) / 1000;
const s = pair.summary;
const report = {
  output, bytes: statSync(output).size, recipe, subjects: cohort.length, groups: Object.fromEntries(['normal', 'impaired', 'variable'].map((g) => [g, cohort.filter((c) => c.group === g).length])),
  cohort_s: Math.round(tCohort / 100) / 10, total_s: Math.round(seconds * 10) / 10,
  // Wall time of each phase: from its start to the next one's (the last to now).
  phase_s: Object.fromEntries(marks.map(([k, t], i) => [k, Math.round(((marks[i + 1]?.[1] ?? performance.now()) - t) / 100) / 10])),
  model: { epochs_run: s.epochs, best_epoch: s.bestEpoch + 1, steps: s.steps, ms_per_step: Math.round(s.msPerStep), valid_loss: s.best?.total ?? null, valid_forecast_mm: s.validForecastMm.map((x) => Math.round(x * 10) / 10), kl_static_per_dim: s.best?.klStaticPerDim ?? null, kl_dynamic_per_dim: s.best?.klDynamicPerDim ?? null },
  twin: pair.twinSummary ? { epochs_run: pair.twinSummary.epochs, best_epoch: pair.twinSummary.bestEpoch + 1, ms_per_step: Math.round(pair.twinSummary.msPerStep), valid_forecast_mm: pair.twinSummary.validForecastMm.map((x) => Math.round(x * 10) / 10) } : null,
  spread: pair.spread,
  readout: { model: readoutSummaryJson(pair.readout.model), twin: readoutSummaryJson(pair.readout.twin) },
  coupling_norms: { controls: norms.subjects, control_score_p50: norms.controlScoreP50, control_score_p90: norms.controlScoreP90 },
};
if (v.json) console.log(JSON.stringify(report, null, 2));
else {
  console.log(`wrote ${output} (${(report.bytes / 1024).toFixed(0)} KiB): ${cohort.length} subjects × ${recipe.seconds} s, ${s.epochs} epochs (best ${s.bestEpoch + 1}), ${s.steps} steps at ${report.model.ms_per_step} ms on ${recipe.threads} threads`);
  console.log(`  held-out forecast error (mm, mean over the second) before training and after each epoch: ${report.model.valid_forecast_mm.join(' ')}`);
  console.log(`  held-out loss ${report.model.valid_loss?.toFixed(4)}; KL per static dimension ${report.model.kl_static_per_dim?.map((x) => x.toFixed(3)).join(' ')}; per dynamic dimension ${report.model.kl_dynamic_per_dim?.map((x) => x.toFixed(3)).join(' ')}`);
  console.log(`  twin: ${report.twin ? `${report.twin.epochs_run} epochs (best ${report.twin.best_epoch}), ${report.twin.ms_per_step} ms a step, held-out forecast error ${report.twin.valid_forecast_mm.join(' ')}` : 'none'}; spread scales ${pair.spread.model.toFixed(3)} / ${pair.spread.twin?.toFixed(3) ?? '-'}`);
  console.log(`  ${readoutLine('model', pair.readout.model)}`);
  console.log(`  ${readoutLine('twin', pair.readout.twin)}`);
  console.log(`  normative coupling figures from ${norms.subjects} normal walkers: control take scores median ${norms.controlScoreP50.toFixed(2)}, 90th percentile ${norms.controlScoreP90.toFixed(2)}`);
  console.log(`  whole fit ${report.total_s} s (cohort synthesis ${report.cohort_s} s; ${Object.entries(report.phase_s).map(([k, x]) => `${k} ${x} s`).join(', ')})`);
  console.log('  joint discriminant: none yet for these weights; run npm run fit:joint-profiles');
}
