// The ground-truth sidecar of a synthetic take: what the walker did, measured from its own geometry.
import type { SegmentLengths } from './anthropometry.js';
import type { JointKey, NamingStyle } from './naming.js';
import type { Side, SynthOptions } from './options.js';
import type { SideParams } from './sides.js';
import type { LengthUnit, UpAxis } from './skeleton.js';

/** Events of one side: frame indices and times in seconds (time = frame × frame time). */
export interface TruthSideEvents {
  initialContactFrames: number[];
  initialContactTimes: number[];
  toeOffFrames: number[];
  toeOffTimes: number[];
}

/** A stumble as it happened: the perturbed swing's toe-off and next contact, and the moment of the catch. */
export interface TruthStumble {
  side: Side;
  severity: number;
  requestedTime: number;
  swingStartFrame: number;
  swingStartTime: number;
  swingEndFrame: number;
  swingEndTime: number;
  catchTime: number;
}

/** The ground-truth sidecar written next to a synthetic take (as JSON). */
export interface SynthTruth {
  format: 'jointloom-synth-truth';
  version: 1;
  /** Every option used, defaults filled in. */
  options: SynthOptions;
  frameRate: number;
  frameTime: number;
  frameCount: number;
  units: { length: LengthUnit; metresPerUnit: number; angle: 'degrees'; time: 'seconds' };
  upAxis: UpAxis;
  /** Unit vectors (file axes) of the walker's forward and left at heading 0. */
  forwardAxis: [number, number, number];
  leftAxis: [number, number, number];
  namingStyle: NamingStyle;
  jointNames: Record<JointKey, string>;
  /** Rotation channel order of every joint, by file name. */
  channelOrder: Record<string, string>;
  positionChannels: 'root' | 'all';
  /** Segment lengths in metres and in file units. */
  segmentsMetres: SegmentLengths;
  segmentsFileUnits: SegmentLengths;
  /** Per-side parameters the walker used (natural differences, impairments, compensations). */
  sides: { left: SideParams; right: SideParams };
  contact: {
    toleranceMetres: number;
    heelPoint: string;
    initialContactRule: string;
    toeOffRule: string;
    source: string;
  };
  events: { left: TruthSideEvents; right: TruthSideEvents };
  /** Gait phase per frame per side, 0..1 from that side's initial contact; null outside its first..last contact. */
  phase: { left: (number | null)[]; right: (number | null)[] };
  stumbles: TruthStumble[];
  /** Figures from the events above and the root path, for quick reading. */
  summary: {
    cadenceStepsPerMin: number;
    stanceFraction: { left: number; right: number };
    strideTimeMean: { left: number; right: number };
    strideTimeCv: { left: number; right: number };
    meanSpeed: number;
  };
  /** Sign conventions of the internal model, for readers of the channels. */
  conventions: string[];
}

/** Returns mean and coefficient of variation (sample SD / mean) of a list, NaN when too short. */
export function meanCv(xs: readonly number[]): { mean: number; cv: number } {
  if (xs.length < 2) return { mean: xs.length ? xs[0]! : NaN, cv: NaN };
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
  const v = xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1);
  return { mean, cv: Math.sqrt(v) / mean };
}

/** Returns the side's stance fractions: (toe-off − contact) / (next contact − contact) for each complete stride. */
export function stanceFractions(ev: TruthSideEvents): number[] {
  const out: number[] = [];
  const ic = ev.initialContactFrames, to = ev.toeOffFrames;
  for (let c = 0; c + 1 < ic.length; c++) {
    const t = to.find((x) => x > ic[c]! && x < ic[c + 1]!);
    if (t !== undefined) out.push((t - ic[c]!) / (ic[c + 1]! - ic[c]!));
  }
  return out;
}

/** Returns the durations (s) between successive contacts. */
export function strideTimes(ev: TruthSideEvents): number[] {
  const t = ev.initialContactTimes;
  return t.slice(1).map((x, i) => x - t[i]!);
}
