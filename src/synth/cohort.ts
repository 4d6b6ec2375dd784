// Fixed synthetic cohorts for the coupling model: the training cohort the default model is fitted on and
// the held-out cohort `npm run eval:forecast` scores it on. Both are lists of walker options derived from
// fixed seeds (training 20000 + i, held-out 70000 + i: disjoint), so they regenerate exactly. Every
// subject is invented; the spreads of height, speed and cadence are typical adult walking ranges (common
// practice), the impairments the walker's own.
import type { SideImpairment, SynthOptions } from './options.js';
import type { NamingStyle } from './naming.js';
import { Mulberry32 } from './prng.js';

/** Groups of the held-out cohort. */
export type CohortGroup = 'normal' | 'impaired' | 'variable' | 'other' | 'stumble';

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
  const out: CohortSubject[] = [];
  for (let i = 0; i < count; i++) {
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
    out.push({ id: `TR${String(i + 1).padStart(3, '0')}`, group, options: o });
  }
  return out;
}

/**
 * Returns the held-out cohort, `perGroup` subjects per group (default 5): normal; impaired (one side);
 * highly variable (stride-time CV 5 %, step-length CV 6 %); other bodies and files (heights 1.45-2.05 m,
 * every naming style, m/mm/in, Z up, mixed rotation orders, 100 and 120 Hz); and stumble takes (one
 * stumble at a known time, for the surprise timeline).
 */
export function heldOutCohort(perGroup = 5, duration = 30): CohortSubject[] {
  const out: CohortSubject[] = [];
  const groups: CohortGroup[] = ['normal', 'impaired', 'variable', 'other', 'stumble'];
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
      if (group === 'stumble') o.stumbles = [{ time: round3(10 + 8 * (k / Math.max(1, perGroup))), side: k % 2 === 0 ? 'left' : 'right' }];
      out.push({ id: `HO${String(i + 1).padStart(3, '0')}`, group, options: o });
    }
  return out;
}
