// Windows of a track: `observe` steps seen, then up to `forecast` steps to predict, as node state
// (position 3, velocity 3) in the window frame of frame.ts. Nothing in a window depends on steps after
// its last observed step e except `future` itself: the frame reads steps e − H and e, the observed
// state reads steps e − observe .. e (the extra earlier step feeds the first backward difference).
//
// Velocity at step k is the backward difference (p[k] − p[k − 1]) · rate, rotated and scaled like the
// positions (leg lengths per second). Future steps use the same rule (step e + 1 reads step e).
import { InputError } from '../errors/index.js';
import { frameAt, frameNodes, frameToWorld, identityFrame, type FrameNodes, type WindowFrame } from './frame.js';
import { STATE_SIZE } from './reflect.js';
import type { Track } from './track.js';

/** Options of a window; every field has a default. */
export interface WindowOptions {
  /** Observed steps (default 60: 2 s at 30 Hz). */
  observe?: number;
  /** Forecast steps (default 30: 1 s at 30 Hz). */
  forecast?: number;
  /** Span of the pelvis displacement that sets the heading, seconds (default 0.5; at most the observed part). */
  headingSeconds?: number;
  /** Least pelvis speed for a motion heading, leg lengths per second (default 0.1); slower uses the hips line. */
  minHeadingSpeed?: number;
  /**
   * Steps of causal history kept in the window frame, ending at the last observed step (default: the
   * observed steps; more gives stride-based priors several strides to average). Fewer are kept near the
   * take's start.
   */
  history?: number;
}

/** Window options with every default filled and the heading span in steps. */
export interface ResolvedWindowOptions {
  observe: number;
  forecast: number;
  headingSteps: number;
  minHeadingSpeed: number;
  history: number;
}

/** Observed and forecast steps, state per node, the frame, and the map back to the world. */
export interface Window {
  path: string;
  rate: number;
  nodeCount: number;
  observe: number;
  forecast: number;
  /** Track step of the last observed step. */
  endObservedStep: number;
  /** observe × nodes × 6, window frame. */
  observed: Float64Array;
  /** futureSteps × nodes × 6, window frame (a view of `futureStore`; empty when the take ends at e). */
  future: Float64Array;
  futureSteps: number;
  /** Backing store of `future`, forecast × nodes × 6, reused by fillWindow. */
  futureStore: Float64Array;
  /**
   * State of the last `historySteps` steps up to and including the last observed step (historySteps ×
   * nodes × 6, window frame, mirrored with the window; a view of `historyStore`). Its tail is `observed`.
   */
  history: Float64Array;
  historySteps: number;
  historyStore: Float64Array;
  frame: WindowFrame;
  /** True when the state is left/right reflected (mirror.ts). */
  mirrored: boolean;
  /** Returns `out` holding window state (any steps × nodes × 6) in world metres and m/s, canonical frame. */
  toWorld(state: Float64Array, out: Float64Array): Float64Array;
}

/** Returns the options with defaults filled, checked against the track's rate. */
export function resolveWindowOptions(rate: number, options: WindowOptions = {}): ResolvedWindowOptions {
  const observe = options.observe ?? 60;
  const forecast = options.forecast ?? 30;
  const seconds = options.headingSeconds ?? 0.5;
  const minHeadingSpeed = options.minHeadingSpeed ?? 0.1;
  if (!Number.isInteger(observe) || observe < 1) throw new RangeError(`observe must be a positive whole number of steps (got ${observe})`);
  if (!Number.isInteger(forecast) || forecast < 0) throw new RangeError(`forecast must be a whole number of steps (got ${forecast})`);
  if (!(seconds > 0) || !(minHeadingSpeed >= 0)) throw new RangeError('headingSeconds must be positive and minHeadingSpeed not negative');
  const headingSteps = Math.max(1, Math.min(observe - 1, Math.round(seconds * rate)));
  const history = options.history ?? observe;
  if (!Number.isInteger(history) || history < observe) throw new RangeError(`history must be a whole number of steps, at least the observed ${observe} (got ${history})`);
  return { observe, forecast, headingSteps, minHeadingSpeed, history };
}

/** Returns an empty window sized for a track and options, ready for fillWindow. */
export function allocateWindow(track: Track, options: ResolvedWindowOptions): Window {
  const W = track.nodeCount * STATE_SIZE;
  const futureStore = new Float64Array(options.forecast * W);
  const historyStore = new Float64Array(options.history * W);
  const win: Window = {
    path: track.path, rate: track.rate, nodeCount: track.nodeCount,
    observe: options.observe, forecast: options.forecast, endObservedStep: -1,
    observed: new Float64Array(options.observe * W),
    future: futureStore.subarray(0, 0), futureSteps: 0, futureStore,
    history: historyStore.subarray(0, 0), historySteps: 0, historyStore,
    frame: identityFrame(), mirrored: false,
    toWorld: (state, out) => frameToWorld(win.frame, state, out),
  };
  return win;
}

/** Returns the first step that can end an observed part (the observed steps plus one earlier step). */
export function firstWindowEnd(options: ResolvedWindowOptions): number {
  return options.observe;
}

/** Throws InputError naming the file when a track is too short for one observed part. */
function checkLength(track: Track, options: ResolvedWindowOptions): void {
  if (track.steps <= options.observe)
    throw new InputError(`${track.path}: the take is too short for a motion window: it needs more than ${options.observe} steps at ${track.rate} Hz (${((options.observe + 1) / track.rate).toFixed(2)} s), it has ${track.steps}.`);
}

/**
 * Fills `win` (from allocateWindow with the same options) with the window whose last observed step is
 * `e` and returns it; allocation-free. `nodes` comes from frameNodes(track).
 */
export function fillWindow(track: Track, e: number, options: ResolvedWindowOptions, nodes: FrameNodes, win: Window): Window {
  if (!Number.isInteger(e) || e < options.observe || e >= track.steps)
    throw new RangeError(`window end ${e} is outside ${options.observe}..${track.steps - 1}`);
  const frame = frameAt(track, nodes, e, options.headingSteps, options.minHeadingSpeed, win.frame);
  const futureSteps = Math.min(options.forecast, track.steps - 1 - e);
  const W = track.nodeCount * STATE_SIZE;
  fillState(track, frame, e - options.observe + 1, options.observe, win.observed);
  // History from step 1 at the earliest (step 0 has no backward difference); its tail repeats `observed`.
  const historySteps = Math.min(options.history, e);
  if (options.history === options.observe) win.historyStore.set(win.observed);
  else fillState(track, frame, e - historySteps + 1, historySteps, win.historyStore);
  if (win.history.length !== historySteps * W) win.history = win.historyStore.subarray(0, historySteps * W);
  win.historySteps = historySteps;
  if (futureSteps > 0) fillState(track, frame, e + 1, futureSteps, win.futureStore);
  if (win.future.length !== futureSteps * W) win.future = win.futureStore.subarray(0, futureSteps * W);
  win.futureSteps = futureSteps;
  win.endObservedStep = e;
  win.mirrored = false;
  return win;
}

/**
 * Writes the state of `count` track steps from step `first` (≥ 1) in `frame` into `out`
 * (count × nodes × 6): positions q = Rᵀ(p − origin)/L, velocities Rᵀ(p[k] − p[k−1])·rate/L.
 */
function fillState(track: Track, frame: WindowFrame, first: number, count: number, out: Float64Array): void {
  const P = track.positions, N = track.nodeCount, rate = track.rate;
  const c = frame.cos, s = frame.sin, k = 1 / frame.scale;
  const ox = frame.origin[0]!, oy = frame.origin[1]!, oz = frame.origin[2]!;
  for (let t = 0; t < count; t++) {
    const step = first + t;
    for (let n = 0; n < N; n++) {
      const p = (step * N + n) * 3, q = p - N * 3;
      const o = (t * N + n) * STATE_SIZE;
      const dx = P[p]! - ox, dy = P[p + 1]! - oy, dz = P[p + 2]! - oz;
      const u = (P[p]! - P[q]!) * rate, v = (P[p + 1]! - P[q + 1]!) * rate, w = (P[p + 2]! - P[q + 2]!) * rate;
      out[o] = k * (c * dx + s * dy);
      out[o + 1] = k * (c * dy - s * dx);
      out[o + 2] = k * dz;
      out[o + 3] = k * (c * u + s * v);
      out[o + 4] = k * (c * v - s * u);
      out[o + 5] = k * w;
    }
  }
}

/** Returns the window of `track` whose last observed step is `e` (fresh arrays). */
export function makeWindow(track: Track, e: number, options: WindowOptions = {}): Window {
  const o = resolveWindowOptions(track.rate, options);
  checkLength(track, o);
  return fillWindow(track, e, o, frameNodes(track), allocateWindow(track, o));
}

/** Options of windowsOf: the window options and whether windows with a cut future are included. */
export interface WindowsOfOptions extends WindowOptions {
  /** Include windows near the end whose future is shorter than `forecast` (default false). */
  partial?: boolean;
}

/** Returns the last observed steps windowsOf visits: from `observe` by `stride` while the future fits. */
export function windowEnds(track: Track, stride: number, options: WindowsOfOptions = {}): number[] {
  if (!Number.isInteger(stride) || stride < 1) throw new RangeError(`stride must be a positive whole number (got ${stride})`);
  const o = resolveWindowOptions(track.rate, options);
  const last = options.partial ? track.steps - 1 : track.steps - 1 - o.forecast;
  const ends: number[] = [];
  for (let e = firstWindowEnd(o); e <= last; e += stride) ends.push(e);
  return ends;
}

/** Yields every window of a track, last observed steps from `observe` on by `stride` (fresh arrays each). */
export function* windowsOf(track: Track, stride: number, options: WindowsOfOptions = {}): Generator<Window> {
  const o = resolveWindowOptions(track.rate, options);
  const nodes = frameNodes(track);
  for (const e of windowEnds(track, stride, options)) yield fillWindow(track, e, o, nodes, allocateWindow(track, o));
}
