// One subject of the asymmetry validation (scripts/eval-asymmetry.ts): synthesize the take (and, in the
// second arm, narrow one joint's rotation channels afterwards), import it as a user's file, read the
// coupling model's factors and asymmetry, the classic symmetry indices, relative phase and vector
// coding, and what the factor probes need. Plain data out, so it can run in a worker thread.
import { classicAsymmetry } from '../src/analysis/classic-asymmetry.js';
import { classicPairCycles } from '../src/analysis/classic-couplings.js';
import { coupleNames, coupleVector, couplingAsymmetry, storedCouplingNorms } from '../src/analysis/coupling-asymmetry.js';
import { storedJointProfiles } from '../src/analysis/joint-profiles.js';
import { cycleFraction, takeFactors } from '../src/analysis/factors.js';
import { dampJointRotations } from '../src/bvh/damp.js';
import { analyzeGait, symmetryTable } from '../src/gait/analyze.js';
import { DEFAULT_LOWPASS_HZ } from '../src/gait/input.js';
import { loadModel, type LoadedModel } from '../src/model/modelfile.js';
import { mirrorTrack } from '../src/motion/mirror.js';
import { DEFAULT_PAIRS } from '../src/motion/roles.js';
import { trackFromImported } from '../src/motion/track.js';
import { resolveImported } from '../src/skeleton/import.js';
import type { RoleName } from '../src/skeleton/roles.js';
import type { AsymmetrySubject } from '../src/synth/cohort.js';
import { synthesizeTake } from '../src/synth/index.js';

/** What one subject contributes to the validation. */
export interface AsymmetryTakeResult {
  id: string;
  /** The take score (discriminant evidence with profiles, else the pair distance) and the pair distance. */
  score: number;
  distance: number;
  ciLow: number;
  ciHigh: number;
  side: 'left' | 'right';
  joint: string;
  /** How joint and side were named (learned profiles when the model file holds them). */
  attribution: 'profiles' | 'carried nodes';
  /** Joint and side by the carried-node rule (equal to joint and side without profiles). */
  nodeRule: { joint: string; side: 'left' | 'right' };
  /** The signed couple vector the profiles read (couples × S). */
  coupleVector: number[];
  /** Classic candidate scores by name (unsigned: larger = more asymmetric), null where not measurable. */
  classic: Record<string, number | null>;
  staticDims: number;
  dynamicDims: number;
  /** Static posterior means over the take, pairs × S. */
  staticMean: number[];
  /** Static posterior means of non-overlapping windows, windows × pairs × S. */
  staticWindows: number[];
  /** Dynamic factors of the same windows (windows × pairs × D) and the left gait-cycle fraction at their ends. */
  dynamicWindows: number[];
  phase: number[];
  /**
   * With `mirror`: the mirror image's score and side, the largest |static(p) − mirror image's static(m(p))|
   * of the mirror-averaged reading (the one every score uses) and of the encoder's raw reading, and the
   * range of the take's static factors over pairs for scale.
   */
  mirror: { score: number; side: 'left' | 'right'; swapError: number; rawSwapError: number; staticRange: number } | null;
  warnings: string[];
}

const models = new Map<string, LoadedModel>();

/**
 * Evaluates one subject with the model file at `modelPath`; `mirror` also scores the mirrored take.
 * `useProfiles` false ignores the file's joint discriminant (fit-joint-profiles refits it, stale or not).
 */
export function evaluateAsymmetryTake(subject: AsymmetrySubject, modelPath: string, mirror = false, useProfiles = true): AsymmetryTakeResult {
  let loaded = models.get(modelPath);
  if (!loaded) { loaded = loadModel(modelPath); models.set(modelPath, loaded); }
  const model = loaded.model, c = model.config;
  const norms = storedCouplingNorms(loaded.extras, c.nodes * (c.nodes - 1), c.staticDims);
  if (!norms) throw new Error(`${modelPath} holds no normative coupling figures`);
  const name = `${subject.id}.bvh`;
  let take = synthesizeTake(subject.options).take;
  if (subject.arm === 'edit') {
    const role = `${subject.side === 'left' ? 'l' : 'r'}_${subject.kind}` as RoleName;
    const joint = resolveImported(name, take).frame.roles.roles[role];
    if (!joint) throw new Error(`${name}: no ${role} role to edit`);
    take = dampJointRotations(take, joint.joint, 1 - subject.severity);
  }
  const imported = resolveImported(name, take);
  const track = trackFromImported(imported, { rate: c.rate });
  const f = takeFactors(model, track);
  const profiles = useProfiles ? storedJointProfiles(loaded.extras, coupleNames(), c.staticDims) : null;
  const a = couplingAsymmetry(f, norms, { profiles });
  // The carried-node rule beside the learned profiles (the same reading when the model has none).
  const rule = profiles ? couplingAsymmetry(f, norms, { replicates: 1 }) : a;
  const gait = analyzeGait(imported, { lowpassHz: DEFAULT_LOWPASS_HZ, steadyOnly: true });
  const classic: Record<string, number | null> = {};
  for (const [measure, e] of Object.entries(symmetryTable(gait))) classic[`SI ${measure}`] = e.symmetry_index_pct === null ? null : Math.abs(e.symmetry_index_pct);
  const { pairs } = classicPairCycles(gait);
  for (const p of classicAsymmetry(pairs, { replicates: 0 })) {
    const v = p.left_vs_right;
    const abs = (x: number | null) => (x === null ? null : Math.abs(x));
    classic[`CRP ${p.pair} curve RMS`] = v.crp_curve_rms_diff;
    classic[`CRP ${p.pair} |MARP|`] = abs(v.crp_marp_diff);
    classic[`CRP ${p.pair} |DP|`] = abs(v.crp_dp_diff);
    classic[`VC ${p.pair} angle RMS`] = v.vc_angle_rms_diff;
    classic[`VC ${p.pair} bins`] = v.vc_bin_diff;
    classic[`VC ${p.pair} |variability|`] = abs(v.vc_variability_diff);
  }
  // Non-overlapping windows: every (observe / step)-th of the 0.5-s series.
  const P = f.pairs, S = f.staticDims, D = f.dynamicDims;
  const stride = Math.max(1, Math.round(c.observe / Math.round(0.5 * track.rate)));
  const contacts = gait.detection.events.filter((e) => e.side === 'left' && e.kind === 'initial_contact').map((e) => e.time).sort((x, y) => x - y);
  const staticWindows: number[] = [], dynamicWindows: number[] = [], phase: number[] = [];
  for (let w = 0; w < f.windowEnds.length; w += stride) {
    for (let i = 0; i < P * S; i++) staticWindows.push(f.staticPerWindow[w * P * S + i]!);
    for (let i = 0; i < P * D; i++) dynamicWindows.push(f.dynamicSeries[w * P * D + i]!);
    phase.push(cycleFraction(contacts, f.times[w]!));
  }
  let mirrored: AsymmetryTakeResult['mirror'] = null;
  if (mirror) {
    const mt = mirrorTrack(track);
    const fm = takeFactors(model, mt);
    const am = couplingAsymmetry(fm, norms, { profiles });
    const raw = takeFactors(model, track, { mirrorAverage: false }), rawM = takeFactors(model, mt, { mirrorAverage: false });
    let swapError = 0, rawSwapError = 0, lo = Infinity, hi = -Infinity;
    for (let p = 0; p < P; p++)
      for (let s = 0; s < S; s++) {
        const v = f.staticMean[p * S + s]!, j = DEFAULT_PAIRS.mirror[p]! * S + s;
        lo = Math.min(lo, v); hi = Math.max(hi, v);
        swapError = Math.max(swapError, Math.abs(v - fm.staticMean[j]!));
        rawSwapError = Math.max(rawSwapError, Math.abs(raw.staticMean[p * S + s]! - rawM.staticMean[j]!));
      }
    mirrored = { score: am.score, side: am.side, swapError, rawSwapError, staticRange: hi - lo };
  }
  return {
    id: subject.id, score: a.score, distance: a.distance, ciLow: a.ciLow, ciHigh: a.ciHigh, side: a.side, joint: a.joint, attribution: a.attribution,
    nodeRule: { joint: rule.joint, side: rule.side }, coupleVector: Array.from(coupleVector(f, norms)), classic, staticDims: S, dynamicDims: D,
    staticMean: Array.from(f.staticMean), staticWindows, dynamicWindows, phase, mirror: mirrored,
    warnings: imported.warnings,
  };
}
