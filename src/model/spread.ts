// The forecast's spread per window. The learned per-step noise SD is the same for every window; walkers
// differ in how predictable their next second is. Each window therefore measures its own recent
// predictability, causally: the backcast error, i.e. how far the phase-registered stride mean made one
// forecast length before the last observed step lands from the steps observed since (mean per-joint
// distance in leg lengths). The noise SD of a window is spreadScale · (backcast / reference)^exponent
// (the ratio clipped to [1/4, 4]), with the reference the median backcast of the calibration windows.
// The scale and the exponent are fitted on held-out windows (calibrate.ts).
import { STATE_SIZE } from '../motion/reflect.js';
import { registeredStrideForecast } from './baselines.js';
import type { ModelConfig } from './config.js';

/** How a model's noise SD follows each window's backcast error (null: the same SD for every window). */
export interface SpreadAdapt {
  exponent: number;
  /** Median backcast error of the calibration windows, leg lengths. */
  reference: number;
}

/** Exponents tried by calibrateSpread (0 is the fixed spread). */
export const SPREAD_EXPONENTS = [0, 0.25, 0.5, 0.75, 1] as const;

/** Least and most ratio of a window's backcast error to the reference. */
const RATIO_MIN = 0.25, RATIO_MAX = 4;

/** Work arrays of backcastError for one configuration. */
export interface BackcastScratch { positions: Float64Array; out: Float64Array }

/** Returns work arrays for backcastError. */
export function backcastScratch(c: ModelConfig): BackcastScratch {
  return { positions: new Float64Array(Math.max(c.observe, c.priorHistory) * c.nodes * 3), out: new Float64Array(c.forecast * c.nodes * 3) };
}

/**
 * Returns the backcast error of a window's causal history (historySteps × N × 6, window frame): the
 * mean over the last F steps and the nodes of the distance between those steps' positions and the
 * registered stride mean forecast from the step before them; NaN when the history is too short for a
 * stride period.
 */
export function backcastError(c: ModelConfig, history: ArrayLike<number>, historySteps: number, scratch = backcastScratch(c)): number {
  const N = c.nodes, F = c.forecast, H = historySteps, W = N * STATE_SIZE, pos = scratch.positions;
  if (H - F < 2 || H * N * 3 > pos.length) return NaN;
  for (let t = 0; t < H; t++) for (let n = 0; n < N; n++) for (let a = 0; a < 3; a++) pos[(t * N + n) * 3 + a] = history[t * W + n * STATE_SIZE + a]!;
  const end = H - 1 - F;
  const period = registeredStrideForecast(pos, N, c.rate, end, F, 3, scratch.out);
  if (!Number.isFinite(period)) return NaN;
  let sum = 0;
  for (let k = 0; k < F; k++)
    for (let n = 0; n < N; n++) {
      const o = (k * N + n) * 3, p = ((end + 1 + k) * N + n) * 3;
      sum += Math.hypot(scratch.out[o]! - pos[p]!, scratch.out[o + 1]! - pos[p + 1]!, scratch.out[o + 2]! - pos[p + 2]!);
    }
  return sum / (F * N);
}

/** Returns the factor on the noise SD of a window with backcast error `backcast` (1 without adaptation or backcast). */
export function spreadFactor(adapt: SpreadAdapt | null, backcast: number): number {
  if (!adapt || adapt.exponent === 0 || !Number.isFinite(backcast) || !(adapt.reference > 0)) return 1;
  const r = Math.min(RATIO_MAX, Math.max(RATIO_MIN, backcast / adapt.reference));
  return Math.pow(r, adapt.exponent);
}
