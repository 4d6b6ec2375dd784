// The gait schedule: planned initial-contact and toe-off times of each side, footprints along the path,
// and the per-time state of a side (stride, phase, stance or swing).
import type { SynthOptions } from './options.js';
import { type DistanceTable, type WalkPath, distanceAt, pathAt } from './path.js';
import { Mulberry32, streamSeed } from './prng.js';
import type { SideParams } from './sides.js';

/** Fraction of the stride, after contact, at which the pelvis passes over the flat foot's ankle (own tuning). */
export const OVER_FOOT = 0.21;

/** Planned events and footprints of both sides; arrays indexed [side * count + stride]. */
export interface Schedule {
  count: number;
  /** Planned initial contact and toe-off times (s). */
  ic: Float64Array;
  to: Float64Array;
  /** Foot-flat ankle position in the floor plane (x, z) and foot heading (radians) of each stride's footprint. */
  ankleX: Float64Array;
  ankleZ: Float64Array;
  footPsi: Float64Array;
  /** Stumble severity of each stride's swing (the swing that ends the stride), 0 = none. */
  stumble: Float64Array;
}

/** Returns the schedule for resolved options over [tFrom, tTo]. */
export function buildSchedule(
  o: SynthOptions, sides: readonly SideParams[], path: WalkPath, dist: DistanceTable, tFrom: number, tTo: number,
): Schedule {
  // Separate streams, so a longer take starts with the same strides as a shorter one.
  const rng = new Mulberry32(streamSeed(o.seed, 23));
  const rngStance = new Mulberry32(streamSeed(o.seed, 29));
  const rngFoot = new Mulberry32(streamSeed(o.seed, 31));
  const T0 = 120 / o.cadence;
  const first = tFrom - T0 * (1 + rng.next());
  const count = Math.ceil((tTo - first) / (T0 * 0.9)) + 2;
  const ic = new Float64Array(2 * count), to = new Float64Array(2 * count);
  // Left contact at a fixed share of the right stride after the right one (0.5, nudged per subject). Each step
  // varies on its own by √2 × the stride CV, so both sides' strides carry the asked CV.
  const offset = 0.5 + 0.004 * o.asymmetry * new Mulberry32(streamSeed(o.subjectSeed, 5)).gaussClipped(2);
  const stepCv = Math.SQRT2 * o.strideTimeCv;
  let t = first;
  for (let k = 0; k < count; k++) {
    ic[count + k] = t;
    t += offset * T0 * (1 + stepCv * rng.gaussClipped(3));
    ic[k] = t;
    t += (1 - offset) * T0 * (1 + stepCv * rng.gaussClipped(3));
  }
  for (let s = 0; s < 2; s++)
    for (let k = 0; k < count; k++) {
      const i = s * count + k;
      const next = k + 1 < count ? ic[i + 1]! : ic[i]! + T0;
      const st = sides[s]!.stance * (1 + 0.005 * rngStance.gaussClipped(2));
      to[i] = ic[i]! + st * (next - ic[i]!);
    }
  const ankleX = new Float64Array(2 * count), ankleZ = new Float64Array(2 * count), footPsi = new Float64Array(2 * count);
  const stepLength = (o.speed * 60) / o.cadence;
  const p = new Float64Array(3);
  for (let s = 0; s < 2; s++) {
    const side = sides[s]!;
    const lateral = s === 0 ? 1 : -1; // left foot on the +X side of the path
    for (let k = 0; k < count; k++) {
      const i = s * count + k;
      const next = k + 1 < count ? ic[i + 1]! : ic[i]! + T0;
      const sa = distanceAt(dist, ic[i]! + OVER_FOOT * (next - ic[i]!)) + side.stepShift + o.stepLengthCv * stepLength * rngFoot.gaussClipped(3);
      pathAt(path, sa, p, 0);
      const w = 0.5 * o.stepWidth + 0.01 * rngFoot.gaussClipped(3) * (o.stepWidth > 0 ? 1 : 0);
      ankleX[i] = p[0]! + lateral * w * Math.cos(p[2]!);
      ankleZ[i] = p[1]! - lateral * w * Math.sin(p[2]!);
      footPsi[i] = p[2]! + (lateral * side.toeOutDeg * Math.PI) / 180;
    }
  }

  const stumble = new Float64Array(2 * count);
  for (const st of o.stumbles) {
    const s = st.side === 'left' ? 0 : 1;
    for (let k = 0; k < count - 1; k++) {
      const i = s * count + k;
      if (ic[i + 1]! > st.time) {
        stumble[i] = st.severity ?? 1;
        break;
      }
    }
  }
  return { count, ic, to, ankleX, ankleZ, footPsi, stumble };
}

/** Slots of the side-state vector written by `sideState`. */
export const SS_STRIDE = 0, SS_PHASE = 1, SS_STANCE = 2, SS_STANCE_SHARE = 3, SS_SWING = 4, SS_DURATION = 5;

/**
 * Writes the state of side `s` at time t into `out`: stride index, cycle phase 0..1 from its contact,
 * 1 in stance else 0, the stride's stance share, swing fraction 0..1 (0 in stance) and the stride duration.
 */
export function sideState(sc: Schedule, s: number, t: number, out: Float64Array): void {
  const n = sc.count, base = s * n;
  let lo = 0, hi = n - 2;
  if (t < sc.ic[base]!) hi = 0;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (sc.ic[base + mid]! <= t) lo = mid;
    else hi = mid - 1;
  }
  const k = lo;
  const t0 = sc.ic[base + k]!, t1 = sc.ic[base + k + 1]!, to = sc.to[base + k]!;
  const T = t1 - t0;
  out[SS_STRIDE] = k;
  out[SS_PHASE] = (t - t0) / T;
  out[SS_STANCE] = t < to ? 1 : 0;
  out[SS_STANCE_SHARE] = (to - t0) / T;
  out[SS_SWING] = t < to ? 0 : (t - to) / (t1 - to);
  out[SS_DURATION] = T;
}
