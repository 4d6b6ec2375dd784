// The held-out part training stops on and the spread is calibrated on. With two or more subjects it is
// whole subjects (never windows of a subject the model trains on). With one subject only there is no
// other person to hold out, so each take's last quarter is held out in time: the model trains on the
// windows whose forecast ends before the cut, and is scored on forecasts made after it (their causal
// history may reach back before the cut, as any forecast's does; their futures never do).
import type { Track } from '../motion/track.js';
import type { TrainingTake } from './batch.js';
import type { ModelConfig } from './config.js';

/** Share of each take held out at its end when the takes hold one subject only. */
export const HELD_OUT_TAIL = 0.25;

/** How the held-out part was chosen: whole subjects, or each take's tail in time. */
export type HeldOutKind = 'subjects' | 'tail';

/** Training and held-out takes of a run. */
export interface HeldOutSplit {
  kind: HeldOutKind;
  train: TrainingTake[];
  valid: TrainingTake[];
  /** The held-out subjects (under 'tail', the one subject whose takes' tails are held out). */
  validSubjects: string[];
}

/** Returns steps [from, to) of a track as a track of its own (positions copied). */
export function sliceTrack(track: Track, from: number, to: number): Track {
  if (!(Number.isInteger(from) && Number.isInteger(to) && 0 <= from && from < to && to <= track.steps))
    throw new RangeError(`steps ${from}..${to} are outside the track's 0..${track.steps}`);
  const W = track.nodeCount * 3;
  return { ...track, steps: to - from, positions: track.positions.slice(from * W, to * W) };
}

/** Returns a take cut to steps [from, to), its gait phase with it. */
function sliceTake(take: TrainingTake, from: number, to: number): TrainingTake {
  return { ...take, track: sliceTrack(take.track, from, to), phase: take.phase ? take.phase.slice(from, to) : take.phase };
}

/** Returns the first held-out forecast end of a take under the tail split (the cut). */
export function tailCut(track: Track): number {
  return Math.floor(track.steps * (1 - HELD_OUT_TAIL));
}

/** Returns the held-out subjects: the given list, or every fifth subject of the sorted set (at least one of two or more). */
function splitSubjects(takes: readonly TrainingTake[], given: readonly string[] | undefined): Set<string> {
  if (given) return new Set(given);
  const subjects = [...new Set(takes.map((t) => t.subject))].sort();
  const valid = new Set<string>();
  if (subjects.length < 2) return valid;
  subjects.forEach((s, i) => { if (i % 5 === 4) valid.add(s); });
  if (valid.size === 0) valid.add(subjects[subjects.length - 1]!);
  return valid;
}

/**
 * Returns the split of a run: `given` held-out subjects, else every fifth subject; with one subject and
 * no list given, each take's tail (the take's training part then ends at the cut, its held-out part starts
 * `history` steps before it so the first held-out forecast has its full causal history). `minTrainWindows`
 * is the least number of training windows (ends `stride` steps apart) the tail split must leave, else
 * nothing is held out.
 */
export function heldOutSplit(takes: readonly TrainingTake[], config: ModelConfig, given: readonly string[] | undefined, minTrainWindows: number, stride: number): HeldOutSplit {
  const subjects = new Set(takes.map((t) => t.subject));
  if (given || subjects.size !== 1) {
    const set = splitSubjects(takes, given);
    return { kind: 'subjects', train: takes.filter((t) => !set.has(t.subject)), valid: takes.filter((t) => set.has(t.subject)), validSubjects: [...set].sort() };
  }
  const history = config.stridePrior ? config.priorHistory : config.observe, F = config.forecast;
  const train: TrainingTake[] = [], valid: TrainingTake[] = [];
  let windows = 0;
  for (const t of takes) {
    const cut = tailCut(t.track);
    // A tail needs one complete held-out forecast after the cut; the training part one window before it.
    if (t.track.steps - cut < F + 1 || cut - history < 0 || cut <= config.observe + F) {
      train.push(t);
      windows += Math.max(0, Math.floor((t.track.steps - 1 - F - config.observe) / stride) + 1);
      continue;
    }
    const head = sliceTake(t, 0, cut);
    train.push(head);
    valid.push(sliceTake(t, cut - history, t.track.steps));
    windows += Math.floor((cut - 1 - F - config.observe) / stride) + 1;
  }
  if (valid.length === 0 || windows < minTrainWindows) return { kind: 'subjects', train: [...takes], valid: [], validSubjects: [] };
  return { kind: 'tail', train, valid, validSubjects: [...subjects] };
}
