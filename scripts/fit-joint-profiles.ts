// Fits the joint attribution's discriminant (src/analysis/joint-profiles.ts) of a model file on the
// development cohort (src/synth/cohort.ts jointProfileCohort: invented walkers of seeds 60000+, 62000+
// and 65000+, joint-range impairments made by the walker and narrowed afterwards, shorter stance and
// step by the walker; jointProfileControls, seeds 68000+, give only the evidence percentiles; all
// disjoint from the validation cohort of eval:asymmetry) and stores it among the
// file's extras (weights untouched). Prints the cross-validated joint and side accuracy on the
// development subjects for every shrinkage tried beside the carried-node rule's on the same subjects.
//
// Run: npm run fit:joint-profiles [-- --model FILE] [--per-stratum N] [--workers N] [--dry-run] [--json]
import { availableParallelism } from 'node:os';
import { parseArgs } from 'node:util';
import { Piscina } from 'piscina';
import { progressBar } from '../src/cli/progress.js';
import { coupleNames } from '../src/analysis/coupling-asymmetry.js';
import { CV_FOLDS, fitJointProfiles, JOINT_PROFILES_KEY, type ProfileSample } from '../src/analysis/joint-profiles.js';
import { defaultModelPath } from '../src/model/default-model.js';
import { loadModel, saveModel } from '../src/model/modelfile.js';
import { jointOfKind, jointProfileCohort, jointProfileControls, type AsymmetrySubject } from '../src/synth/cohort.js';
import type { AsymmetryTakeResult } from './asymmetry-take.js';

const { values: v } = parseArgs({ options: { model: { type: 'string' }, 'per-stratum': { type: 'string' }, workers: { type: 'string' }, 'dry-run': { type: 'boolean' }, json: { type: 'boolean' }, quiet: { type: 'boolean' } } });
const modelPath = v.model ?? defaultModelPath();
const workers = Number(v.workers ?? Math.min(2, availableParallelism()));
const cohort = v['per-stratum'] === undefined ? jointProfileCohort() : jointProfileCohort(Number(v['per-stratum']));
const controls = jointProfileControls();

const jointOf = (s: AsymmetrySubject) => jointOfKind(s.kind);

const t0 = performance.now();
const pool = new Piscina({ filename: new URL('./asymmetry-worker.ts', import.meta.url).href, execArgv: ['--import', 'tsx'], minThreads: workers, maxThreads: workers });
const bar = progressBar('profiles', Boolean(v.quiet || v.json));
const results = new Map<string, AsymmetryTakeResult>();
let done = 0;
try {
  await Promise.all([...cohort, ...controls].map(async (s) => {
    results.set(s.id, (await pool.run({ subject: s, modelPath, mirror: false, useProfiles: false })) as AsymmetryTakeResult);
    bar.update(++done, cohort.length + controls.length, s.id);
  }));
} finally {
  bar.stop();
  await pool.destroy();
}
const loaded = loadModel(modelPath);
const samples: ProfileSample[] = cohort.map((s) => ({ z: results.get(s.id)!.coupleVector, joint: jointOf(s), source: s.arm === 'edit' ? 'edited' : jointOf(s) ? 'walker' : s.kind!, side: s.side! }));
const profiles = fitJointProfiles(samples, controls.map((s) => results.get(s.id)!.coupleVector), coupleNames(), loaded.model.config.staticDims);
// The carried-node rule on the same subjects (it fits nothing, so needs no cross-validation).
const rule = cohort.map((s) => results.get(s.id)!.nodeRule);
const jointSubjects = cohort.filter((s) => jointOf(s) !== null).length;
const ruleJoint = rule.filter((r, i) => r.joint === jointOf(cohort[i]!)).length / jointSubjects;
const ruleSide = rule.filter((r, i) => r.side === cohort[i]!.side).length / cohort.length;
const chosen = profiles.cv.find((r) => r.shrinkage === profiles.shrinkage)!;
if (!v['dry-run']) saveModel(modelPath, loaded.model, loaded.training, { ...loaded.extras, [JOINT_PROFILES_KEY]: profiles });
const report = {
  model: modelPath, written: !v['dry-run'], subjects: cohort.length, per_joint: profiles.subjects, side_only: profiles.sideOnlySubjects,
  shrinkage: profiles.shrinkage, cross_validated: profiles.cv, controls: profiles.controls, carried_node_rule: { joint: ruleJoint, side: ruleSide },
  elapsed_s: Math.round((performance.now() - t0) / 100) / 10,
};
if (v.json) console.log(JSON.stringify(report, null, 2));
else
  console.log([
    `${modelPath}: joint discriminant ${report.written ? 'stored' : 'fitted (dry run, not stored)'} from ${cohort.length} development subjects (${Object.entries(profiles.subjects).map(([j, n]) => `${j} ${n}`).join(', ')}, side only ${profiles.sideOnlySubjects}), shrinkage ${profiles.shrinkage}`,
    `  ${profiles.cv.length}-value grid, ${CV_FOLDS}-fold cross-validation (joint of the ${jointSubjects} joint subjects, side of all): ${profiles.cv.map((r) => `${r.shrinkage}: ${(100 * r.joint).toFixed(1)} / ${(100 * r.side).toFixed(1)} %`).join('; ')}`,
    `  evidence of ${profiles.controls.subjects} development controls outside the fit (seeds 68000+): median ${profiles.controls.evidenceP50.toFixed(2)}, 90th percentile ${profiles.controls.evidenceP90.toFixed(2)}`,
    `  chosen: joint ${(100 * chosen.joint).toFixed(1)} %, side ${(100 * chosen.side).toFixed(1)} % (chosen on these folds, so a little optimistic); carried-node rule on the same subjects: joint ${(100 * ruleJoint).toFixed(1)} %, side ${(100 * ruleSide).toFixed(1)} % (${report.elapsed_s} s)`,
  ].join('\n'));
