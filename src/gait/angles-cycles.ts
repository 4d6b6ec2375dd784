// Angle curves per gait cycle: each side's angles (and the pelvis, seen from that side) time-normalised between
// that side's successive initial contacts, with their mean and SD, per-cycle ranges of motion and the peak
// swing knee flexion.
//
// Pelvis angles seen from a side (as clinical charts draw them, common practice): tilt as is; obliquity
// positive when this side's hip is up; rotation positive when this side's hip is forward. So the left side
// reads (tilt, obliquity, −rotation) and the right side (tilt, −obliquity, rotation) of the take's pelvis angles.
import type { AngleSeries, PelvisAngleName, SideAngleName } from './angles.js';
import { CYCLE_SAMPLES, type CycleSpan, type NormalisedCycles, normaliseCycles, peakInSwing, rangeOfMotion } from './normalize.js';
import type { GaitEvent, SideName } from './types.js';

/** Every angle normalised over one side's cycles. */
export type CycleAngleName = SideAngleName | PelvisAngleName;

/** One side's cycles and what is measured over them. */
export interface SideCycleAngles {
  side: SideName;
  /** Cycles as fractional frames (event time × fps), contact to next contact of this side in one pass. */
  cycles: CycleSpan[];
  /** Toe-off of each cycle as a fractional frame (NaN when none was found inside it). */
  toeOff: Float64Array;
  /** Toe-off as a percentage of each cycle. */
  toeOffPct: Float64Array;
  curves: Record<CycleAngleName, NormalisedCycles>;
  /** Range of motion (max − min, degrees) of each angle in each cycle. */
  rangeOfMotion: Record<CycleAngleName, Float64Array>;
  /** Largest knee flexion from toe-off to the next contact, per cycle (degrees). */
  peakSwingKneeFlexion: Float64Array;
}

/** Options for cutting cycles. */
export interface CycleOptions {
  /** Use only cycles whose both contacts are steady-state events (default true). */
  steadyOnly?: boolean;
  samples?: number;
}

/** Returns one side's cycles from the events: successive initial contacts of the side within one pass. */
export function sideCycles(events: readonly GaitEvent[], side: SideName, fps: number, frames: number, steadyOnly = true): CycleSpan[] {
  const ic = events.filter((e) => e.side === side && e.kind === 'initial_contact').sort((a, b) => a.time - b.time);
  const out: CycleSpan[] = [];
  const at = (e: GaitEvent) => Math.min(frames - 1, Math.max(0, eventFrame(e, fps)));
  for (let k = 0; k + 1 < ic.length; k++) {
    const a = ic[k]!, b = ic[k + 1]!;
    if (a.pass !== b.pass) continue;
    if (steadyOnly && !(a.steady && b.steady)) continue;
    const start = at(a), end = at(b);
    if (end > start) out.push({ start, end });
  }
  return out;
}

/** Returns both sides' normalised angle curves, ranges of motion and peak swing knee flexion. */
export function angleCycles(series: AngleSeries, events: readonly GaitEvent[], options: CycleOptions = {}): Record<SideName, SideCycleAngles> {
  const samples = options.samples ?? CYCLE_SAMPLES;
  const steadyOnly = options.steadyOnly ?? true;
  const result = {} as Record<SideName, SideCycleAngles>;
  for (const side of ['left', 'right'] as const) {
    const cycles = sideCycles(events, side, series.fps, series.frames, steadyOnly);
    const toeOffs = events.filter((e) => e.side === side && e.kind === 'toe_off').map((e) => eventFrame(e, series.fps));
    const toeOff = new Float64Array(cycles.length), toeOffPct = new Float64Array(cycles.length);
    cycles.forEach((c, k) => {
      let to = NaN;
      for (const t of toeOffs) if (t > c.start && t < c.end && !(t >= to)) to = t;
      toeOff[k] = to;
      toeOffPct[k] = (100 * (to - c.start)) / (c.end - c.start);
    });
    const own = series[side];
    const flipObl = side === 'right' ? -1 : 1;
    const flipRot = side === 'left' ? -1 : 1;
    const sources: Record<CycleAngleName, Float64Array> = {
      hip_flexion: own.hip_flexion, knee_flexion: own.knee_flexion, ankle_dorsiflexion: own.ankle_dorsiflexion,
      hip_abduction: own.hip_abduction, foot_progression: own.foot_progression,
      pelvis_tilt: series.pelvis_tilt,
      pelvis_obliquity: scaled(series.pelvis_obliquity, flipObl),
      pelvis_rotation: scaled(series.pelvis_rotation, flipRot),
    };
    const curves = {} as Record<CycleAngleName, NormalisedCycles>;
    const rom = {} as Record<CycleAngleName, Float64Array>;
    for (const [name, s] of Object.entries(sources) as [CycleAngleName, Float64Array][]) {
      curves[name] = normaliseCycles(s, cycles, samples);
      rom[name] = rangeOfMotion(s, cycles);
    }
    result[side] = {
      side, cycles, toeOff, toeOffPct, curves, rangeOfMotion: rom,
      peakSwingKneeFlexion: peakInSwing(own.knee_flexion, cycles, toeOffs),
    };
  }
  return result;
}

/** Returns an event's fractional frame, time × fps (snapped to a whole frame within 1e-9 of one). */
export function eventFrame(e: GaitEvent, fps: number): number {
  const x = e.time * fps, n = Math.round(x);
  return Math.abs(x - n) < 1e-9 ? n : x;
}

/** Returns the series times a sign (the same array when the sign is +1). */
function scaled(x: Float64Array, sign: number): Float64Array {
  if (sign === 1) return x;
  const out = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) out[i] = -x[i]!;
  return out;
}
