// Per-side walking parameters: the subject's natural left/right differences plus any impairment and compensation.
import { Mulberry32, streamSeed } from './prng.js';
import { type SynthOptions, stanceFromSpeed } from './options.js';

/** Resolved parameters of one side (index 0 = left, 1 = right). */
export interface SideParams {
  /** Stance share of this side's cycle. */
  stance: number;
  /** Retained fraction of hip, knee and ankle range. */
  hipScale: number;
  kneeScale: number;
  ankleScale: number;
  /** Arm swing amplitude (degrees of shoulder flexion either way) and elbow swing amplitude. */
  armAmplitude: number;
  elbowAmplitude: number;
  /** Arm swing lag behind the opposite leg, fraction of the cycle. */
  armLag: number;
  /** Footprint shift along the path, metres (negative = shorter step of this side). */
  stepShift: number;
  /** Toe-out of this foot, degrees. */
  toeOutDeg: number;
  /** Compensations: peak hip hike (°), circumduction (° abduction), steppage (° extra hip and knee flexion in swing). */
  hipHikeDeg: number;
  circumductionDeg: number;
  steppageDeg: number;
  /** Gain on pelvic rotation amplitude contributed by this side (1 = none). */
  pelvisRotationGain: number;
  /** Lateral trunk lean over this side during its stance, degrees. */
  trunkLeanDeg: number;
  /** Peak swing knee flexion of this side's nominal curve, for the truth sidecar. */
  nominalPeakKneeDeg: number;
}

/** Returns the two sides' parameters (left, right) for resolved options, deterministic in the subject seed. */
export function sideParams(o: SynthOptions): [SideParams, SideParams] {
  // Natural differences: small and seeded per subject; arm swing differs most (healthy arm-swing asymmetry is
  // commonly reported well above that of the legs — common practice).
  const rng = new Mulberry32(streamSeed(o.subjectSeed, 11));
  const a = o.asymmetry;
  const baseStance = o.stanceFraction ?? stanceFromSpeed(o.speed);
  const stepLength = (o.speed * 60) / o.cadence;
  const out: SideParams[] = [];
  for (let s = 0; s < 2; s++) {
    out.push({
      stance: baseStance + a * 0.004 * rng.gaussClipped(2),
      hipScale: 1 + a * 0.03 * rng.gaussClipped(2),
      kneeScale: 1 + a * 0.02 * rng.gaussClipped(2),
      ankleScale: 1 + a * 0.04 * rng.gaussClipped(2),
      armAmplitude: 16 * (1 + a * 0.15 * rng.gaussClipped(2)) * (o.speed / 1.3),
      elbowAmplitude: 9 * (1 + a * 0.15 * rng.gaussClipped(2)) * (o.speed / 1.3),
      armLag: 0.04 + a * 0.01 * rng.gaussClipped(2),
      stepShift: a * 0.01 * stepLength * rng.gaussClipped(2),
      toeOutDeg: o.toeOutDeg + a * 2 * rng.gaussClipped(2),
      hipHikeDeg: 0,
      circumductionDeg: 0,
      steppageDeg: 0,
      pelvisRotationGain: 1,
      trunkLeanDeg: 0,
      nominalPeakKneeDeg: 60,
    });
  }
  const sides = ['left', 'right'] as const;
  const shorten = [0, 0];
  for (let s = 0; s < 2; s++) {
    const imp = o.impairments[sides[s]!];
    if (!imp) continue;
    const p = out[s]!, other = out[1 - s]!;
    const comp = imp.compensate === true;
    if (imp.hipRange !== undefined) {
      p.hipScale *= imp.hipRange;
      shorten[s] += (1 - imp.hipRange) * 0.15 * stepLength;
      if (comp) p.pelvisRotationGain += 1.5 * (1 - imp.hipRange);
    }
    if (imp.kneeRange !== undefined) {
      p.kneeScale *= imp.kneeRange;
      if (comp) {
        p.hipHikeDeg = 7 * (1 - imp.kneeRange);
        p.circumductionDeg = 9 * (1 - imp.kneeRange);
      }
    }
    if (imp.ankleRange !== undefined) {
      p.ankleScale *= imp.ankleRange;
      if (comp) p.steppageDeg = 12 * (1 - imp.ankleRange);
    }
    if (imp.stanceShortening !== undefined) {
      p.stance -= 0.08 * imp.stanceShortening;
      other.stance += 0.03 * imp.stanceShortening;
      if (comp) p.trunkLeanDeg = 6 * imp.stanceShortening;
    }
    if (imp.stepShortening !== undefined) {
      shorten[s] += 0.3 * imp.stepShortening * stepLength;
      if (comp) p.pelvisRotationGain += 1.0 * imp.stepShortening;
    }
    if (imp.armSwing !== undefined) {
      p.armAmplitude *= imp.armSwing;
      p.elbowAmplitude *= imp.armSwing;
      if (comp) {
        other.armAmplitude *= 1 + 0.4 * (1 - imp.armSwing);
        other.elbowAmplitude *= 1 + 0.4 * (1 - imp.armSwing);
      }
    }
  }
  // A shorter step of one side lengthens the other's (the stride is kept): move each foot half the way.
  for (let s = 0; s < 2; s++) {
    out[s]!.stepShift -= shorten[s]! / 2;
    out[1 - s]!.stepShift += shorten[s]! / 2;
  }
  for (const p of out) {
    p.stance = Math.min(0.72, Math.max(0.54, p.stance));
    p.nominalPeakKneeDeg = 60 * p.kneeScale;
  }

  return [out[0]!, out[1]!];
}
