// Comparing events with reference events (ground truth of a synthetic take, or a reviewed events file):
// each event is paired with the nearest reference event of the same side and kind.
import type { EventKind, SideName } from './types.js';

/** A reference event: side, kind and sub-frame time in seconds. */
export interface ReferenceEvent {
  side: SideName;
  kind: EventKind;
  time: number;
}

/** One paired event: signed error (detected minus reference) in seconds. */
export interface EventPair {
  side: SideName;
  kind: EventKind;
  referenceTime: number;
  time: number;
  errorS: number;
}

/** What a comparison returns: the pairs, the detected events without a partner, and the reference events missed. */
export interface EventComparison {
  pairs: EventPair[];
  extra: number;
  missed: ReferenceEvent[];
}

/**
 * Returns the pairing of `detected` with `reference`: for each detected event the nearest reference event of
 * the same side and kind within `maxLagS`, each reference used once (nearest first). Reference events that
 * fall outside `within(time)` are not counted as missed.
 */
export function compareEvents(
  detected: readonly { side: SideName; kind: EventKind; time: number }[], reference: readonly ReferenceEvent[], maxLagS: number,
  within: (time: number) => boolean = () => true,
): EventComparison {
  const cand: { d: number; r: number; gap: number }[] = [];
  detected.forEach((e, d) => reference.forEach((r, ri) => {
    if (r.side !== e.side || r.kind !== e.kind) return;
    const gap = Math.abs(e.time - r.time);
    if (gap <= maxLagS) cand.push({ d, r: ri, gap });
  }));
  cand.sort((a, b) => a.gap - b.gap);
  const usedD = new Uint8Array(detected.length), usedR = new Uint8Array(reference.length);
  const pairs: EventPair[] = [];
  for (const c of cand) {
    if (usedD[c.d] || usedR[c.r]) continue;
    usedD[c.d] = 1; usedR[c.r] = 1;
    const e = detected[c.d]!, r = reference[c.r]!;
    pairs.push({ side: e.side, kind: e.kind, referenceTime: r.time, time: e.time, errorS: e.time - r.time });
  }
  pairs.sort((a, b) => a.referenceTime - b.referenceTime);
  const missed = reference.filter((r, i) => !usedR[i] && within(r.time));
  return { pairs, extra: detected.length - pairs.length, missed };
}

/** Returns the q-quantile (0..1) of the values by linear interpolation between order statistics (NaN when empty). */
export function quantile(values: readonly number[], q: number): number {
  if (values.length === 0) return NaN;
  const s = [...values].sort((a, b) => a - b);
  const h = (s.length - 1) * q, lo = Math.floor(h), hi = Math.ceil(h);
  return s[lo]! + (h - lo) * (s[hi]! - s[lo]!);
}
