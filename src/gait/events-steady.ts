// Steady state within a walking pass, and the checks on how many strides a side has.
import type { GaitEvent, SideName } from './types.js';

/**
 * Marks `steady` on every event in place and returns the events. With `steadyOnly`, the first and last
 * steps of each pass are not steady state: a step runs from one initial contact (either side) to the
 * next, so every event before the pass's second contact or after its second-to-last contact gets
 * steady = false. Without it every event is steady.
 */
export function markSteady(events: GaitEvent[], steadyOnly: boolean): GaitEvent[] {
  if (!steadyOnly) {
    for (const e of events) e.steady = true;
    return events;
  }
  const byPass = new Map<number, number[]>();
  for (const e of events) if (e.kind === 'initial_contact') {
    const l = byPass.get(e.pass) ?? [];
    l.push(e.time);
    byPass.set(e.pass, l);
  }
  for (const e of events) {
    const ics = (byPass.get(e.pass) ?? []).sort((a, b) => a - b);
    e.steady = ics.length >= 3 && e.time >= ics[1]! && e.time <= ics[ics.length - 2]!;
  }
  return events;
}

/** Returns the count of strides of a side: pairs of successive initial contacts in one pass, both steady. */
export function strideCount(events: readonly GaitEvent[], side: SideName): number {
  const ics = events.filter((e) => e.side === side && e.kind === 'initial_contact').sort((a, b) => a.time - b.time);
  let n = 0;
  for (let i = 1; i < ics.length; i++) if (ics[i]!.pass === ics[i - 1]!.pass && ics[i]!.steady && ics[i - 1]!.steady) n++;
  return n;
}

/** Returns the warnings about the events of a take: too few strides on a side, many disagreements between methods. */
export function eventWarnings(path: string, events: readonly GaitEvent[], disagreeFrames: number): string[] {
  const out: string[] = [];
  for (const side of ['left', 'right'] as const) {
    const n = strideCount(events, side);
    if (n < 3) out.push(`${path}: only ${n} stride${n === 1 ? '' : 's'} found on the ${side} side (fewer than 3); its figures are not reliable.`);
  }
  const dis = events.filter((e) => e.disagree).length;
  if (dis > 0)
    out.push(`${path}: ${dis} of ${events.length} events differ by more than ${disagreeFrames} frames between the coordinate and foot-velocity methods (or lack a cross-check); review them with --events-out.`);
  return out;
}
