// Options of the parametric walker: their types, healthy-adult defaults, and validation of user values.
import { UsageError } from '../errors/index.js';
import { EULER_ORDERS, type EulerOrder } from '../skeleton/euler.js';
import { NAMING_STYLES, type JointKey, type NamingStyle } from './naming.js';
import { UNIT_METRES, type LengthUnit, type UpAxis } from './skeleton.js';

export type Side = 'left' | 'right';

/** An impairment of one side; every field optional, 1 (or 0 for the shortenings) meaning normal. */
export interface SideImpairment {
  /** Retained fraction of the normal hip flexion-extension range, 0..1; also shortens that side's step (15 % at 0). */
  hipRange?: number;
  /** Retained fraction of the normal knee flexion range, 0..1 (a stiff knee at low values). */
  kneeRange?: number;
  /** Retained fraction of the normal ankle range, 0..1. */
  ankleRange?: number;
  /** 0..1: how much of a marked stance shortening (−8 % of the cycle at 1) this side has, as in antalgic gait. */
  stanceShortening?: number;
  /** 0..1: this side's step shortened by up to 30 % of a step at 1 (the other step lengthens as much). */
  stepShortening?: number;
  /** Retained fraction of this side's arm swing, 0..1. */
  armSwing?: number;
  /**
   * Add the usual compensation: hip hiking and circumduction for a stiff knee, steppage for a stiff ankle,
   * extra pelvic rotation for a stiff hip or a short step, trunk lean over a painful (short-stance) side,
   * more swing of the other arm for a reduced arm swing.
   */
  compensate?: boolean;
}

/** The walking path: straight, a circle, an oval walkway (180° turns at its ends) or a serpentine. */
export interface PathSpec {
  kind: 'straight' | 'circle' | 'walkway' | 'serpentine';
  /** Circle or turn radius, metres (circle, walkway). */
  radius?: number;
  /** Straight length between turns, metres (walkway). */
  length?: number;
  /** Turn direction (circle, walkway). */
  turn?: Side;
  /** Peak heading swing of a serpentine, degrees, and its wavelength in metres. */
  amplitudeDeg?: number;
  wavelength?: number;
}

/** One stumble: the swing of `side` that spans (or first follows) `time` is perturbed. */
export interface StumbleSpec {
  time: number;
  side: Side;
  /** 0..1, default 1. */
  severity?: number;
}

/** Every option of the walker; `synthesizeTake` fills what is not given from `defaultSynthOptions`. */
export interface SynthOptions {
  /** Trial seed: stride-to-stride variability, noise. */
  seed: number;
  /** Subject seed: the natural left/right differences of this person (defaults to the trial seed). */
  subjectSeed: number;
  /** Body height, metres. */
  height: number;
  /** Walking speed, m/s (reduced automatically in tight turns). */
  speed: number;
  /** Cadence, steps per minute. */
  cadence: number;
  /** Take length, seconds. */
  duration: number;
  /** Frames per second. */
  frameRate: number;
  /** Stance share of the cycle, 0..1; null = from speed (falls as speed rises). */
  stanceFraction: number | null;
  /** Step width between the feet, metres, and toe-out angle, degrees. */
  stepWidth: number;
  toeOutDeg: number;
  /** One rotation order for every joint, or `mixed` (a fixed per-joint pattern); `jointOrders` overrides per joint. */
  rotationOrder: EulerOrder | 'mixed';
  jointOrders: Partial<Record<JointKey, EulerOrder>>;
  units: LengthUnit;
  upAxis: UpAxis;
  naming: NamingStyle;
  /** Write position channels on every joint (their values are the offsets), not just the root. */
  positionsOnAllJoints: boolean;
  /** Fixed decimals of frame values; null = by unit (m 4, cm 2, mm 1, in 3). */
  decimals: number | null;
  /** Stride-time coefficient of variation (0.015 = 1.5 %) and step-length coefficient of variation. */
  strideTimeCv: number;
  stepLengthCv: number;
  /** Scale of the subject's natural left/right differences (1 = typical healthy, 0 = perfectly symmetric). */
  asymmetry: number;
  impairments: { left?: SideImpairment; right?: SideImpairment };
  path: PathSpec;
  /** Heading at the start, degrees, about the up axis (0 = along the internal forward axis). */
  initialHeadingDeg: number;
  /** Sensor jitter: standard deviation of noise added to rotation channels (degrees) and root positions (mm). */
  noise: { rotationDeg: number; positionMm: number };
  stumbles: StumbleSpec[];
}

/** Returns the healthy-adult defaults: 1.75 m, 1.3 m/s, 110 steps/min, 30 s at 120 Hz, ZXY, cm, Y up. */
export function defaultSynthOptions(seed: number): SynthOptions {
  return {
    seed,
    subjectSeed: seed,
    height: 1.75,
    speed: 1.3,
    cadence: 110,
    duration: 30,
    frameRate: 120,
    stanceFraction: null,
    stepWidth: 0.1,
    toeOutDeg: 6,
    rotationOrder: 'ZXY',
    jointOrders: {},
    units: 'cm',
    upAxis: 'Y',
    naming: 'camel',
    positionsOnAllJoints: false,
    decimals: null,
    strideTimeCv: 0.015,
    stepLengthCv: 0.02,
    asymmetry: 1,
    impairments: {},
    path: { kind: 'straight' },
    initialHeadingDeg: 0,
    noise: { rotationDeg: 0, positionMm: 0 },
    stumbles: [],
  };
}

/** Returns the stance fraction used when none is given: ~0.62 at 1.0 m/s falling ~0.05 per m/s (common practice). */
export function stanceFromSpeed(speed: number): number {
  return Math.min(0.66, Math.max(0.56, 0.62 - 0.05 * (speed - 1.0)));
}

/** Returns the decimals used for a unit when none are given. */
export function defaultDecimals(units: LengthUnit): number {
  return units === 'm' ? 4 : units === 'cm' ? 2 : units === 'mm' ? 1 : 3;
}

const range = (name: string, v: unknown, lo: number, hi: number): number => {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < lo || v > hi)
    throw new UsageError(`synth option ${name} must be a number from ${lo} to ${hi} (got ${String(v)})`);
  return v;
};

/** Returns the options merged over the defaults, checked; bad values raise UsageError naming the option. */
export function resolveSynthOptions(options: Partial<SynthOptions> & { seed: number }): SynthOptions {
  if (!Number.isInteger(options.seed)) throw new UsageError(`synth option seed must be an integer (got ${String(options.seed)})`);
  const d = defaultSynthOptions(options.seed);
  const o: SynthOptions = {
    ...d,
    ...options,
    subjectSeed: options.subjectSeed ?? options.seed,
    jointOrders: { ...(options.jointOrders ?? {}) },
    impairments: { ...(options.impairments ?? {}) },
    path: { ...d.path, ...(options.path ?? {}) },
    noise: { ...d.noise, ...(options.noise ?? {}) },
    stumbles: [...(options.stumbles ?? [])],
  };
  if (!Number.isInteger(o.subjectSeed)) throw new UsageError(`synth option subjectSeed must be an integer (got ${String(o.subjectSeed)})`);
  range('height', o.height, 1.0, 2.3);
  range('speed', o.speed, 0.4, 2.2);
  range('cadence', o.cadence, 60, 150);
  range('duration', o.duration, 1, 1200);
  range('frameRate', o.frameRate, 24, 1000);
  if (o.stanceFraction !== null) range('stanceFraction', o.stanceFraction, 0.53, 0.75);
  range('stepWidth', o.stepWidth, 0, 0.4);
  range('toeOutDeg', o.toeOutDeg, -15, 30);
  range('strideTimeCv', o.strideTimeCv, 0, 0.1);
  range('stepLengthCv', o.stepLengthCv, 0, 0.1);
  range('asymmetry', o.asymmetry, 0, 5);
  range('initialHeadingDeg', o.initialHeadingDeg, -360, 360);
  range('noise.rotationDeg', o.noise.rotationDeg, 0, 10);
  range('noise.positionMm', o.noise.positionMm, 0, 100);
  if (o.decimals !== null) range('decimals', o.decimals, 0, 10);
  if (o.decimals !== null && !Number.isInteger(o.decimals)) throw new UsageError(`synth option decimals must be an integer (got ${o.decimals})`);
  if (o.rotationOrder !== 'mixed' && !EULER_ORDERS.includes(o.rotationOrder))
    throw new UsageError(`synth option rotationOrder must be one of ${EULER_ORDERS.join(', ')} or mixed (got ${String(o.rotationOrder)})`);
  for (const [k, v] of Object.entries(o.jointOrders))
    if (!EULER_ORDERS.includes(v as EulerOrder)) throw new UsageError(`synth option jointOrders.${k} must be one of ${EULER_ORDERS.join(', ')} (got ${String(v)})`);
  if (!(o.units in UNIT_METRES)) throw new UsageError(`synth option units must be one of ${Object.keys(UNIT_METRES).join(', ')} (got ${String(o.units)})`);
  if (o.upAxis !== 'Y' && o.upAxis !== 'Z') throw new UsageError(`synth option upAxis must be Y or Z (got ${String(o.upAxis)})`);
  if (!NAMING_STYLES.includes(o.naming)) throw new UsageError(`synth option naming must be one of ${NAMING_STYLES.join(', ')} (got ${String(o.naming)})`);
  if (!['straight', 'circle', 'walkway', 'serpentine'].includes(o.path.kind))
    throw new UsageError(`synth option path.kind must be straight, circle, walkway or serpentine (got ${String(o.path.kind)})`);
  if (o.path.radius !== undefined) range('path.radius', o.path.radius, 0.6, 100);
  if (o.path.length !== undefined) range('path.length', o.path.length, 1, 1000);
  if (o.path.amplitudeDeg !== undefined) range('path.amplitudeDeg', o.path.amplitudeDeg, 0, 60);
  if (o.path.wavelength !== undefined) range('path.wavelength', o.path.wavelength, 2, 1000);
  for (const side of ['left', 'right'] as const) {
    const imp = o.impairments[side];
    if (!imp) continue;
    for (const key of ['hipRange', 'kneeRange', 'ankleRange', 'stanceShortening', 'stepShortening', 'armSwing'] as const)
      if (imp[key] !== undefined) range(`impairments.${side}.${key}`, imp[key], 0, 1);
  }
  o.stumbles.forEach((s, i) => {
    range(`stumbles[${i}].time`, s.time, 0, o.duration);
    if (s.side !== 'left' && s.side !== 'right') throw new UsageError(`synth option stumbles[${i}].side must be left or right`);
    if (s.severity !== undefined) range(`stumbles[${i}].severity`, s.severity, 0, 1);
  });
  return o;
}
