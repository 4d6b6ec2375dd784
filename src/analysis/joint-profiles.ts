// Joint and side attribution of coupling asymmetry by a learned linear discriminant. Each take gives a
// signed vector: for every mirror couple (p, m(p)) and static dimension, z = (static(p) − static(m(p)) − μ)
// / σ against the normative cohort (coupling-asymmetry.ts). Mirroring a take negates it, so "impaired on
// the right" is the negated pattern of "impaired on the left".
//
// Development subjects (their own cohort, never the validation one: src/synth/cohort.ts
// jointProfileCohort) are turned to the left side (negated when the right side was impaired) and grouped
// in classes: one per joint and way of impairing it (narrowed by the walker, edited afterwards), plus
// side-only classes for one-sided impairments of no single joint (shorter stance, shorter step). Classes
// share one covariance, the pooled within-class scatter shrunk toward a multiple of the identity,
// Σ = (1 − λ) S + λ (tr S / L) I (regularised discriminant analysis, Friedman 1989, "Regularized
// discriminant analysis", JASA 84). Class c gets weights w_c = Σ⁻¹ μ_c and bias ½ μ_cᵀ w_c; a take z
// scores each class on either side by |w_c · z| − bias_c (the Gaussian log-likelihood ratio up to terms
// every class shares). The best class of any kind names the side (the sign of w_c · z); the best joint
// class names the joint. λ is chosen from a grid by cross-validation on the development subjects.
//
// The best class score of any kind is also the take's evidence of a one-sided impairment: against a
// normal take (mean 0 by the norms' construction, same covariance) it is the log-likelihood ratio of the
// best-matching impairment, so it grows with severity along that impairment's direction instead of with
// every dimension's noise. Its 50th and 90th percentiles over development controls the fit never saw
// are stored beside the classes.
import { choleskyFactor, choleskySolveFactored } from '../nn/cholesky.js';
import type { JointGroup } from './coupling-asymmetry.js';

/** The joints named, in a fixed order. */
export const JOINT_GROUPS: readonly JointGroup[] = ['hip', 'knee', 'ankle', 'shoulder/arm'];

/** Shrinkage values tried by cross-validation, and the folds. */
export const SHRINKAGE_GRID: readonly number[] = [0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5];
export const CV_FOLDS = 8;

/** One class of the discriminant: a joint impaired one way (or a side-only impairment, joint null), turned to the left side. */
export interface DiscriminantClass {
  joint: JointGroup | null;
  source: string;
  weights: number[];
  bias: number;
  subjects: number;
}

/** The fitted discriminant and what it was fitted on. */
export interface JointProfiles {
  method: 'shrinkage-discriminant';
  staticDims: number;
  /** Couples named "sender→receiver" of each couple's first pair, in the vectors' order. */
  couples: string[];
  classes: DiscriminantClass[];
  /** The chosen shrinkage λ. */
  shrinkage: number;
  /** Development subjects per joint, and of the side-only classes. */
  subjects: Record<JointGroup, number>;
  sideOnlySubjects: number;
  /** Cross-validated accuracy per shrinkage tried: joint (of the joint subjects) and side (of all). */
  cv: { shrinkage: number; joint: number; side: number }[];
  /** Evidence (best class score) of development controls outside the fit: count, median, 90th percentile. */
  controls: { subjects: number; evidenceP50: number; evidenceP90: number };
}

/** One development subject: its signed couple vector, impaired joint (null: a side-only impairment), how it was impaired, and side. */
export interface ProfileSample {
  z: ArrayLike<number>;
  joint: JointGroup | null;
  /** How it was impaired (e.g. "walker", "edited", "stance"): one class per joint and source. */
  source: string;
  side: 'left' | 'right';
}

/** What the discriminant says of one take. */
export interface ProfileAttribution {
  joint: JointGroup;
  side: 'left' | 'right';
  /** Per joint, the best score |w · z| − bias of its classes (larger: more like that joint's impairment). */
  scores: Record<JointGroup, number>;
  /** The best score of any class: the log-likelihood ratio of the best-matching impairment against a normal take. */
  evidence: number;
  /** That best class: its joint (null for a side-only class, such as a shorter stance) and source; null when no class scored (a vector with NaN). */
  best: { joint: JointGroup | null; source: string } | null;
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
}

const classKey = (s: { joint: JointGroup | null; source: string }) => `${s.joint ?? '-'}|${s.source}`;

/** Class labels, means of the side-turned vectors and counts, with their pooled within-class scatter (L × L, divided by the subject count). */
interface ClassMoments { labels: { joint: JointGroup | null; source: string }[]; means: Float64Array[]; counts: number[]; scatter: Float64Array }

/** Returns the class moments of side-turned samples. */
function classMoments(samples: readonly ProfileSample[], L: number): ClassMoments {
  const keys = [...new Set(samples.map(classKey))].sort(), index = new Map(keys.map((k, c) => [k, c]));
  const labels = keys.map((k) => { const s = samples.find((x) => classKey(x) === k)!; return { joint: s.joint, source: s.source }; });
  const means = keys.map(() => new Float64Array(L)), counts = keys.map(() => 0), of = samples.map((s) => index.get(classKey(s))!);
  samples.forEach((s, n) => {
    const sign = s.side === 'left' ? 1 : -1, m = means[of[n]!]!;
    for (let i = 0; i < L; i++) m[i]! += sign * s.z[i]!;
    counts[of[n]!]!++;
  });
  means.forEach((m, c) => { for (let i = 0; i < L; i++) m[i]! /= counts[c]!; });
  const scatter = new Float64Array(L * L), d = new Float64Array(L);
  samples.forEach((s, n) => {
    const m = means[of[n]!]!, sign = s.side === 'left' ? 1 : -1;
    for (let i = 0; i < L; i++) d[i] = sign * s.z[i]! - m[i]!;
    for (let i = 0; i < L; i++) {
      const di = d[i]!, row = i * L;
      if (di !== 0) for (let j = 0; j <= i; j++) scatter[row + j]! += di * d[j]!;
    }
  });
  for (let i = 0; i < L; i++) for (let j = 0; j <= i; j++) { const v = scatter[i * L + j]! / samples.length; scatter[i * L + j] = v; scatter[j * L + i] = v; }
  return { labels, means, counts, scatter };
}

/** Returns the discriminant classes of given moments with shrinkage λ (0 < λ ≤ 1). */
function discriminantOf({ labels, means, counts, scatter }: ClassMoments, L: number, shrinkage: number): DiscriminantClass[] {
  if (!(shrinkage > 0 && shrinkage <= 1)) throw new RangeError(`shrinkage must lie in (0, 1] (got ${shrinkage})`);
  let trace = 0;
  for (let i = 0; i < L; i++) trace += scatter[i * L + i]!;
  // A scatter of zero (identical subjects) still needs a positive target.
  const target = trace > 0 ? trace / L : 1;
  const a = new Float64Array(L * L);
  for (let i = 0; i < L * L; i++) a[i] = (1 - shrinkage) * scatter[i]!;
  for (let i = 0; i < L; i++) a[i * L + i]! += shrinkage * target;
  const l = choleskyFactor(a, L, 'the shrunk covariance');
  return labels.map(({ joint, source }, c) => {
    const w = choleskySolveFactored(l, L, means[c]!);
    return { joint, source, weights: Array.from(w), bias: 0.5 * dot(w, means[c]!), subjects: counts[c]! };
  });
}

/** Returns the discriminant classes fitted on side-turned samples with shrinkage λ (0 < λ ≤ 1). */
export function fitDiscriminant(samples: readonly ProfileSample[], L: number, shrinkage: number): DiscriminantClass[] {
  return discriminantOf(classMoments(samples, L), L, shrinkage);
}

/** Returns the attribution of a signed couple vector by discriminant classes (at least one joint class). */
function attribute(z: ArrayLike<number>, classes: readonly DiscriminantClass[]): ProfileAttribution {
  const scores = Object.fromEntries(JOINT_GROUPS.map((j) => [j, -Infinity])) as Record<JointGroup, number>;
  let bestAny = -Infinity, side: 'left' | 'right' = 'left', joint: JointGroup = JOINT_GROUPS[0]!, bestJoint = -Infinity;
  let best: ProfileAttribution['best'] = null;
  for (const c of classes) {
    const a = dot(c.weights, z), sc = Math.abs(a) - c.bias;
    if (sc > bestAny) { bestAny = sc; side = a >= 0 ? 'left' : 'right'; best = { joint: c.joint, source: c.source }; }
    if (c.joint) {
      scores[c.joint] = Math.max(scores[c.joint], sc);
      if (sc > bestJoint) { bestJoint = sc; joint = c.joint; }
    }
  }
  return { joint, side, scores, evidence: bestAny, best };
}

/**
 * Returns the discriminant fitted on development subjects, its shrinkage chosen by `CV_FOLDS`-fold
 * cross-validation (subject i in fold i mod folds) for the best mean of joint and side accuracy (ties: the
 * larger λ), with the evidence percentiles of `controls` (signed couple vectors of control takes, at least
 * three, not among the samples). Throws RangeError without a subject of every joint, with too few controls,
 * or when the vectors do not fit.
 */
export function fitJointProfiles(samples: readonly ProfileSample[], controls: readonly ArrayLike<number>[], couples: readonly string[], staticDims: number, options: { shrinkages?: readonly number[]; folds?: number } = {}): JointProfiles {
  const L = couples.length * staticDims;
  if (samples.some((s) => s.z.length !== L) || controls.some((z) => z.length !== L)) throw new RangeError(`every vector needs ${couples.length} couples × ${staticDims} dimensions`);
  if (controls.length < 3) throw new RangeError(`the evidence percentiles need at least three control takes (got ${controls.length})`);
  for (const j of JOINT_GROUPS) if (!samples.some((s) => s.joint === j)) throw new RangeError(`joint profiles need development subjects of every joint (none for the ${j})`);
  const folds = Math.max(2, Math.min(options.folds ?? CV_FOLDS, samples.length));
  const jointSubjects = samples.filter((s) => s.joint !== null).length;
  // The moments of each fold's training part do not depend on λ: computed once per fold.
  const grid = options.shrinkages ?? SHRINKAGE_GRID, hits = grid.map(() => ({ joint: 0, side: 0 }));
  for (let f = 0; f < folds; f++) {
    const train = samples.filter((_, i) => i % folds !== f);
    if (!JOINT_GROUPS.every((j) => train.some((s) => s.joint === j))) continue;
    const moments = classMoments(train, L);
    grid.forEach((shrinkage, g) => {
      const classes = discriminantOf(moments, L, shrinkage);
      samples.forEach((s, i) => {
        if (i % folds !== f) return;
        const a = attribute(s.z, classes);
        if (a.side === s.side) hits[g]!.side++;
        if (s.joint !== null && a.joint === s.joint) hits[g]!.joint++;
      });
    });
  }
  const cv = grid.map((shrinkage, g) => ({ shrinkage, joint: hits[g]!.joint / jointSubjects, side: hits[g]!.side / samples.length }));
  const best = cv.reduce((b, r) => (r.joint + r.side > b.joint + b.side || (r.joint + r.side === b.joint + b.side && r.shrinkage > b.shrinkage) ? r : b));
  const subjects = Object.fromEntries(JOINT_GROUPS.map((j) => [j, samples.filter((s) => s.joint === j).length])) as Record<JointGroup, number>;
  const classes = fitDiscriminant(samples, L, best.shrinkage);
  const evidence = controls.map((z) => attribute(z, classes).evidence).sort((a, b) => a - b);
  const at = (q: number) => evidence[Math.min(evidence.length - 1, Math.round(q * (evidence.length - 1)))]!;
  return {
    method: 'shrinkage-discriminant', staticDims, couples: [...couples], classes, shrinkage: best.shrinkage,
    subjects, sideOnlySubjects: samples.length - jointSubjects, cv, controls: { subjects: evidence.length, evidenceP50: at(0.5), evidenceP90: at(0.9) },
  };
}

/** Returns the attribution of a take's signed couple vector by stored profiles. */
export function attributeByProfiles(z: ArrayLike<number>, p: JointProfiles): ProfileAttribution {
  if (z.length !== p.couples.length * p.staticDims) throw new RangeError('the couple vector does not fit the joint profiles');
  return attribute(z, p.classes);
}

/** The key of the joint profiles among a model file's extras. */
export const JOINT_PROFILES_KEY = 'joint_profiles';

/** Returns the joint profiles stored in a model file's extras (null when it has none); throws RangeError when they do not fit. */
export function storedJointProfiles(extras: Record<string, unknown>, couples: readonly string[], staticDims: number): JointProfiles | null {
  const v = extras[JOINT_PROFILES_KEY] as Partial<JointProfiles> | undefined;
  if (v === undefined) return null;
  const L = couples.length * staticDims;
  const finite = (x: unknown) => typeof x === 'number' && Number.isFinite(x);
  const ok = (a: unknown) => Array.isArray(a) && a.length === L && a.every(finite);
  if (!v || v.method !== 'shrinkage-discriminant' || !v.controls) throw new RangeError('the stored joint profiles are of an older kind: refit them (npm run fit:joint-profiles)');
  if (v.staticDims !== staticDims || !Array.isArray(v.couples) || v.couples.join() !== couples.join() || !Array.isArray(v.classes) || v.classes.length === 0
    || !v.classes.every((c) => c && (c.joint === null || JOINT_GROUPS.includes(c.joint)) && typeof c.source === 'string' && ok(c.weights) && finite(c.bias))
    || !JOINT_GROUPS.every((j) => v.classes!.some((c) => c.joint === j))
    || !(v.controls.subjects >= 3 && finite(v.controls.evidenceP50) && finite(v.controls.evidenceP90)))
    throw new RangeError(`the stored joint profiles do not fit the model (${couples.length} couples × ${staticDims} dimensions)`);
  return v as JointProfiles;
}
