// The coupling model's factor heat as pair-line measures: static coupling over the whole take, or the
// dynamic factors of the window at the current time (the latest window ending at or before it).
import type { ViewFactors, ViewPairs } from '../../src/view/types.js';

/** Where the pair lines take their colour from. */
export type HeatSource = 'geometry' | 'static' | 'dynamic';

/** Returns the index of the latest window ending at or before time t (0 before the first). */
export function windowAt(times: readonly number[], t: number): number {
  let lo = 0, hi = times.length - 1;
  if (hi < 0 || t < times[0]!) return 0;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (times[mid]! <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Returns the pair-line measure of the static heat, or of the dynamic heat at window w. */
export function heatPairs(f: ViewFactors, source: 'static' | 'dynamic', w = 0): ViewPairs {
  if (source === 'static')
    return {
      measure: 'static coupling', unit: 'nats', min: f.staticRange[0], max: f.staticRange[1],
      description: 'Information in each pair\'s static coupling factors (KL of their posterior from the prior), over the whole take.',
      pairs: f.pairs.map((p) => ({ a: p.a, b: p.b, label: p.label, value: p.static })),
    };
  return {
    measure: `dynamic factors at ${(f.times[w] ?? 0).toFixed(2)} s`, unit: 'size', min: f.dynamicRange[0], max: f.dynamicRange[1],
    description: 'Size of each pair\'s gait-phase (dynamic) factors in the window ending at the current time.',
    pairs: f.pairs.map((p) => ({ a: p.a, b: p.b, label: p.label, value: p.dynamic[w] ?? 0 })),
  };
}
