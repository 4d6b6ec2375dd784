// `jointloom couplings <take>`: the coupling model's static factors per joint pair, the classic coupling
// measures (continuous relative phase, vector coding) and the left/right coupling asymmetry against the
// normative cohort stored in the model file.
import type { Command } from 'commander';
import { coupleNames, couplingAsymmetry, pairName, storedCouplingNorms, type CouplingAsymmetry } from '../analysis/coupling-asymmetry.js';
import { storedJointProfiles, type JointProfiles } from '../analysis/joint-profiles.js';
import { classicCouplings } from '../analysis/classic-couplings.js';
import { dynamicOverCycle, takeFactors, type TakeFactors } from '../analysis/factors.js';
import { InputError } from '../errors/index.js';
import { analyzeGait, gaitResultJson } from '../gait/analyze.js';
import { couplingReportHtml } from '../report/coupling-html.js';
import { writeFileAtomic } from '../util/atomic.js';
import { DEFAULT_LOWPASS_HZ } from '../gait/input.js';
import { defaultModelPath } from '../model/default-model.js';
import { loadModel } from '../model/modelfile.js';
import { DEFAULT_PAIRS, MOTION_NODES } from '../motion/roles.js';
import { trackFromImported } from '../motion/track.js';
import { importTake } from '../skeleton/import.js';
import { domainCheckJson, domainWarning, modelDomainCheck } from '../model/domain.js';
import { CAUTION } from './caution.js';
import { VERSION, emit, newCommand } from './program.js';
import { importOptionsFrom, withImportOptions, type ImportFlags } from './import-options.js';

interface CouplingsFlags extends ImportFlags {
  model?: string;
  json?: boolean;
  html?: string;
}

const r3 = (v: number) => (Number.isFinite(v) ? Math.round(v * 1000) / 1000 : null);

/** Returns the JSON of the coupling asymmetry. */
export function asymmetryJson(a: CouplingAsymmetry): Record<string, unknown> {
  return {
    score: r3(a.score), ci_low: r3(a.ciLow), ci_high: r3(a.ciHigh), score_kind: a.scoreKind,
    control_p50: r3(a.controlP50), control_p90: r3(a.controlP90), distance: r3(a.distance), side: a.side, joint: a.joint,
    pattern: a.pattern, attribution: a.attribution,
    joint_scores: a.jointScores ? Object.fromEntries(Object.entries(a.jointScores).map(([k, v]) => [k, r3(v)])) : null,
    joints: Object.fromEntries(Object.entries(a.joints).map(([k, v]) => [k, r3(v)])),
    ranked: a.ranked.map((r) => ({ pair: r.pair, mirror: r.mirror, score: r3(r.score), ci_low: r3(r.ciLow), ci_high: r3(r.ciHigh), side: r.side })),
    summary: a.summary,
  };
}

/** Returns the per-pair static factors as JSON rows, pair members named by role. */
function pairsJson(f: TakeFactors): Record<string, unknown>[] {
  const S = f.staticDims;
  return Array.from({ length: f.pairs }, (_, p) => ({
    a: MOTION_NODES[DEFAULT_PAIRS.sender[p]!], b: MOTION_NODES[DEFAULT_PAIRS.receiver[p]!],
    static_mean: Array.from(f.staticMean.subarray(p * S, (p + 1) * S), r3),
    static_sd: Array.from(f.staticSd.subarray(p * S, (p + 1) * S), r3),
  }));
}

/** Registers `couplings` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('couplings')
    .description('joint-pair coupling of a take: the model\'s static factors per pair, classic relative phase and vector coding, and left/right coupling asymmetry against the normative cohort in the model file')
    .argument('<take>', 'BVH file')
    .option('--model <file>', 'coupling model file (default: the shipped model)')
    .option('--json', 'print JSON: pairs, classic, asymmetry, dynamic factors over the gait cycle')
    .option('--html <file>', 'write the coupling report (heat matrix, gait-phase factors, classic measures, ranked asymmetry)');
  withImportOptions(cmd).action((path: string, flags: CouplingsFlags) => {
    const modelPath = flags.model ?? defaultModelPath();
    const loaded = loadModel(modelPath);
    const model = loaded.model;
    const imported = importTake(path, importOptionsFrom(flags));
    const track = trackFromImported(imported, { rate: model.config.rate });
    if (track.steps <= model.config.observe) throw new InputError(`${path}: the take is ${(track.steps / track.rate).toFixed(2)} s long; coupling factors need more than ${(model.config.observe / model.config.rate).toFixed(1)} s.`);
    const factors = takeFactors(model, track);
    const domain = modelDomainCheck(model.config, track);
    const outside = domain.inside ? null : domainWarning(domain, 'its coupling factors and asymmetry');
    if (outside && !flags.json) process.stderr.write(`jointloom: warning: ${path}: ${outside}\n`);
    let norms;
    try { norms = storedCouplingNorms(loaded.extras, factors.pairs, factors.staticDims); } catch (e) { throw new InputError(`${modelPath}: ${(e as Error).message}.`); }
    const asym = norms ? couplingAsymmetry(factors, norms, { profiles: profilesOf(loaded.extras, factors.staticDims, modelPath) }) : null;
    const gait = analyzeGait(imported, { lowpassHz: DEFAULT_LOWPASS_HZ, steadyOnly: true });
    const classic = classicCouplings(gait);
    const contacts = (side: 'left' | 'right') => gait.detection.events.filter((e) => e.side === side && e.kind === 'initial_contact').map((e) => e.time);
    const cycle = dynamicOverCycle(factors, { left: contacts('left'), right: contacts('right') });
    if (flags.html) {
      const g = gaitResultJson(gait, { tool: 'jointloom', version: VERSION, file: path });
      const si = g.symmetry_index_pct as Record<string, number | null>, prep = g.preprocessing as { lowpass_hz: number | null; filter: string };
      writeFileAtomic(flags.html, couplingReportHtml({ file: path, model: modelPath, version: VERSION, factors, cycle, asymmetry: asym, classic, symmetryIndex: si, filter: { lowpass_hz: prep.lowpass_hz, filter: prep.filter }, domainWarning: outside }, CAUTION));
    }
    if (flags.json) {
      const D = factors.dynamicDims, P = factors.pairs;
      emit(JSON.stringify({
        tool: 'jointloom', version: VERSION, file: path, model: modelPath, windows: factors.windowEnds.length,
        pairs: pairsJson(factors),
        classic,
        asymmetry: asym ? asymmetryJson(asym) : null,
        dynamic_over_cycle: {
          bins: cycle.bins, note: 'per pair, mean of each dynamic dimension per 5 % of the gait cycle (sender on the right: right cycle, else left); null where no window fell',
          pairs: Object.fromEntries(Array.from({ length: P }, (_, p) => [pairName(p), Array.from({ length: cycle.bins }, (_, b) => Array.from({ length: D }, (_, d) => r3(cycle.mean[(b * P + p) * D + d]!)))])),
        },
        caution: CAUTION,
        domain: domainCheckJson(domain),
        warnings: [...imported.warnings, ...classic.warnings, ...(norms ? [] : [`${modelPath} holds no normative coupling figures, so no asymmetry is scored`]), ...(outside ? [`${path}: ${outside}`] : [])],
      }));
      return;
    }
    const lines = [`${path}: ${factors.windowEnds.length} windows read with ${modelPath}`];
    if (asym) {
      lines.push(`  ${asym.summary}`, '  largest pair differences (score, 95 % interval, side farther from the cohort):');
      for (const r of asym.ranked.slice(0, 8)) lines.push(`    ${r.pair.padEnd(24)} vs ${r.mirror.padEnd(24)} ${r.score.toFixed(2).padStart(6)}  ${r.ciLow.toFixed(2)}-${r.ciHigh.toFixed(2)}  ${r.side}`);
      if (asym.jointScores) lines.push(`  joint, side and take score from the model's learned joint discriminant (the score: its evidence, a log-likelihood ratio of the best-matching one-sided impairment against a normal take); pair distance (mean of the five largest pair scores) ${asym.distance.toFixed(2)}; scores by joint: ${Object.entries(asym.jointScores).map(([k, v]) => `${k} ${v.toFixed(2)}`).join(', ')}`);
      lines.push(`  by joint: ${Object.entries(asym.joints).map(([k, v]) => `${k} ${v.toFixed(2)}`).join(', ')}`, `    (each joint scored by the couples of the nodes it carries: hip the knee, knee the ankle, ankle the toe, shoulder the elbow and wrist${asym.jointScores ? '' : '; this names the joint'})`);
    } else lines.push(`  ${modelPath} holds no normative coupling figures, so no asymmetry is scored`);
    lines.push('  classic left-right differences, 95 % bootstrap intervals over cycles:');
    const fmt = (v: number | null, ci: [number, number] | null | undefined) => (v === null ? '–' : `${v.toFixed(1)}${ci ? ` (${ci[0].toFixed(1)}-${ci[1].toFixed(1)})` : ''}`);
    for (const a of classic.asymmetry)
      lines.push(`    ${a.pair.padEnd(11)} relative phase MARP ${fmt(a.left_vs_right.crp_marp_diff, a.ci?.crp_marp_diff)}°, coupling angle RMS ${fmt(a.left_vs_right.vc_angle_rms_diff, a.ci?.vc_angle_rms_diff)}°  (${a.cycles.left}/${a.cycles.right} cycles)`);
    lines.push('', CAUTION);
    emit(lines.join('\n'));
  });
  program.addCommand(cmd);
}

/** Returns the joint profiles stored in the model file (null without), or throws InputError naming the file when they do not fit. */
function profilesOf(extras: Record<string, unknown>, staticDims: number, modelPath: string): JointProfiles | null {
  try {
    return storedJointProfiles(extras, coupleNames(), staticDims);
  } catch (e) {
    throw new InputError(`${modelPath}: ${(e as Error).message}.`);
  }
}
