// Per-feature normalisation of window state: mean and standard deviation of each (node, component)
// over a training set of windows, applied as (x − mean) / sd and inverted as x · sd + mean. Statistics
// are accumulated by Welford's update (Welford 1962; Knuth, TAOCP vol. 2, 4.2.2), one pass, typed
// arrays; the SD is the population SD (divide by n). A feature with SD below `minSd` (constant over the
// set) gets SD 1, so it is centred but not blown up. The statistics travel in the model file as plain JSON.
import { InputError } from '../errors/index.js';
import { mirrorState, STATE_SIZE } from './reflect.js';
import type { Window } from './window.js';

/** Format tag and version of serialised statistics. */
export const STATS_FORMAT = 'jointloom-motion-stats';
export const STATS_VERSION = 1;

/** Mean and SD per feature (nodes × 6, node-major), with the node list they belong to. */
export interface MotionStats {
  nodes: string[];
  /** Number of steps the statistics were taken over. */
  count: number;
  mean: Float64Array;
  sd: Float64Array;
}

/** The plain-JSON form of MotionStats. */
export interface MotionStatsJson {
  format: typeof STATS_FORMAT;
  version: typeof STATS_VERSION;
  nodes: string[];
  stateSize: number;
  count: number;
  mean: number[];
  sd: number[];
}

/** Running Welford sums over rows of nodes × 6 features. */
export interface StatsAccumulator {
  width: number;
  count: number;
  mean: Float64Array;
  m2: Float64Array;
}

/** Returns an empty accumulator for `nodeCount` nodes. */
export function createAccumulator(nodeCount: number): StatsAccumulator {
  const width = nodeCount * STATE_SIZE;
  return { width, count: 0, mean: new Float64Array(width), m2: new Float64Array(width) };
}

/** Adds every step of `state` (steps × nodes × 6) to the accumulator; allocation-free. */
export function accumulate(acc: StatsAccumulator, state: Float64Array): void {
  const { width, mean, m2 } = acc;
  const steps = Math.floor(state.length / width);
  for (let t = 0; t < steps; t++) {
    const n = ++acc.count;
    const base = t * width;
    for (let c = 0; c < width; c++) {
      const x = state[base + c]!;
      const d = x - mean[c]!;
      const m = mean[c]! + d / n;
      mean[c] = m;
      m2[c] = m2[c]! + d * (x - m);
    }
  }
}

/** Returns the statistics of an accumulator (population SD; SD below `minSd` replaced by 1). */
export function finishStats(acc: StatsAccumulator, nodes: readonly string[], minSd = 1e-9): MotionStats {
  if (acc.count === 0) throw new RangeError('no steps were accumulated');
  if (nodes.length * STATE_SIZE !== acc.width) throw new RangeError('node list does not match the accumulator');
  const sd = new Float64Array(acc.width);
  for (let c = 0; c < acc.width; c++) {
    const v = Math.sqrt(acc.m2[c]! / acc.count);
    sd[c] = v < minSd ? 1 : v;
  }
  return { nodes: [...nodes], count: acc.count, mean: Float64Array.from(acc.mean), sd };
}

/** Options of statsOfWindows. */
export interface StatsOptions {
  /** Include the future steps too (default true). */
  future?: boolean;
  /** When given, each window's mirror image is added as well, so the statistics are left/right symmetric. */
  nodeMirror?: Int32Array;
  minSd?: number;
}

/** Returns the statistics of a set of windows (observed steps, future steps, optionally mirrored copies). */
export function statsOfWindows(windows: Iterable<Window>, nodes: readonly string[], options: StatsOptions = {}): MotionStats {
  const acc = createAccumulator(nodes.length);
  const useFuture = options.future ?? true;
  let scratch = new Float64Array(0);
  const add = (s: Float64Array) => {
    accumulate(acc, s);
    if (!options.nodeMirror) return;
    if (scratch.length < s.length) scratch = new Float64Array(s.length);
    const m = scratch.subarray(0, s.length);
    accumulate(acc, mirrorState(s, options.nodeMirror, m));
  };
  for (const w of windows) {
    add(w.observed);
    if (useFuture && w.futureSteps > 0) add(w.future);
  }
  return finishStats(acc, nodes, options.minSd);
}

/** Returns `out` holding state (steps × nodes × 6) normalised: (x − mean) / sd per feature. `out` may be `state`. */
export function normalise(stats: MotionStats, state: Float64Array, out: Float64Array): Float64Array {
  const { mean, sd } = stats;
  const width = mean.length;
  const n = Math.floor(state.length / width) * width;
  for (let o = 0; o < n; o += width)
    for (let c = 0; c < width; c++) out[o + c] = (state[o + c]! - mean[c]!) / sd[c]!;
  return out;
}

/** Returns `out` holding normalised state mapped back: x · sd + mean per feature. `out` may be `state`. */
export function denormalise(stats: MotionStats, state: Float64Array, out: Float64Array): Float64Array {
  const { mean, sd } = stats;
  const width = mean.length;
  const n = Math.floor(state.length / width) * width;
  for (let o = 0; o < n; o += width)
    for (let c = 0; c < width; c++) out[o + c] = state[o + c]! * sd[c]! + mean[c]!;
  return out;
}

/** Returns the statistics as plain JSON (numbers survive JSON.stringify/parse exactly). */
export function statsToJson(stats: MotionStats): MotionStatsJson {
  return {
    format: STATS_FORMAT, version: STATS_VERSION, nodes: [...stats.nodes], stateSize: STATE_SIZE,
    count: stats.count, mean: Array.from(stats.mean), sd: Array.from(stats.sd),
  };
}

/** Returns statistics read from plain JSON; throws InputError naming `source` when the value is not valid statistics. */
export function statsFromJson(value: unknown, source: string): MotionStats {
  const bad = (why: string): never => {
    throw new InputError(`${source}: the normalisation statistics are not usable: ${why}.`);
  };
  if (typeof value !== 'object' || value === null) return bad('expected an object');
  const v = value as Partial<MotionStatsJson>;
  if (v.format !== STATS_FORMAT) bad(`format is ${JSON.stringify(v.format)}, expected "${STATS_FORMAT}"`);
  if (v.version !== STATS_VERSION) bad(`version ${JSON.stringify(v.version)} is not supported (expected ${STATS_VERSION})`);
  if (v.stateSize !== STATE_SIZE) bad(`state size ${JSON.stringify(v.stateSize)} is not ${STATE_SIZE}`);
  if (!Array.isArray(v.nodes) || !v.nodes.every((n) => typeof n === 'string')) bad('nodes must be a list of role names');
  const width = v.nodes!.length * STATE_SIZE;
  const nums = (a: unknown, name: string, positive: boolean): Float64Array => {
    if (!Array.isArray(a) || a.length !== width) return bad(`${name} must hold ${width} numbers`);
    if (!a.every((x) => typeof x === 'number' && Number.isFinite(x) && (!positive || x > 0))) bad(`${name} holds a value that is not a finite${positive ? ' positive' : ''} number`);
    return Float64Array.from(a as number[]);
  };
  const count = v.count;
  if (typeof count !== 'number' || !Number.isInteger(count) || count < 1) bad('count must be a positive whole number');
  return { nodes: [...v.nodes!], count: count!, mean: nums(v.mean, 'mean', false), sd: nums(v.sd, 'sd', true) };
}
