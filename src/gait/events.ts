// Gait events per side by the coordinate method of Zeni et al. 2008 ("Two simple methods for determining
// gait events during treadmill and overground walking using kinematic data", Gait & Posture 27): initial
// contact where the heel is farthest forward of the pelvis along the walking direction, toe-off where the
// toe is farthest behind it. Each event is cross-checked by the foot-velocity method (events-check.ts).
import { InputError } from '../errors/index.js';
import { CONTACT_BIAS_S, CONTACT_CHECK_BIAS_S, TOE_OFF_BIAS_S, TOE_OFF_CHECK_BIAS_S } from './calibration.js';
import { type DirectionOptions, type DirectionResult, walkingDirection } from './direction.js';
import { footCentreVerticalVelocity, velocityContact, velocityToeOff } from './events-check.js';
import { pickPeaks, refinePeak, stridePeriod } from './events-peaks.js';
import { eventWarnings, markSteady } from './events-steady.js';
import type { GaitInput } from './input.js';
import type { EventDetection, EventKind, GaitEvent, SideName } from './types.js';

/** Bias corrections, seconds added to each raw detection (defaults: src/gait/calibration.ts). */
export interface EventBias {
  contact: number;
  toeOff: number;
  contactCheck: number;
  toeOffCheck: number;
}

/** The calibrated bias corrections of src/gait/calibration.ts. */
export const CALIBRATED_BIAS: Readonly<EventBias> = Object.freeze({
  contact: CONTACT_BIAS_S, toeOff: TOE_OFF_BIAS_S, contactCheck: CONTACT_CHECK_BIAS_S, toeOffCheck: TOE_OFF_CHECK_BIAS_S,
});

/** Options of event detection; every field has a default. */
export interface EventOptions extends DirectionOptions {
  /** Mark the first and last steps of each pass as not steady state (default true). */
  steadyOnly?: boolean;
  /** Bias corrections (default: the calibrated ones). */
  bias?: Partial<EventBias>;
  /** Largest difference between the two methods, frames, before an event is flagged (default 2). */
  disagreeFrames?: number;
}

/** Shortest and longest stride searched for, seconds. */
const MIN_STRIDE_S = 0.6, MAX_STRIDE_S = 3.0;
/** Least separation of two events of one kind and side, as a fraction of the stride (Zeni peaks are one a stride). */
const MIN_SEPARATION = 0.4;
/** Reach of the velocity cross-check around the coordinate event, as a fraction of the stride. */
const CHECK_REACH = 0.15;
/** Frames at either end of the take where no event is looked for, as a fraction of the stride. */
const EDGE = 0.1;

/** Per-side signals of a take, frames long. */
interface SideSignals {
  /** Heel minus pelvis along the walking direction, metres. */
  heel: Float64Array;
  /** Pelvis minus toe along the walking direction (its maxima are the toe farthest behind), metres. */
  toe: Float64Array;
  /** Foot-centre vertical velocity, m/s. */
  vz: Float64Array;
}

/** Returns the coordinate signals and foot-centre vertical velocity of both sides along the local direction. */
export function sideSignals(input: GaitInput, direction: Float64Array): [SideSignals, SideSignals] {
  const F = input.frames, J = input.jointCount, P = input.positions, p = input.role.pelvis;
  const toes = [input.role.l_toe, input.role.r_toe];
  const out = [0, 1].map((s) => {
    const heel = new Float64Array(F), toe = new Float64Array(F);
    const t = toes[s]!;
    for (let f = 0; f < F; f++) {
      const dx = direction[f * 3]!, dy = direction[f * 3 + 1]!;
      const px = P[(f * J + p) * 3]!, py = P[(f * J + p) * 3 + 1]!;
      heel[f] = (input.heels[f * 6 + s * 3]! - px) * dx + (input.heels[f * 6 + s * 3 + 1]! - py) * dy;
      toe[f] = -((P[(f * J + t) * 3]! - px) * dx + (P[(f * J + t) * 3 + 1]! - py) * dy);
    }
    const vz = footCentreVerticalVelocity(input.heels, P, J, t, s as 0 | 1, input.fps, new Float64Array(F));
    return { heel, toe, vz };
  });
  return out as [SideSignals, SideSignals];
}

/** Returns the stride period in frames of the take's walking passes, from the heel signals; NaN when the feet show no stepping rhythm. */
export function takeStridePeriod(input: GaitInput, signals: readonly SideSignals[], dir: DirectionResult): number {
  const mask = new Uint8Array(input.frames);
  for (const ps of dir.passes) mask.fill(1, ps.startFrame, ps.endFrame);
  const lo = Math.round(MIN_STRIDE_S * input.fps), hi = Math.round(MAX_STRIDE_S * input.fps);
  const periods = signals.map((s) => stridePeriod(s.heel, mask, lo, hi)).filter((x) => Number.isFinite(x));
  return periods.length ? periods.reduce((a, b) => a + b, 0) / periods.length : NaN;
}

/** Returns a gait event with the cross-check filled in; `raw` and `rawCheck` are sub-frame detections before bias. */
export function makeEvent(
  input: GaitInput, side: SideName, kind: EventKind, raw: number, rawCheck: number, bias: EventBias, disagreeFrames: number, pass: number,
  source: GaitEvent['source'] = 'detected',
): GaitEvent {
  const fps = input.fps;
  const ic = kind === 'initial_contact';
  const time = raw / fps + (ic ? bias.contact : bias.toeOff);
  const frame = clampFrame(Math.round(time * fps), input.frames);
  let checkFrame: number | null = null, disagree = true;
  if (Number.isFinite(rawCheck)) {
    const checkTime = rawCheck / fps + (ic ? bias.contactCheck : bias.toeOffCheck);
    checkFrame = clampFrame(Math.round(checkTime * fps), input.frames);
    disagree = Math.abs(checkTime - time) * fps > disagreeFrames;
  }
  return { side, kind, frame, time, checkFrame, disagree, pass, steady: true, source };
}

function clampFrame(f: number, frames: number): number {
  return f < 0 ? 0 : f >= frames ? frames - 1 : f;
}

/** Returns the index of the pass holding `frame`, or -1. */
export function passOf(passes: EventDetection['passes'], frame: number): number {
  for (const ps of passes) if (frame >= ps.startFrame && frame < ps.endFrame) return ps.index;
  return -1;
}

/** Returns the complete bias, the given fields over the calibrated ones. */
export function resolveBias(bias: Partial<EventBias> | undefined): EventBias {
  return { ...CALIBRATED_BIAS, ...(bias ?? {}) };
}

/**
 * Returns the gait events of a take (both sides, initial contact and toe-off, in time order), the walking
 * passes, the stretches left out and warnings. Throws InputError naming the file when the take holds no walking.
 */
export function detectEvents(input: GaitInput, options: EventOptions = {}): EventDetection {
  const bias = resolveBias(options.bias);
  const disagreeFrames = options.disagreeFrames ?? 2;
  const dir = walkingDirection(input, options);
  if (dir.passes.length === 0) throw noWalking(input, dir);
  const signals = sideSignals(input, dir.direction);
  const T = takeStridePeriod(input, signals, dir);
  if (!Number.isFinite(T))
    throw new InputError(`${input.path}: no walking found: the pelvis moves but the feet show no stepping rhythm.`);
  const minSep = Math.max(2, Math.round(MIN_SEPARATION * T));
  const halfWin = Math.max(2, Math.round(0.5 * T));
  const reach = Math.max(2, CHECK_REACH * T);
  // An extremum needs signal on both sides to be told from the take's edge.
  const edge = Math.max(1, Math.round(EDGE * T));

  const inPass = new Uint8Array(input.frames);
  for (const ps of dir.passes) inPass.fill(1, ps.startFrame, ps.endFrame);
  const found: GaitEvent[] = [];
  const sides: SideName[] = ['left', 'right'];
  for (let s = 0; s < 2; s++) {
    const sig = signals[s]!;
    for (const [kind, x] of [['initial_contact', sig.heel], ['toe_off', sig.toe]] as const) {
      for (const i of pickPeaks(x, minSep, halfWin, edge, inPass)) {
        const pass = passOf(dir.passes, i);
        if (pass < 0) continue;
        const raw = refinePeak(x, i);
        const rawCheck = kind === 'initial_contact' ? velocityContact(sig.vz, raw, reach) : velocityToeOff(sig.vz, raw, reach);
        found.push(makeEvent(input, sides[s]!, kind, raw, rawCheck, bias, disagreeFrames, pass));
      }
    }
  }
  // Passes without a single contact are not walking after all (e.g. shuffling or being wheeled).
  const kept = dir.passes.filter((ps) => found.some((e) => e.pass === ps.index && e.kind === 'initial_contact'));
  if (kept.length === 0)
    throw new InputError(`${input.path}: no walking found: the pelvis moves but no heel strikes were found.`);
  const excluded = [...dir.excluded];
  const remap = new Map<number, number>();
  for (const ps of dir.passes) {
    if (kept.includes(ps)) { remap.set(ps.index, remap.size); continue; }
    excluded.push({ startFrame: ps.startFrame, endFrame: ps.endFrame, reason: 'not walking' });
    dir.passDirection.fill(0, ps.startFrame * 3, ps.endFrame * 3);
  }
  excluded.sort((a, b) => a.startFrame - b.startFrame);
  const passes = kept.map((ps) => ({ ...ps, index: remap.get(ps.index)! }));
  const events = found.filter((e) => remap.has(e.pass)).map((e) => ({ ...e, pass: remap.get(e.pass)! }));
  events.sort((a, b) => a.time - b.time || (a.side < b.side ? -1 : 1));
  markSteady(events, options.steadyOnly ?? true);
  return { events, passes, excluded, direction: dir.passDirection, warnings: eventWarnings(input.path, events, disagreeFrames) };
}

/** Returns the one-line error for a take with no walking pass, with the evidence. */
function noWalking(input: GaitInput, dir: DirectionResult): InputError {
  let top = 0;
  for (let f = 0; f < input.frames; f++) if (dir.speed[f]! > top) top = dir.speed[f]!;
  const v = dir.minSpeed.toFixed(2);
  if (top < dir.minSpeed) return new InputError(`${input.path}: no walking found: the pelvis moves less than ${v} m/s for the whole take.`);
  return new InputError(`${input.path}: no walking found: the pelvis never keeps above ${v} m/s on a steady heading for long enough to hold a stride.`);
}
