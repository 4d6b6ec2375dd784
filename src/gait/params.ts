// Spatiotemporal parameters per stride and per side from gait events and heel positions.
import type { GaitInput } from './input.js';
import type { EventDetection, GaitEvent, SideName } from './types.js';
import { summarize, type Summary } from './stats.js';

/** Standard gravity, m/s², for the dimensionless speed (common practice). */
export const GRAVITY = 9.80665;

/** One stride of one side: initial contact to the next initial contact of the same foot. */
export interface Stride {
  side: SideName;
  pass: number;
  /** Frames of the two initial contacts and the toe-off between them. */
  startFrame: number;
  endFrame: number;
  toeOffFrame: number;
  strideTime_s: number;
  strideLength_m: number;
  /** The step that ends this stride's second initial contact (this side's step). */
  stepTime_s: number;
  stepLength_m: number;
  stepWidth_m: number;
  cadence_steps_per_min: number;
  speed_m_per_s: number;
  stance_pct: number;
  swing_pct: number;
  doubleSupport_pct: number;
}

export const STRIDE_PARAMETERS = [
  'cadence_steps_per_min', 'speed_m_per_s', 'speed_dimensionless', 'stride_length_m', 'step_length_m',
  'stride_time_s', 'step_time_s', 'step_width_m', 'stance_pct', 'swing_pct', 'double_support_pct',
] as const;
export type StrideParameter = (typeof STRIDE_PARAMETERS)[number];

export interface SideParameters {
  strides: Stride[];
  summary: Record<StrideParameter, Summary>;
}

export interface Spatiotemporal {
  left: SideParameters;
  right: SideParameters;
  /** Both sides together: cadence and speed over all strides. */
  cadence_steps_per_min: Summary;
  speed_m_per_s: Summary;
  warnings: string[];
}

/** Returns the horizontal unit walking direction at a frame (from the detection), or null. */
function directionAt(det: EventDetection, frame: number): [number, number] | null {
  const x = det.direction[frame * 3]!, y = det.direction[frame * 3 + 1]!;
  const n = Math.hypot(x, y);
  return n > 0 ? [x / n, y / n] : null;
}

/** Returns the heel (0 left, 1 right) position x, y at a frame. */
function heelXY(input: GaitInput, side: 0 | 1, frame: number): [number, number] {
  const o = frame * 6 + side * 3;
  return [input.heels[o]!, input.heels[o + 1]!];
}

/** Returns the strides of every side built from steady events of one pass, with their parameters. */
export function computeStrides(input: GaitInput, det: EventDetection): Stride[] {
  const byKey = (side: SideName, kind: GaitEvent['kind']) =>
    det.events.filter((e) => e.side === side && e.kind === kind).sort((a, b) => a.time - b.time);
  const out: Stride[] = [];
  for (const side of ['left', 'right'] as const) {
    const other: SideName = side === 'left' ? 'right' : 'left';
    const ics = byKey(side, 'initial_contact');
    const tos = byKey(side, 'toe_off');
    const oics = byKey(other, 'initial_contact');
    const otos = byKey(other, 'toe_off');
    const s = side === 'left' ? 0 : 1;
    for (let k = 0; k + 1 < ics.length; k++) {
      const a = ics[k]!, b = ics[k + 1]!;
      if (a.pass !== b.pass || !a.steady || !b.steady) continue;
      const inside = (e: GaitEvent) => e.pass === a.pass && e.time > a.time && e.time < b.time;
      const to = tos.filter(inside);
      const oic = oics.filter(inside);
      const oto = otos.filter(inside);
      if (to.length !== 1 || oic.length !== 1 || oto.length !== 1) continue;
      // The previous opposite initial contact starts this side's step that ends at b.
      const T = b.time - a.time;
      const tTO = to[0]!.time, tOIC = oic[0]!.time, tOTO = oto[0]!.time;
      if (!(tOTO < tOIC && tOIC < tTO)) continue; // events out of the normal walking order
      const mid = Math.round((a.frame + b.frame) / 2);
      const dir = directionAt(det, mid) ?? directionAt(det, a.frame);
      if (!dir) continue;
      const h1 = heelXY(input, s, a.frame), h2 = heelXY(input, s, b.frame);
      const strideLength = (h2[0] - h1[0]) * dir[0] + (h2[1] - h1[1]) * dir[1];
      // Step ending at b: this heel minus the other heel along the direction at b.
      const dirB = directionAt(det, b.frame) ?? dir;
      const own = heelXY(input, s, b.frame), opp = heelXY(input, (1 - s) as 0 | 1, b.frame);
      const dx = own[0] - opp[0], dy = own[1] - opp[1];
      const stepLength = dx * dirB[0] + dy * dirB[1];
      const stepWidth = Math.abs(-dx * dirB[1] + dy * dirB[0]);
      out.push({
        side, pass: a.pass, startFrame: a.frame, endFrame: b.frame, toeOffFrame: to[0]!.frame,
        strideTime_s: T,
        strideLength_m: strideLength,
        stepTime_s: b.time - tOIC,
        stepLength_m: stepLength,
        stepWidth_m: stepWidth,
        cadence_steps_per_min: 120 / T,
        speed_m_per_s: strideLength / T,
        stance_pct: (100 * (tTO - a.time)) / T,
        swing_pct: (100 * (b.time - tTO)) / T,
        doubleSupport_pct: (100 * (tOTO - a.time + (tTO - tOIC))) / T,
      });
    }
  }
  return out;
}

/** Returns the per-side summaries of the strides. */
export function summarizeStrides(input: GaitInput, strides: Stride[]): Spatiotemporal {
  const warnings: string[] = [];
  const side = (name: SideName): SideParameters => {
    const ss = strides.filter((s) => s.side === name);
    if (ss.length < 3) warnings.push(`${input.path}: only ${ss.length} usable ${name} stride${ss.length === 1 ? '' : 's'}; figures on that side are unreliable (3 or more are wanted).`);
    const col = (f: (s: Stride) => number) => summarize(ss.map(f));
    const froude = Math.sqrt(GRAVITY * input.legLengthM);
    return {
      strides: ss,
      summary: {
        cadence_steps_per_min: col((s) => s.cadence_steps_per_min),
        speed_m_per_s: col((s) => s.speed_m_per_s),
        speed_dimensionless: col((s) => s.speed_m_per_s / froude),
        stride_length_m: col((s) => s.strideLength_m),
        step_length_m: col((s) => s.stepLength_m),
        stride_time_s: col((s) => s.strideTime_s),
        step_time_s: col((s) => s.stepTime_s),
        step_width_m: col((s) => s.stepWidth_m),
        stance_pct: col((s) => s.stance_pct),
        swing_pct: col((s) => s.swing_pct),
        double_support_pct: col((s) => s.doubleSupport_pct),
      },
    };
  };
  return {
    left: side('left'),
    right: side('right'),
    cadence_steps_per_min: summarize(strides.map((s) => s.cadence_steps_per_min)),
    speed_m_per_s: summarize(strides.map((s) => s.speed_m_per_s)),
    warnings,
  };
}
