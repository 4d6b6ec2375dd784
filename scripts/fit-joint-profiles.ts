// Fits the joint attribution's prototypes (src/analysis/joint-profiles.ts) of a model file on the
// development cohort (src/synth/cohort.ts jointProfileCohort: invented walkers of seeds 60000+ and
// 65000+, joint-range impairments made by the walker and narrowed afterwards; disjoint from the
// validation cohort of eval:asymmetry) and stores them among the file's extras (weights untouched).
// Prints the leave-one-out joint and side accuracy on the development subjects beside the carried-node
// rule's on the same subjects.
//
// Run: npm run fit:joint-profiles [-- --model FILE] [--per-stratum N] [--workers N] [--dry-run] [--json]
import { availableParallelism } from 'node:os';
import { parseArgs } from 'node:util';
import { Piscina } from 'piscina';
import { progressBar } from '../src/cli/progress.js';
import { coupleNames, type JointGroup } from '../src/analysis/coupling-asymmetry.js';
import { fitJointProfiles, JOINT_PROFILES_KEY, type ProfileSample } from '../src/analysis/joint-profiles.js';
import { defaultModelPath } from '../src/model/default-model.js';
import { loadModel, saveModel } from '../src/model/modelfile.js';
import { jointProfileCohort, type AsymmetrySubject } from '../src/synth/cohort.js';
import type { AsymmetryTakeResult } from './asymmetry-take.js';

const { values: v } = parseArgs({ options: { model: { type: 'string' }, 'per-stratum': { type: 'string' }, workers: { type: 'string' }, 'dry-run': { type: 'boolean' }, json: { type: 'boolean' }, quiet: { type: 'boolean' } } });
const modelPath = v.model ?? defaultModelPath();
const workers = Number(v.workers ?? Math.min(2, availableParallelism()));
const cohort = jointProfileCohort(Number(v['per-stratum'] ?? 8));

/** Returns the joint group a development subject's impairment belongs to. */
function jointOf(s: AsymmetrySubject): JointGroup {
  return s.kind === 'arm' || s.kind === 'shoulder' ? 'shoulder/arm' : (s.kind as JointGroup);
}

const t0 = performance.now();
const pool = new Piscina({ filename: new URL('./asymmetry-worker.ts', import.meta.url).href, execArgv: ['--import', 'tsx'], minThreads: workers, maxThreads: workers });
const bar = progressBar('profiles', Boolean(v.quiet || v.json));
const results = new Map<string, AsymmetryTakeResult>();
let done = 0;
try {
  await Promise.all(cohort.map(async (s) => {
    results.set(s.id, (await pool.run({ subject: s, modelPath, mirror: false })) as AsymmetryTakeResult);
    bar.update(++done, cohort.length, s.id);
  }));
} finally {
  bar.stop();
  await pool.destroy();
}
const loaded = loadModel(modelPath);
const samples: ProfileSample[] = cohort.map((s) => ({ z: results.get(s.id)!.coupleVector, joint: jointOf(s), source: s.arm === 'edit' ? 'edited' : 'walker', side: s.side! }));
const profiles = fitJointProfiles(samples, coupleNames(), loaded.model.config.staticDims);
// The carried-node rule on the same subjects (it fits nothing, so no leave-one-out is needed).
const rule = cohort.map((s) => results.get(s.id)!.nodeRule);
const ruleJoint = rule.filter((r, i) => r.joint === jointOf(cohort[i]!)).length / cohort.length;
const ruleSide = rule.filter((r, i) => r.side === cohort[i]!.side).length / cohort.length;
if (!v['dry-run']) saveModel(modelPath, loaded.model, loaded.training, { ...loaded.extras, [JOINT_PROFILES_KEY]: profiles });
const report = {
  model: modelPath, written: !v['dry-run'], subjects: cohort.length, per_joint: profiles.subjects,
  profiles_loo: { joint: profiles.looJoint, side: profiles.looSide }, carried_node_rule: { joint: ruleJoint, side: ruleSide },
  elapsed_s: Math.round((performance.now() - t0) / 100) / 10,
};
if (v.json) console.log(JSON.stringify(report, null, 2));
else
  console.log(`${modelPath}: joint profiles ${report.written ? 'stored' : 'fitted (dry run, not stored)'} from ${cohort.length} development subjects (${Object.entries(profiles.subjects).map(([j, n]) => `${j} ${n}`).join(', ')}); leave-one-out: joint ${(100 * profiles.looJoint).toFixed(1)} %, side ${(100 * profiles.looSide).toFixed(1)} %; carried-node rule on the same subjects: joint ${(100 * ruleJoint).toFixed(1)} %, side ${(100 * ruleSide).toFixed(1)} % (${report.elapsed_s} s)`);
