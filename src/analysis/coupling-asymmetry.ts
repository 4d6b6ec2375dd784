// Left/right asymmetry of the static coupling factors against a normative cohort.
//
// For a pair p with mirror m(p) ≠ p (left hip → left knee with right hip → right knee, left knee → right
// ankle with right knee → left ankle, ...), the difference d_p = static(p) − static(m(p)) is compared with
// the normative cohort's mean and SD of the same difference (per factor dimension; the cohort counts each
// control with its mirror image, so μ_p = 0 and a take scores as its mirror image does): the pair score is
// the RMS over dimensions of (d_p − μ_p) / σ_p. The interval is a percentile bootstrap over blocks of
// windows (about a stride each), the take's pair distance the mean of the five highest pair scores, the joint the
// one whose carried nodes' couples score highest (the hip carries the knee, the knee the ankle, ...), and
// the side that of the joint's nodes lying farther from the cohort (a node's distance: the mean z-scored
// RMS distance of its pairs' factors from the cohort's). With a fitted joint discriminant
// (joint-profiles.ts) that names joint and side, the take score is its evidence (the log-likelihood ratio
// of the best-matching impairment against a normal take), compared with development controls'; without
// one, the score is the pair distance, compared with the normative controls'.
import { DEFAULT_PAIRS, MOTION_NODES } from '../motion/roles.js';
import { Pcg32 } from '../nn/prng.js';
import type { TakeFactors } from './factors.js';
import { attributeByProfiles, type JointProfiles } from './joint-profiles.js';

/** Normative static-factor figures per pair (pairs × S each), from control takes. */
export interface CouplingNorms {
  subjects: number;
  staticDims: number;
  staticMean: number[];
  staticSd: number[];
  diffMean: number[];
  diffSd: number[];
  /** Take scores of the control takes, each against the figures of the others (leave-one-out): median and 90th percentile. */
  controlScoreP50: number;
  controlScoreP90: number;
}

/** One mirror couple's asymmetry. */
export interface PairAsymmetry {
  /** Pair and mirror named by role, "l_hip→l_knee". */
  pair: string;
  mirror: string;
  score: number;
  ciLow: number;
  ciHigh: number;
  /** The side whose factors lie farther from the cohort: 'left', 'right' or 'midline' (both nodes central). */
  side: 'left' | 'right' | 'midline';
}

/** A take's coupling asymmetry. */
export interface CouplingAsymmetry {
  /** The take score (see scoreKind) with its bootstrap interval, and the controls' median and 90th percentile of the same score. */
  score: number;
  ciLow: number;
  ciHigh: number;
  scoreKind: 'discriminant evidence' | 'pair distance';
  controlP50: number;
  controlP90: number;
  /** The mean of the five highest pair scores (the score without a discriminant). */
  distance: number;
  side: 'left' | 'right';
  joint: JointGroup;
  ranked: PairAsymmetry[];
  joints: Record<JointGroup, number>;
  /** How joint and side were named: the learned discriminant of joint-profiles.ts, or the carried-node rule. */
  attribution: 'profiles' | 'carried nodes';
  /** With profiles: per joint, the discriminant's best score of its classes (larger: more like that joint's impairment). */
  jointScores: Record<JointGroup, number> | null;
  /**
   * With profiles, when a side-only class (one-sided impairment of no single joint) fits better than every
   * joint class: its wording, e.g. "a shorter stance"; the joint is then the best of the joint classes only.
   */
  pattern: string | null;
  summary: string;
}

export type JointGroup = 'hip' | 'knee' | 'ankle' | 'shoulder/arm';
// A joint's rotation shows first in the motion of the node it carries (its child in the chain): the hip
// moves the knee, the knee the ankle, the ankle the toe, the shoulder the elbow and wrist. The hip and
// shoulder nodes themselves ride on the pelvis and trunk, so they name no joint.
const JOINT_OF: Record<string, JointGroup> = { knee: 'hip', ankle: 'knee', toe: 'ankle', elbow: 'shoulder/arm', wrist: 'shoulder/arm' };
const TOP = 5;

/** Returns "sender→receiver" of pair p. */
export function pairName(p: number): string {
  return `${MOTION_NODES[DEFAULT_PAIRS.sender[p]!]}→${MOTION_NODES[DEFAULT_PAIRS.receiver[p]!]}`;
}

/** Returns the mirror couples (p < m(p)), each once. */
export function mirrorCouples(): number[] {
  const out: number[] = [];
  for (let p = 0; p < DEFAULT_PAIRS.count; p++) if (DEFAULT_PAIRS.mirror[p]! > p) out.push(p);
  return out;
}

/** Returns the side of node n. */
function sideOfNode(n: number): 'left' | 'right' | 'midline' {
  const name = MOTION_NODES[n]!;
  return name.startsWith('l_') ? 'left' : name.startsWith('r_') ? 'right' : 'midline';
}

/** Returns the normative figures of control takes' static factor means (each take counts once). */
export function couplingNorms(takes: readonly TakeFactors[]): CouplingNorms {
  const base = normsOf(takes);
  // Leave-one-out take scores of the controls: what "normal" looks like on takes the figures did not see.
  const loo = takes.map((t, i) => {
    const others = normsOf(takes.filter((_, j) => j !== i));
    const mean = meanOfWindows(t, Int32Array.from(t.windowEnds, (_, w) => w), new Float64Array(t.pairs * t.staticDims));
    return takeScore(mirrorCouples().map((p) => coupleScore(mean, p, t.staticDims, others)));
  }).sort((a, b) => a - b);
  const at = (q: number) => loo[Math.min(loo.length - 1, Math.round(q * (loo.length - 1)))]!;
  return { ...base, controlScoreP50: at(0.5), controlScoreP90: at(0.9) };
}

/**
 * Returns the means and SDs of the static factors and of their pair-minus-mirror differences over takes,
 * each take counted together with its mirror image (pair p's factors moved to m(p)): the figures are
 * then symmetric by construction (a pair and its mirror share their norms, the differences have mean 0),
 * so a take and its mirror image get the same score. With mirror-averaged factors the mirror image is
 * exactly that permutation; with raw factors it is the best available stand-in.
 */
function normsOf(takes: readonly TakeFactors[]): Omit<CouplingNorms, 'controlScoreP50' | 'controlScoreP90'> {
  const t0 = takes[0];
  if (!t0 || takes.length < 3) throw new RangeError('normative coupling figures need at least three control takes');
  const P = t0.pairs, S = t0.staticDims, n = takes.length;
  const mirror = DEFAULT_PAIRS.mirror;
  const acc = (value: (t: TakeFactors, p: number, d: number) => number) => {
    const mean = new Array<number>(P * S).fill(0), sd = new Array<number>(P * S).fill(0);
    for (let i = 0; i < P * S; i++) {
      const p = Math.floor(i / S), d = i % S;
      // The mirror image's value at pair p is the take's value at m(p) (for the differences: d_m(p) = −d_p).
      const xs = takes.flatMap((t) => [value(t, p, d), value(t, mirror[p]!, d)]);
      const m = xs.reduce((s, x) => s + x, 0) / xs.length;
      mean[i] = m;
      // A floor keeps a dimension the cohort never varies from dividing by zero; n − 1 degrees of freedom
      // (a take and its mirror image are one subject).
      sd[i] = Math.max(1e-3, Math.sqrt(xs.reduce((s, x) => s + (x - m) ** 2, 0) / 2 / (n - 1)));
    }
    return { mean, sd };
  };
  const staticValue = (t: TakeFactors, p: number, d: number) => t.staticMean[p * S + d]!;
  const diffValue = (t: TakeFactors, p: number, d: number) => t.staticMean[p * S + d]! - t.staticMean[mirror[p]! * S + d]!;
  const st = acc(staticValue);
  const df = acc(diffValue);
  return { subjects: n, staticDims: S, staticMean: st.mean, staticSd: st.sd, diffMean: df.mean, diffSd: df.sd };
}

/** Writes into `out` (pairs × S) the mean static factors of the chosen windows. */
function meanOfWindows(f: TakeFactors, windows: ArrayLike<number>, out: Float64Array): Float64Array {
  const PS = f.pairs * f.staticDims;
  out.fill(0);
  for (let k = 0; k < windows.length; k++) {
    const o = windows[k]! * PS;
    for (let i = 0; i < PS; i++) out[i]! += f.staticPerWindow[o + i]!;
  }
  for (let i = 0; i < PS; i++) out[i]! /= windows.length;
  return out;
}

/** Returns the signed couple vector of mean static factors: (s(p) − s(m(p)) − μ) / σ per couple of mirrorCouples() and dimension. */
function coupleVectorOf(s: Float64Array, S: number, norms: Pick<CouplingNorms, 'diffMean' | 'diffSd'>): Float64Array {
  const couples = mirrorCouples(), out = new Float64Array(couples.length * S), mirror = DEFAULT_PAIRS.mirror;
  couples.forEach((p, k) => {
    for (let d = 0; d < S; d++) {
      const i = p * S + d;
      out[k * S + d] = (s[i]! - s[mirror[p]! * S + d]! - norms.diffMean[i]!) / norms.diffSd[i]!;
    }
  });
  return out;
}

/** Returns a take's signed couple vector (joint-profiles.ts): its static factors' mean over every window against the norms. */
export function coupleVector(f: TakeFactors, norms: CouplingNorms): Float64Array {
  const mean = meanOfWindows(f, Int32Array.from(f.windowEnds, (_, w) => w), new Float64Array(f.pairs * f.staticDims));
  return coupleVectorOf(mean, f.staticDims, norms);
}

/** Returns the names of the mirror couples (their first pair), in the order of coupleVector. */
export function coupleNames(): string[] {
  return mirrorCouples().map(pairName);
}

/** Returns the pair score of couple p from mean static factors. */
function coupleScore(s: Float64Array, p: number, S: number, norms: Pick<CouplingNorms, 'diffMean' | 'diffSd'>): number {
  const m = DEFAULT_PAIRS.mirror[p]!;
  let z2 = 0;
  for (let d = 0; d < S; d++) {
    const i = p * S + d;
    z2 += ((s[i]! - s[m * S + d]! - norms.diffMean[i]!) / norms.diffSd[i]!) ** 2;
  }
  return Math.sqrt(z2 / S);
}

/** Returns the z-scored RMS distance of pair p's static factors from the cohort's. */
function distanceFromNorm(s: Float64Array, p: number, S: number, norms: CouplingNorms): number {
  let z2 = 0;
  for (let d = 0; d < S; d++) z2 += ((s[p * S + d]! - norms.staticMean[p * S + d]!) / norms.staticSd[p * S + d]!) ** 2;
  return Math.sqrt(z2 / S);
}

/** Returns the take score (mean of the highest TOP couple scores) of a set of couple scores. */
function takeScore(scores: readonly number[]): number {
  const top = [...scores].sort((a, b) => b - a).slice(0, TOP);
  return top.reduce((s, x) => s + x, 0) / top.length;
}

/**
 * Returns the coupling asymmetry of a take: ranked couples with bootstrap intervals (`replicates`
 * resamples of blocks of `blockWindows` consecutive windows, seeded), side, joint and summary.
 */
export function couplingAsymmetry(f: TakeFactors, norms: CouplingNorms, options: { replicates?: number; seed?: number; blockWindows?: number; profiles?: JointProfiles | null } = {}): CouplingAsymmetry {
  const S = f.staticDims;
  if (norms.staticDims !== S || norms.staticMean.length !== f.pairs * S) throw new RangeError('the normative coupling figures belong to another model');
  const couples = mirrorCouples(), n = f.windowEnds.length;
  const all = Int32Array.from({ length: n }, (_, i) => i);
  const mean = meanOfWindows(f, all, new Float64Array(f.pairs * S));
  const scores = couples.map((p) => coupleScore(mean, p, S, norms));
  // Bootstrap over blocks of windows (about a stride each at the default 0.5 s spacing).
  const block = Math.max(1, options.blockWindows ?? 2), blocks = Math.ceil(n / block);
  const R = options.replicates ?? 200, rng = new Pcg32(options.seed ?? 1, 0x626f6f74);
  // bootTake: the take score's replicates (the discriminant's evidence with profiles, else the pair distance).
  const boot = couples.map(() => new Float64Array(R)), bootTake = new Float64Array(R);
  const pick: number[] = [], buf = new Float64Array(f.pairs * S);
  for (let r = 0; r < R; r++) {
    pick.length = 0;
    for (let b = 0; b < blocks; b++) {
      const start = Math.floor(rng.next() * blocks) * block;
      for (let w = start; w < Math.min(n, start + block); w++) pick.push(w);
    }
    meanOfWindows(f, pick, buf);
    const rs = couples.map((p, k) => (boot[k]![r] = coupleScore(buf, p, S, norms)));
    bootTake[r] = options.profiles ? attributeByProfiles(coupleVectorOf(buf, S, norms), options.profiles).evidence : takeScore(rs);
  }
  const q = (xs: Float64Array, p: number) => { const s = Float64Array.from(xs).sort(); return s[Math.min(s.length - 1, Math.max(0, Math.round(p * (s.length - 1))))]!; };
  // Node deviation: the mean distance from the cohort of the pairs a node belongs to (both orders).
  const dist = Float64Array.from({ length: f.pairs }, (_, p) => distanceFromNorm(mean, p, S, norms));
  const nodeDev = new Float64Array(MOTION_NODES.length), nodeCount = new Float64Array(MOTION_NODES.length);
  for (let p = 0; p < f.pairs; p++) {
    const d = dist[p]!;
    for (const nIdx of [DEFAULT_PAIRS.sender[p]!, DEFAULT_PAIRS.receiver[p]!]) { nodeDev[nIdx]! += d; nodeCount[nIdx]!++; }
  }
  for (let n = 0; n < nodeDev.length; n++) nodeDev[n]! /= Math.max(1, nodeCount[n]!);
  // A pair's side: that of its nodes when both lie on one side, else that of the node farther from the cohort.
  const sideOf = (p: number): 'left' | 'right' | 'midline' => {
    const a = DEFAULT_PAIRS.sender[p]!, b = DEFAULT_PAIRS.receiver[p]!;
    const sa = sideOfNode(a), sb = sideOfNode(b);
    if (sa === sb || sb === 'midline') return sa;
    if (sa === 'midline') return sb;
    return nodeDev[a]! >= nodeDev[b]! ? sa : sb;
  };
  const ranked: PairAsymmetry[] = couples.map((p, k) => {
    const m = DEFAULT_PAIRS.mirror[p]!;
    return { pair: pairName(p), mirror: pairName(m), score: scores[k]!, ciLow: q(boot[k]!, 0.025), ciHigh: q(boot[k]!, 0.975), side: sideOf(dist[p]! >= dist[m]! ? p : m) };
  }).sort((a, b) => b.score - a.score);
  // Joint: the joint whose carried nodes' couples score highest on average.
  const sums: Record<JointGroup, { s: number; k: number }> = { hip: { s: 0, k: 0 }, knee: { s: 0, k: 0 }, ankle: { s: 0, k: 0 }, 'shoulder/arm': { s: 0, k: 0 } };
  couples.forEach((p, k) => {
    const groups = new Set<JointGroup>();
    for (const nIdx of [DEFAULT_PAIRS.sender[p]!, DEFAULT_PAIRS.receiver[p]!]) {
      const g = JOINT_OF[MOTION_NODES[nIdx]!.replace(/^[lr]_/, '')];
      if (g) groups.add(g);
    }
    for (const g of groups) { sums[g].s += scores[k]!; sums[g].k++; }
  });
  const joints = Object.fromEntries(Object.entries(sums).map(([g, v]) => [g, v.k ? v.s / v.k : 0])) as Record<JointGroup, number>;
  const byNodes = (Object.entries(joints) as [JointGroup, number][]).sort((a, b) => b[1] - a[1])[0]![0];
  // Side: the side whose nodes of that joint group lie farther from the cohort.
  let lean = 0;
  MOTION_NODES.forEach((name, n) => {
    if (JOINT_OF[name.replace(/^[lr]_/, '')] !== byNodes) return;
    if (name.startsWith('l_')) lean += nodeDev[n]!;
    if (name.startsWith('r_')) lean -= nodeDev[n]!;
  });
  // With learned joint profiles, their discriminant names joint and side instead.
  const learned = options.profiles ? attributeByProfiles(coupleVectorOf(mean, S, norms), options.profiles) : null;
  const joint = learned?.joint ?? byNodes;
  const side: 'left' | 'right' = learned?.side ?? (lean >= 0 ? 'left' : 'right');
  const distance = takeScore(scores);
  const scoreKind = learned ? 'discriminant evidence' : 'pair distance';
  const score = learned ? learned.evidence : distance;
  const ciLow = q(bootTake, 0.025), ciHigh = q(bootTake, 0.975);
  const controlP50 = learned ? options.profiles!.controls.evidenceP50 : norms.controlScoreP50;
  const controlP90 = learned ? options.profiles!.controls.evidenceP90 : norms.controlScoreP90;
  const top = ranked[0]!;
  const pattern = learned?.best && learned.best.joint === null ? sideOnlyWording(learned.best.source) : null;
  const where = pattern ? `most like ${pattern} on that side (nearest joint class: the ${joint})` : `most around the ${joint}`;
  const summary = `Coupling asymmetry ${score.toFixed(2)} (${scoreKind}; 95 % interval ${ciLow.toFixed(2)} to ${ciHigh.toFixed(2)}; control takes: median ${controlP50.toFixed(2)}, 90th percentile ${controlP90.toFixed(2)}): the ${side} side lies farther from the cohort, ${where}; the largest difference is ${top.pair} against ${top.mirror} (${top.score.toFixed(2)}).`;
  return { score, ciLow, ciHigh, scoreKind, controlP50, controlP90, distance, side, joint, ranked, joints, attribution: learned ? 'profiles' : 'carried nodes', jointScores: learned?.scores ?? null, pattern, summary };
}

/** Returns the words for a side-only class of the joint discriminant ("stance" → "a shorter stance"). */
export function sideOnlyWording(source: string): string {
  return source === 'stance' ? 'a shorter stance' : source === 'step' ? 'a shorter step' : `a one-sided ${source} pattern`;
}

/** The key of the normative figures among a model file's extras. */
export const COUPLING_NORMS_KEY = 'coupling_norms';

/** Returns the normative figures stored in a model file's extras, or null when it has none; throws RangeError when they do not fit. */
export function storedCouplingNorms(extras: Record<string, unknown>, pairs: number, staticDims: number): CouplingNorms | null {
  const v = extras[COUPLING_NORMS_KEY] as Partial<CouplingNorms> | undefined;
  if (v === undefined) return null;
  const n = pairs * staticDims;
  const ok = (a: unknown) => Array.isArray(a) && a.length === n && a.every((x) => typeof x === 'number' && Number.isFinite(x));
  if (!v || v.staticDims !== staticDims || !ok(v.staticMean) || !ok(v.staticSd) || !ok(v.diffMean) || !ok(v.diffSd) || typeof v.controlScoreP50 !== 'number' || typeof v.controlScoreP90 !== 'number')
    throw new RangeError(`the stored normative coupling figures do not fit the model (${pairs} pairs × ${staticDims} dimensions)`);
  return v as CouplingNorms;
}
