// Joint attribution of coupling asymmetry by learned prototypes. Each take gives a signed vector: for
// every mirror couple (p, m(p)) and static dimension, z = (static(p) − static(m(p)) − μ) / σ against the
// normative cohort (coupling-asymmetry.ts). Mirroring a take negates it, so "impaired on the right" is
// the negated pattern of "impaired on the left". A prototype is the mean of the vectors of development
// subjects with one joint impaired in one way (a source: narrowed by the walker, or edited afterwards),
// each turned to the left side (negated when the right side was impaired), normalised to unit length.
// The development cohort is its own (seeds 60000+, src/synth/cohort.ts jointProfileCohort), never the
// validation cohort.
//
// A take is attributed by the prototype its vector projects on most strongly, either way round: the
// joint is that prototype's; the side is the sign of the projection on the mean of all prototypes (what
// every one-sided impairment shares). Measured by leave-one-out on 192 development subjects with the
// shipped model: joint 64.6 %, side 77.6 %, against one profile per joint (centred cosine) 58.9 % and
// 73.4 %, and the carried-node rule 43.2 % and 75.5 %; the ankle is rarely named either way.
import type { JointGroup } from './coupling-asymmetry.js';

/** The joints named, in a fixed order. */
export const JOINT_GROUPS: readonly JointGroup[] = ['hip', 'knee', 'ankle', 'shoulder/arm'];

/** One unit prototype over couples × static dimensions: a joint impaired one way, turned to the left side. */
export interface JointPrototype {
  joint: JointGroup;
  source: string;
  vector: number[];
  subjects: number;
}

/** Prototypes and what they were fitted on. */
export interface JointProfiles {
  staticDims: number;
  /** Couples named "sender→receiver" of each couple's first pair, in the vectors' order. */
  couples: string[];
  prototypes: JointPrototype[];
  /** Development subjects per joint. */
  subjects: Record<JointGroup, number>;
  /** Leave-one-out accuracy on the development subjects: joint and side. */
  looJoint: number;
  looSide: number;
}

/** One development subject: its signed couple vector, impaired joint, how it was impaired, and side. */
export interface ProfileSample {
  z: ArrayLike<number>;
  joint: JointGroup;
  /** How the joint was impaired (e.g. "walker", "edited"): one prototype per joint and source. */
  source: string;
  side: 'left' | 'right';
}

/** What attribution by profiles says of one take. */
export interface ProfileAttribution {
  joint: JointGroup;
  side: 'left' | 'right';
  /** Per joint, the largest |projection| of the vector (unit length) on its prototypes. */
  similarity: Record<JointGroup, number>;
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
}

function unit(v: Float64Array): Float64Array {
  const n = Math.sqrt(dot(v, v));
  if (n > 0) for (let i = 0; i < v.length; i++) v[i]! /= n;
  return v;
}

/** Returns unit prototypes (mean of side-turned vectors per joint and source); throws RangeError without a subject of every joint. */
function prototypesOf(samples: readonly ProfileSample[], L: number): JointPrototype[] {
  const out: JointPrototype[] = [];
  for (const j of JOINT_GROUPS) {
    const sources = [...new Set(samples.filter((s) => s.joint === j).map((s) => s.source))].sort();
    if (sources.length === 0) throw new RangeError(`joint profiles need development subjects of every joint (none for the ${j})`);
    for (const source of sources) {
      const acc = new Float64Array(L);
      let k = 0;
      for (const s of samples) {
        if (s.joint !== j || s.source !== source) continue;
        const sign = s.side === 'left' ? 1 : -1;
        for (let i = 0; i < L; i++) acc[i]! += sign * s.z[i]!;
        k++;
      }
      out.push({ joint: j, source, vector: Array.from(unit(acc)), subjects: k });
    }
  }
  return out;
}

/** Returns the attribution of a signed couple vector by unit prototypes. */
function attribute(z: ArrayLike<number>, prototypes: readonly JointPrototype[]): ProfileAttribution {
  const L = z.length, common = new Float64Array(L);
  for (const p of prototypes) for (let i = 0; i < L; i++) common[i]! += p.vector[i]! / prototypes.length;
  const norm = Math.sqrt(dot(z, z)) || 1;
  const similarity = Object.fromEntries(JOINT_GROUPS.map((j) => [j, 0])) as Record<JointGroup, number>;
  let best: JointGroup = prototypes[0]!.joint, bestSim = -Infinity;
  for (const p of prototypes) {
    const sim = Math.abs(dot(z, p.vector)) / norm;
    similarity[p.joint] = Math.max(similarity[p.joint], sim);
    if (sim > bestSim) { bestSim = sim; best = p.joint; }
  }
  return { joint: best, side: dot(z, common) >= 0 ? 'left' : 'right', similarity };
}

/** Returns profiles fitted on development subjects, with their leave-one-out accuracies. */
export function fitJointProfiles(samples: readonly ProfileSample[], couples: readonly string[], staticDims: number): JointProfiles {
  const L = couples.length * staticDims;
  if (samples.some((s) => s.z.length !== L)) throw new RangeError(`every vector needs ${couples.length} couples × ${staticDims} dimensions`);
  const full = prototypesOf(samples, L);
  let joint = 0, side = 0;
  samples.forEach((s, i) => {
    const a = attribute(s.z, prototypesOf(samples.filter((_, k) => k !== i), L));
    if (a.joint === s.joint) joint++;
    if (a.side === s.side) side++;
  });
  const subjects = Object.fromEntries(JOINT_GROUPS.map((j) => [j, samples.filter((s) => s.joint === j).length])) as Record<JointGroup, number>;
  return {
    staticDims, couples: [...couples], prototypes: full, subjects, looJoint: joint / samples.length, looSide: side / samples.length,
  };
}

/** Returns the attribution of a take's signed couple vector by stored profiles. */
export function attributeByProfiles(z: ArrayLike<number>, p: JointProfiles): ProfileAttribution {
  if (z.length !== p.couples.length * p.staticDims) throw new RangeError('the couple vector does not fit the joint profiles');
  return attribute(z, p.prototypes);
}

/** The key of the joint profiles among a model file's extras. */
export const JOINT_PROFILES_KEY = 'joint_profiles';

/** Returns the joint profiles stored in a model file's extras (null when it has none); throws RangeError when they do not fit. */
export function storedJointProfiles(extras: Record<string, unknown>, couples: readonly string[], staticDims: number): JointProfiles | null {
  const v = extras[JOINT_PROFILES_KEY] as Partial<JointProfiles> | undefined;
  if (v === undefined) return null;
  const L = couples.length * staticDims;
  const ok = (a: unknown) => Array.isArray(a) && a.length === L && a.every((x) => typeof x === 'number' && Number.isFinite(x));
  if (!v || v.staticDims !== staticDims || !Array.isArray(v.couples) || v.couples.join() !== couples.join() || !Array.isArray(v.prototypes) || v.prototypes.length === 0
    || !v.prototypes.every((p) => p && JOINT_GROUPS.includes(p.joint) && typeof p.source === 'string' && ok(p.vector)) || !JOINT_GROUPS.every((j) => v.prototypes!.some((p) => p.joint === j)))
    throw new RangeError(`the stored joint profiles do not fit the model (${couples.length} couples × ${staticDims} dimensions)`);
  return v as JointProfiles;
}
