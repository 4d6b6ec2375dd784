// Fixed synthetic cohorts for the coupling model: the training cohort the default model is fitted on, the
// subjects its forecast spread is also calibrated on, and the held-out cohort `npm run eval:forecast`
// scores it on. All are lists of walker options derived from fixed seeds (training 20000 + i, the
// calibration subjects the seeds after the training ones, held-out 70000 + i: disjoint), so they
// regenerate exactly. Every
// subject is invented; the spreads of height, speed and cadence are typical adult walking ranges (common
// practice), the impairments the walker's own.
import type { SideImpairment, SynthOptions } from './options.js';
import type { NamingStyle } from './naming.js';
import { Mulberry32 } from './prng.js';

/** Groups of the held-out cohort. */
export type CohortGroup = 'normal' | 'impaired' | 'variable' | 'other' | 'stumble' | 'noisy';

/** One subject of a cohort: a pseudonymous id, its group and the walker options of its take. */
export interface CohortSubject {
  id: string;
  group: CohortGroup;
  options: Partial<SynthOptions> & { seed: number };
}

/** Impairments the cohorts cycle through (each on the left or right side). */
const IMPAIRMENTS: SideImpairment[] = [
  { kneeRange: 0.5, compensate: true },
  { ankleRange: 0.5, compensate: true },
  { hipRange: 0.6, compensate: true },
  { stanceShortening: 0.7, stepShortening: 0.4, compensate: true },
  { armSwing: 0.3 },
  { kneeRange: 0.75, stepShortening: 0.3 },
];
const NAMINGS: NamingStyle[] = ['camel', 'snake', 'dotted', 'prefixed', 'caps'];

/** Returns walker options for subject seed `seed` of a cohort, body and pace drawn from the seed. */
function subjectOptions(seed: number, duration: number, frameRate: number): Partial<SynthOptions> & { seed: number } {
  const r = new Mulberry32(seed * 7919 + 17);
  const height = 1.55 + 0.35 * r.next();
  const speed = 0.95 + 0.5 * r.next();
  // Cadence rises with speed and falls with height (common practice: about 95-125 steps/min).
  const cadence = Math.round(100 + 18 * (speed - 0.95) / 0.5 - 10 * (height - 1.72) + 6 * (r.next() - 0.5));
  return {
    seed, subjectSeed: seed, height: round3(height), speed: round3(speed), cadence, duration, frameRate,
    strideTimeCv: round3(0.01 + 0.015 * r.next()), stepLengthCv: round3(0.015 + 0.015 * r.next()),
  };
}

function round3(x: number): number {
  return Math.round(x * 1000) / 1000;
}

/**
 * Returns the training cohort: `count` subjects (default 32) of `duration` seconds each (default 30):
 * normal gait with natural variability, every third subject impaired on one side, every fourth highly
 * variable, naming styles, units and up axes mixed. Every walk is straight: the stride prior repeats
 * strides in the world (baselines.ts), so on turns its errors are tens of centimetres and would swamp
 * what the model learns on straight walking.
 */
export function trainingCohort(count = 32, duration = 30): CohortSubject[] {
  return trainingSequence(0, count, duration, 'TR');
}

/**
 * Returns the spread calibration cohort of a model trained on the first `after` training subjects: the
 * next `count` subjects of the training cohort's own sequence (same recipe and group mix, seeds after
 * the training seeds, never trained on), ids CA…. The every-fifth held-out training subjects the
 * training stops on can miss a group (the shipped model's six hold no highly variable walker); these
 * subjects join them when the forecast spread is calibrated.
 */
export function calibrationCohort(after = 32, count = 16, duration = 30): CohortSubject[] {
  return trainingSequence(after, count, duration, 'CA');
}

/** Returns subjects `from` … `from + count − 1` of the training cohort's sequence, ids `prefix` and their 1-based number in the returned list. */
function trainingSequence(from: number, count: number, duration: number, prefix: string): CohortSubject[] {
  const out: CohortSubject[] = [];
  for (let i = from; i < from + count; i++) {
    const seed = 20000 + i;
    const o = subjectOptions(seed, duration, 60);
    let group: CohortGroup = 'normal';
    if (i % 3 === 1) {
      const side = i % 2 === 0 ? 'left' : 'right';
      o.impairments = { [side]: IMPAIRMENTS[Math.floor(i / 3) % IMPAIRMENTS.length]! };
      group = 'impaired';
    } else if (i % 4 === 3) {
      o.strideTimeCv = 0.04;
      o.stepLengthCv = 0.05;
      group = 'variable';
    }
    o.naming = NAMINGS[i % NAMINGS.length]!;
    o.units = (['cm', 'm', 'mm', 'in'] as const)[i % 4]!;
    o.upAxis = i % 6 === 4 ? 'Z' : 'Y';
    out.push({ id: `${prefix}${String(i - from + 1).padStart(3, '0')}`, group, options: o });
  }
  return out;
}

/**
 * Returns the held-out cohort, `perGroup` subjects per group (default 5): normal; impaired (one side);
 * highly variable (stride-time CV 5 %, step-length CV 6 %); other bodies and files (heights 1.45-2.05 m,
 * every naming style, m/mm/in, Z up, mixed rotation orders, 100 and 120 Hz); stumble takes (one
 * stumble at a known time, for the surprise timeline); and noisy captures (sensor jitter of 0.3-1° on
 * every rotation channel and 1-3 mm on the root, as a marker set with poor coverage gives). The noisy
 * group comes last, so the other groups keep the seeds they had before it was added.
 */
export function heldOutCohort(perGroup = 5, duration = 30): CohortSubject[] {
  const out: CohortSubject[] = [];
  const groups: CohortGroup[] = ['normal', 'impaired', 'variable', 'other', 'stumble', 'noisy'];
  let i = 0;
  for (const group of groups)
    for (let k = 0; k < perGroup; k++, i++) {
      const seed = 70000 + i;
      const o = subjectOptions(seed, duration, 60);
      if (group === 'impaired') o.impairments = { [k % 2 === 0 ? 'left' : 'right']: IMPAIRMENTS[k % IMPAIRMENTS.length]! };
      if (group === 'variable') { o.strideTimeCv = 0.05; o.stepLengthCv = 0.06; }
      if (group === 'other') {
        o.height = round3(1.45 + (0.6 * k) / Math.max(1, perGroup - 1));
        o.naming = NAMINGS[k % NAMINGS.length]!;
        o.units = (['m', 'mm', 'in', 'cm'] as const)[k % 4]!;
        o.upAxis = k % 2 === 0 ? 'Z' : 'Y';
        o.rotationOrder = k % 3 === 0 ? 'mixed' : k % 3 === 1 ? 'XYZ' : 'YZX';
        o.frameRate = k % 2 === 0 ? 100 : 120;
      }
      if (group === 'noisy') {
        const f = k / Math.max(1, perGroup - 1);
        o.noise = { rotationDeg: round3(0.3 + 0.7 * f), positionMm: round3(1 + 2 * f) };
      }
      if (group === 'stumble') o.stumbles = [{ time: round3(10 + 8 * (k / Math.max(1, perGroup))), side: k % 2 === 0 ? 'left' : 'right' }];
      out.push({ id: `HO${String(i + 1).padStart(3, '0')}`, group, options: o });
    }
  return out;
}

/**
 * Returns the normative coupling cohort (seeds 30000+, disjoint from every other cohort): `count` normal
 * walkers (default 48) with natural left/right differences of scale 0.5-1.5, naming styles and units
 * mixed. Their coupling factors define "normal" for the asymmetry score (src/analysis/coupling-asymmetry.ts).
 */
export function normativeCohort(count = 48, duration = 30): CohortSubject[] {
  const pick = new Mulberry32(3131);
  return Array.from({ length: count }, (_, i) => {
    const o = subjectOptions(30000 + i, duration, 60);
    o.asymmetry = round3(0.5 + pick.next());
    o.naming = NAMINGS[i % NAMINGS.length]!;
    o.units = (['cm', 'm', 'mm', 'in'] as const)[i % 4]!;
    return { id: `NC${String(i + 1).padStart(3, '0')}`, group: 'normal' as const, options: o };
  });
}

/** One-sided impairments of the asymmetry validation cohort. */
export type AsymmetryKind = 'knee' | 'hip' | 'ankle' | 'stance' | 'step' | 'arm';

/** Returns the joint a subject's impairment kind narrows (reduced arm swing and the edited shoulder: the shoulder/arm), or null for a kind of no single joint (stance, step, none). */
export function jointOfKind(kind: string | null): 'hip' | 'knee' | 'ankle' | 'shoulder/arm' | null {
  if (kind === 'arm' || kind === 'shoulder') return 'shoulder/arm';
  return kind === 'hip' || kind === 'knee' || kind === 'ankle' ? kind : null;
}
export const ASYMMETRY_KINDS: readonly AsymmetryKind[] = ['knee', 'hip', 'ankle', 'stance', 'step', 'arm'];
/** Joints whose rotation channels the second arm narrows after the fact (the shoulder: the arm swing). */
export type EditedJoint = 'hip' | 'knee' | 'ankle' | 'shoulder';
export const EDITED_JOINTS: readonly EditedJoint[] = ['hip', 'knee', 'ankle', 'shoulder'];
/** Severity strata, fractions: [low, high). */
export const SEVERITY_STRATA: readonly [number, number][] = [[0.1, 0.2], [0.2, 0.3], [0.3, 0.4]];

/** One subject of the asymmetry validation cohort. */
export interface AsymmetrySubject {
  id: string;
  /** control: natural left/right differences only; synth: impaired by the walker; edit: a normal take narrowed afterwards. */
  arm: 'control' | 'synth' | 'edit';
  kind: AsymmetryKind | EditedJoint | null;
  side: 'left' | 'right' | null;
  /** 0 for controls, else 0.1-0.4. */
  severity: number;
  options: Partial<SynthOptions> & { seed: number };
}

/**
 * Returns the walker's impairment of a kind at a severity (0..1): the ranges and the arm swing keep
 * 1 − severity of their normal range; stance and step shortening reach the walker's "marked" value
 * (1) at a severity of 40 %.
 */
export function impairmentOf(kind: AsymmetryKind, severity: number, compensate: boolean): SideImpairment {
  const short = Math.min(1, severity / 0.4);
  switch (kind) {
    case 'knee': return { kneeRange: round3(1 - severity), compensate };
    case 'hip': return { hipRange: round3(1 - severity), compensate };
    case 'ankle': return { ankleRange: round3(1 - severity), compensate };
    case 'stance': return { stanceShortening: round3(short), compensate };
    case 'step': return { stepShortening: round3(short), compensate };
    case 'arm': return { armSwing: round3(1 - severity), compensate };
  }
}

/** Seeds of an asymmetry cohort: walkers (controls and walker-made impairments), edited walkers, and the side and severity draws. */
export interface AsymmetrySeeds { walkers: number; edited: number; pick: number }
const VALIDATION_SEEDS: AsymmetrySeeds = { walkers: 40000, edited: 50000, pick: 4242 };

/** The walker-made kinds that narrow one joint's range (the arm swing counts as the shoulder's). */
export const JOINT_RANGE_KINDS: readonly AsymmetryKind[] = ['knee', 'hip', 'ankle', 'arm'];

/** The walker-made kinds that impair one side without narrowing one joint (they teach the attribution sides only). */
export const SIDE_ONLY_KINDS: readonly AsymmetryKind[] = ['stance', 'step'];

/**
 * Returns the development cohort's controls (seeds 68000+, ids DC…): walkers with natural left/right
 * differences, unseen by the discriminant's fit, whose evidence scores give the controls' percentiles.
 */
export function jointProfileControls(count = 48, duration = 30): AsymmetrySubject[] {
  return asymmetryCohort({ controls: count, perStratum: 0, editPerStratum: 0, duration, seeds: { walkers: 68000, edited: 69000, pick: 6868 }, prefix: 'D' });
}

/**
 * Returns the joint-profile development cohort (seeds 60000+, 62000+ and 65000+, disjoint from every
 * other cohort, the validation cohort included): the joint-range kinds (knee, hip, ankle range and arm
 * swing by the walker; hip, knee, ankle and shoulder narrowed afterwards) and the side-only kinds
 * (shorter stance, shorter step by the walker), `perStratum` subjects per kind and severity stratum,
 * random sides. The joint attribution's discriminant is fitted on it (src/analysis/joint-profiles.ts),
 * never on the validation cohort. 16 by default: on the shipped model, at λ 0.005, 8 gave a
 * cross-validated joint and side accuracy of 0.91 and 0.93, 16 gave 0.93 and 0.95.
 */
export function jointProfileCohort(perStratum = 16, duration = 30): AsymmetrySubject[] {
  return [
    ...asymmetryCohort({ controls: 0, perStratum, editPerStratum: perStratum, duration, kinds: JOINT_RANGE_KINDS, seeds: { walkers: 60000, edited: 65000, pick: 6161 }, prefix: 'D' }),
    ...asymmetryCohort({ controls: 0, perStratum, editPerStratum: 0, duration, kinds: SIDE_ONLY_KINDS, seeds: { walkers: 62000, edited: 67000, pick: 6262 }, prefix: 'DS' }),
  ];
}

/**
 * Returns the asymmetry validation cohort (seeds 40000+ and 50000+, disjoint from the training and
 * held-out cohorts): `controls` walkers with natural left/right differences of scale 0.5-1.5; per
 * impairment kind and severity stratum, `perStratum` walkers impaired on a random side by the walker;
 * and per edited joint and stratum, `editPerStratum` normal walkers whose take is narrowed afterwards
 * (the edit itself is the script's: src/bvh/damp.ts).
 */
export function asymmetryCohort(o: { controls?: number; perStratum?: number; editPerStratum?: number; duration?: number; seeds?: AsymmetrySeeds; kinds?: readonly AsymmetryKind[]; prefix?: string } = {}): AsymmetrySubject[] {
  const duration = o.duration ?? 30, out: AsymmetrySubject[] = [], seeds = o.seeds ?? VALIDATION_SEEDS, prefix = o.prefix ?? 'V';
  const pick = new Mulberry32(seeds.pick);
  let i = 0;
  const id = (kind: string) => `${prefix}${kind}${String(out.length + 1).padStart(3, '0')}`;
  for (let k = 0; k < (o.controls ?? 80); k++, i++) {
    const opts = subjectOptions(seeds.walkers + i, duration, 60);
    opts.asymmetry = round3(0.5 + pick.next());
    out.push({ id: id('C'), arm: 'control', kind: null, side: null, severity: 0, options: opts });
  }
  for (const kind of o.kinds ?? ASYMMETRY_KINDS)
    for (const [lo, hi] of SEVERITY_STRATA)
      for (let k = 0; k < (o.perStratum ?? 8); k++, i++) {
        const opts = subjectOptions(seeds.walkers + i, duration, 60);
        const side = pick.next() < 0.5 ? 'left' : 'right', severity = round3(lo + (hi - lo) * pick.next());
        opts.impairments = { [side]: impairmentOf(kind, severity, k % 2 === 0) };
        out.push({ id: id('I'), arm: 'synth', kind, side, severity, options: opts });
      }
  let j = 0;
  for (const joint of EDITED_JOINTS)
    for (const [lo, hi] of SEVERITY_STRATA)
      for (let k = 0; k < (o.editPerStratum ?? 8); k++, j++) {
        const opts = subjectOptions(seeds.edited + j, duration, 60);
        const side = pick.next() < 0.5 ? 'left' : 'right', severity = round3(lo + (hi - lo) * pick.next());
        out.push({ id: id('E'), arm: 'edit', kind: joint, side, severity, options: opts });
      }
  return out;
}
