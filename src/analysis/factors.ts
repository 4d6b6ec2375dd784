// Per-take summaries of the coupling model's pair factors. Windows are read every `everyS` seconds (each
// from its own observed part only); per ordered pair the static factors' mean over windows and their SD
// between windows; per window the last dynamic point (the one nearest the window's end, so the series is
// causal) as the take's dynamic factor series; and that series binned over the gait cycle (0-100 %, from
// the take's initial contacts) per pair: a pair whose sender is on the right is binned by the right
// cycle, every other by the left, so a pair and its mirror are compared at the same phase of their side.
//
// Mirror averaging (on by default): each window is also read from the take's mirror image, and pair p's
// static factors are the mean of its own reading and the mirror image's reading of pair m(p). Whatever
// left/right bias the encoder has cancels: an exactly symmetric walker gets identical factors on a pair
// and its mirror, and mirroring a take swaps every pair's factors with its mirror's exactly.
import { frameNodes } from '../motion/frame.js';
import { mirrorPairValues, mirrorTrack } from '../motion/mirror.js';
import { DEFAULT_PAIRS, MOTION_NODES } from '../motion/roles.js';
import type { Track } from '../motion/track.js';
import { allocateWindow, fillWindow, resolveWindowOptions } from '../motion/window.js';
import { modelWindowOptions, observedPoints } from '../model/config.js';
import { createFactorReader, windowFactors } from '../model/factors.js';
import type { CouplingModel } from '../model/model.js';

/** The factor summaries of one take (pair k is DEFAULT_PAIRS' pair k: sender[k] → receiver[k]). */
export interface TakeFactors {
  pairs: number;
  staticDims: number;
  dynamicDims: number;
  /** Track step (model rate) of each window's last observed step, and its time in seconds. */
  windowEnds: number[];
  times: Float64Array;
  /** Static posterior means per window, windows × pairs × S. */
  staticPerWindow: Float64Array;
  /** Mean over windows and SD between windows, pairs × S. */
  staticMean: Float64Array;
  staticSd: Float64Array;
  /** Mean posterior SD of the static factors, pairs × S (the model's own uncertainty). */
  staticPosteriorSd: Float64Array;
  /** Last dynamic point of each window, windows × pairs × D (read from the take itself, never mirrored). */
  dynamicSeries: Float64Array;
  /** Whether the static factors are mirror-averaged. */
  mirrorAveraged: boolean;
}

/** Options of takeFactors. */
export interface TakeFactorOptions {
  /** Seconds between windows (default 0.5). */
  everyS?: number;
  /** Average each static reading with the mirror image's reading of the mirror pair (default true). */
  mirrorAverage?: boolean;
}

/** Returns the factor summaries of a take; throws RangeError when it is too short for one window. */
export function takeFactors(model: CouplingModel, track: Track, options: TakeFactorOptions = {}): TakeFactors {
  const c = model.config, P = DEFAULT_PAIRS.count, S = c.staticDims, D = c.dynamicDims, K = observedPoints(c);
  if (c.nodes !== MOTION_NODES.length) throw new RangeError(`the model has ${c.nodes} nodes; factor summaries need the ${MOTION_NODES.length} canonical nodes`);
  const step = Math.max(1, Math.round((options.everyS ?? 0.5) * track.rate));
  const ends: number[] = [];
  for (let e = c.observe; e < track.steps; e += step) ends.push(e);
  if (ends.length === 0) throw new RangeError(`${track.path}: the take is too short for one ${(c.observe / c.rate).toFixed(1)}-s window`);
  const opts = resolveWindowOptions(track.rate, modelWindowOptions(c));
  const win = allocateWindow(track, opts), nodes = frameNodes(track), reader = createFactorReader(model);
  const mirrorAveraged = options.mirrorAverage ?? true;
  const mirrored = mirrorAveraged ? mirrorTrack(track) : null;
  const n = ends.length, mirrorMean = new Float64Array(P * S), mirrorSd = new Float64Array(P * S);
  const staticPerWindow = new Float64Array(n * P * S), dynamicSeries = new Float64Array(n * P * D);
  const staticPosteriorSd = new Float64Array(P * S);
  ends.forEach((e, w) => {
    const f = windowFactors(model, fillWindow(track, e, opts, nodes, win), reader);
    const o = w * P * S;
    if (mirrored) {
      // The mirror image has the same node list, so the frame nodes carry over.
      const g = windowFactors(model, fillWindow(mirrored, e, opts, nodes, win), reader);
      mirrorPairValues(g.staticMean, DEFAULT_PAIRS.mirror, S, mirrorMean);
      mirrorPairValues(g.staticSd, DEFAULT_PAIRS.mirror, S, mirrorSd);
      for (let i = 0; i < P * S; i++) {
        staticPerWindow[o + i] = 0.5 * (f.staticMean[i]! + mirrorMean[i]!);
        staticPosteriorSd[i]! += (0.5 * (f.staticSd[i]! + mirrorSd[i]!)) / n;
      }
    } else {
      staticPerWindow.set(f.staticMean, o);
      for (let i = 0; i < P * S; i++) staticPosteriorSd[i]! += f.staticSd[i]! / n;
    }
    dynamicSeries.set(f.dynamicMean.subarray((K - 1) * P * D, K * P * D), w * P * D);
  });
  const staticMean = new Float64Array(P * S), staticSd = new Float64Array(P * S);
  for (let i = 0; i < P * S; i++) {
    let m = 0;
    for (let w = 0; w < n; w++) m += staticPerWindow[w * P * S + i]!;
    m /= n;
    let v = 0;
    for (let w = 0; w < n; w++) v += (staticPerWindow[w * P * S + i]! - m) ** 2;
    staticMean[i] = m;
    staticSd[i] = n > 1 ? Math.sqrt(v / (n - 1)) : 0;
  }
  return {
    pairs: P, staticDims: S, dynamicDims: D, windowEnds: ends, times: Float64Array.from(ends, (e) => e / track.rate),
    staticPerWindow, staticMean, staticSd, staticPosteriorSd, dynamicSeries, mirrorAveraged,
  };
}

/** Returns the information in ordered pair p's static factors: KL of their mean posterior from the N(0, 1) prior, nats. */
export function staticKl(f: TakeFactors, p: number): number {
  let s = 0;
  for (let d = 0; d < f.staticDims; d++) {
    const m = f.staticMean[p * f.staticDims + d]!, sd = Math.max(1e-6, f.staticPosteriorSd[p * f.staticDims + d]!);
    s += 0.5 * (m * m + sd * sd - 1 - 2 * Math.log(sd));
  }
  return s;
}

/** Returns the gait-cycle fraction (0..1) at time t from sorted initial-contact times, or NaN outside a cycle. */
export function cycleFraction(contacts: readonly number[], t: number): number {
  for (let i = 0; i + 1 < contacts.length; i++) {
    const a = contacts[i]!, b = contacts[i + 1]!;
    // Cycles longer than 2.5 s are pauses or turns, not strides (common practice for walking: 0.8-1.6 s).
    if (t >= a && t < b) return b - a <= 2.5 ? (t - a) / (b - a) : NaN;
  }
  return NaN;
}

/**
 * Returns the dynamic factors binned over the gait cycle: bins × pairs × D means (NaN where a bin holds no
 * window) and the window count per pair and bin. `left` and `right` are the sides' initial-contact times.
 */
export function dynamicOverCycle(f: TakeFactors, contacts: { left: readonly number[]; right: readonly number[] }, bins = 20): { mean: Float64Array; count: Int32Array; bins: number } {
  const P = f.pairs, D = f.dynamicDims, n = f.windowEnds.length;
  const sum = new Float64Array(bins * P * D), count = new Int32Array(bins * P);
  const rightSender = Int8Array.from(DEFAULT_PAIRS.sender, (s) => (MOTION_NODES[s]!.startsWith('r_') ? 1 : 0));
  for (let w = 0; w < n; w++) {
    const t = f.times[w]!;
    const binOf = (list: readonly number[]) => { const x = cycleFraction(list, t); return Number.isFinite(x) ? Math.min(bins - 1, Math.floor(x * bins)) : -1; };
    const bl = binOf(contacts.left), br = binOf(contacts.right);
    for (let p = 0; p < P; p++) {
      const b = rightSender[p] ? br : bl;
      if (b < 0) continue;
      count[b * P + p]!++;
      for (let d = 0; d < D; d++) sum[(b * P + p) * D + d]! += f.dynamicSeries[(w * P + p) * D + d]!;
    }
  }
  const mean = new Float64Array(bins * P * D);
  for (let b = 0; b < bins; b++)
    for (let p = 0; p < P; p++)
      for (let d = 0; d < D; d++) {
        const k = count[b * P + p]!;
        mean[(b * P + p) * D + d] = k ? sum[(b * P + p) * D + d]! / k : NaN;
      }
  return { mean, count, bins };
}
