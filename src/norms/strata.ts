// Walking-speed strata of a reference: speed made dimensionless by leg length, v / √(g · L) (Hof 1996), and
// the band a take is scored against.
//
// Thresholds: slow below 0.35, fast above 0.55, self-selected between. L is the project's leg length (hip to
// ankle joint centre at rest, src/gait/input.ts), a little shorter than the trochanter-to-floor length of Hof's
// paper, so these values sit a few per cent higher than his. Chosen from the synthetic control cohort
// (self-selected walkers at 1.2-1.4 m/s and 1.6-1.9 m land at 0.41-0.50) and, for a 0.86 m leg, equal to
// 1.01 m/s and 1.60 m/s, the usual edges of slow (below about 1.0 m/s) and fast (above about 1.6 m/s) adult
// walking (common practice).
import { GRAVITY } from '../gait/params.js';

/** Names of the speed strata, slowest first. */
export const STRATA = ['slow', 'self_selected', 'fast'] as const;
export type StratumName = (typeof STRATA)[number];

/** A take below this dimensionless speed is slow. */
export const SLOW_BELOW = 0.35;
/** A take above this dimensionless speed is fast. */
export const FAST_ABOVE = 0.55;

/** Human labels of the strata. */
export const STRATUM_LABELS: Record<StratumName | 'all', string> = {
  slow: `slow (below ${SLOW_BELOW})`,
  self_selected: `self-selected (${SLOW_BELOW} to ${FAST_ABOVE})`,
  fast: `fast (above ${FAST_ABOVE})`,
  all: 'all speeds',
};

/** Returns v / √(g · L), the dimensionless walking speed (Hof 1996). */
export function dimensionlessSpeed(speedMPerS: number, legLengthM: number): number {
  return speedMPerS / Math.sqrt(GRAVITY * legLengthM);
}

/** Returns the stratum of a dimensionless speed, or null when it is not finite. */
export function stratumOf(v: number | null): StratumName | null {
  if (v === null || !Number.isFinite(v)) return null;
  return v < SLOW_BELOW ? 'slow' : v > FAST_ABOVE ? 'fast' : 'self_selected';
}
