// Training data for the coupling model: takes (a track, its subject and an optional causal gait phase),
// references to windows in them, and the builder that turns a list of window references into a
// normalised, time-major Batch without allocating (one window buffer per take, reused).
import { mirrorState } from '../motion/reflect.js';
import { frameNodes, type FrameNodes } from '../motion/frame.js';
import { normalise, type MotionStats } from '../motion/normalise.js';
import { allPairs } from '../motion/roles.js';
import type { Track } from '../motion/track.js';
import { allocateWindow, fillWindow, resolveWindowOptions, windowEnds, type ResolvedWindowOptions, type Window } from '../motion/window.js';
import type { ParamStore } from '../nn/params.js';
import type { Buf } from '../nn/types.js';
import { modelWindowOptions, observedPoints, pointStep, type ModelConfig } from './config.js';
import type { Batch } from './encoder.js';
import { SIGNATURE_FEATURES } from './signature.js';
import { stridePriorScratch, stridePriorSteps, strideReconSteps, type StridePriorScratch } from './model.js';

/** One take the model learns from. */
export interface TrainingTake {
  track: Track;
  /** Subject identifier: the held-out split never divides a subject's takes. */
  subject: string;
  /**
   * Gait phase per track step in radians (NaN where unknown), for restricted labeling. It must be causal
   * (each value from events up to that step). A mirrored window reads the phase shifted by π (the other
   * side's cycle). Null: no labels from this take.
   */
  phase?: Float64Array | null;
  /**
   * Standardised take signature (pairs × SIGNATURE_FEATURES, signature.ts) the static factors are trained to
   * carry; null or absent: no signature term for this take's windows. Set by prepareTraining.
   */
  signature?: Float64Array | null;
}

/** A window of a take: its last observed step and whether it is left/right mirrored. */
export interface WindowRef {
  take: number;
  end: number;
  mirrored: boolean;
}

/** Returns every window of the takes with a complete future, last observed steps `stride` apart. */
export function windowRefs(takes: readonly TrainingTake[], config: ModelConfig, stride: number): WindowRef[] {
  const refs: WindowRef[] = [];
  takes.forEach((t, i) => {
    if (t.track.steps <= config.observe + config.forecast) return;
    for (const end of windowEnds(t.track, stride, { observe: config.observe, forecast: config.forecast })) refs.push({ take: i, end, mirrored: false });
  });
  return refs;
}

/** Fills batches of a fixed size from window references. */
export class BatchBuilder {
  readonly batch: Batch;
  private readonly windows: (Window | null)[];
  private readonly nodes: (FrameNodes | null)[];
  private readonly options: ResolvedWindowOptions[];
  private readonly scratch: Float64Array;
  private readonly prior: { steps: Float64Array; recon: Float64Array; history: Float64Array; scratch: StridePriorScratch } | null;
  /** Stride prior steps and recon steps of windows already seen, by window (the prior is a pure function of it). */
  private readonly priorCache = new Map<number, Buf>();
  private priorCacheBytes = 0;
  /** Mirror image of each pair, for the signatures of mirrored windows (null: no take has a signature). */
  private readonly signatureMirror: Int32Array | null = null;

  /** A builder for batches of `size` windows of `takes`, normalised by `stats`, in the store's precision. */
  constructor(private readonly config: ModelConfig, private readonly stats: MotionStats, private readonly takes: readonly TrainingTake[], size: number, store: ParamStore) {
    const steps = config.observe + config.forecast, W = config.nodes * 6;
    this.batch = { size, state: store.alloc(steps * size * W), group: new Int32Array(size), phase: new Float64Array(size * observedPoints(config)) };
    if (takes.some((t) => t.signature)) {
      // The model's pairs are every ordered pair in allPairs' order (nn/pairs.ts allOrderedPairs).
      const pairs = allPairs(config.nodes, takes[0]!.track.nodeMirror);
      this.batch.signature = new Float64Array(size * pairs.count * SIGNATURE_FEATURES);
      this.signatureMirror = pairs.mirror;
    }
    if (config.stridePrior) {
      this.batch.prior = store.alloc(config.forecast * size * W);
      this.batch.priorRecon = store.alloc(config.reconSteps * size * W);
    }
    this.prior = config.stridePrior
      ? { steps: new Float64Array(config.forecast * W), recon: new Float64Array(config.reconSteps * W), history: new Float64Array(config.priorHistory * W), scratch: stridePriorScratch(config) }
      : null;
    this.windows = takes.map(() => null);
    this.nodes = takes.map(() => null);
    this.options = takes.map((t) => resolveWindowOptions(t.track.rate, modelWindowOptions(config)));
    this.scratch = new Float64Array(steps * W);
  }

  /** Returns the batch filled with the referenced windows; windows with equal `groups` entries share static factors. */
  fill(refs: readonly WindowRef[], groups: readonly number[]): Batch {
    const c = this.config, B = this.batch.size, W = c.nodes * 6, T = c.observe, F = c.forecast, K = observedPoints(c);
    if (refs.length !== B || groups.length !== B) throw new RangeError(`a batch needs ${B} windows and groups`);
    const s = this.scratch, state = this.batch.state;
    for (let b = 0; b < B; b++) {
      const ref = refs[b]!, take = this.takes[ref.take]!, track = take.track;
      let win = this.windows[ref.take];
      if (!win) win = this.windows[ref.take] = allocateWindow(track, this.options[ref.take]!);
      const nodes = this.nodes[ref.take] ?? (this.nodes[ref.take] = frameNodes(track));
      fillWindow(track, ref.end, this.options[ref.take]!, nodes, win);
      if (win.futureSteps !== F) throw new RangeError(`window at step ${ref.end} of ${track.path} has no complete future`);
      s.set(win.observed, 0);
      s.set(win.future, T * W);
      if (ref.mirrored) mirrorState(s, track.nodeMirror, s);
      // The stride prior from the causal history as the model sees it (window frame, mirrored like the window).
      if (this.prior) this.fillPrior(ref, win, b);
      normalise(this.stats, s, s);
      for (let t = 0; t < T + F; t++) {
        const o = (t * B + b) * W, q = t * W;
        for (let i = 0; i < W; i++) state[o + i] = s[q + i]!;
      }
      this.batch.group[b] = groups[b]!;
      for (let j = 0; j < K; j++) {
        const ph = take.phase ? take.phase[ref.end - T + 1 + pointStep(c, j)] : undefined;
        this.batch.phase[b * K + j] = ph === undefined || !Number.isFinite(ph) ? NaN : ref.mirrored ? ph + Math.PI : ph;
      }
      if (this.batch.signature) this.fillSignature(take.signature ?? null, ref.mirrored, b);
    }
    return this.batch;
  }

  /** Writes window b's signature (pair k of a mirrored window takes the take's pair m(k)); NaN without one. */
  private fillSignature(sig: Float64Array | null, mirrored: boolean, b: number): void {
    const G = SIGNATURE_FEATURES, m = this.signatureMirror!, P = m.length, out = this.batch.signature!, o = b * P * G;
    if (!sig) {
      out.fill(NaN, o, o + P * G);
      return;
    }
    for (let k = 0; k < P; k++) {
      const from = (mirrored ? m[k]! : k) * G;
      for (let g = 0; g < G; g++) out[o + k * G + g] = sig[from + g]!;
    }
  }

  /**
   * Writes window b's stride prior steps and recon steps into the batch, computed once per window and
   * kept (in the batch's precision, so cached and fresh values are the same bits) up to PRIOR_CACHE_BYTES.
   */
  private fillPrior(ref: WindowRef, win: Window, b: number): void {
    const c = this.config, B = this.batch.size, W = c.nodes * 6, F = c.forecast, R = c.reconSteps, p = this.prior!;
    const key = (ref.take * 2 ** 24 + ref.end) * 2 + (ref.mirrored ? 1 : 0);
    let cached = this.priorCache.get(key) ?? null;
    if (!cached) {
      const H = win.historySteps, hist = p.history.subarray(0, H * W);
      if (ref.mirrored) mirrorState(win.history, this.takes[ref.take]!.track.nodeMirror, hist);
      else hist.set(win.history);
      const steps = stridePriorSteps(c, this.stats, hist, H, p.steps, p.scratch);
      const recon = strideReconSteps(c, this.stats, hist, H, p.recon, p.scratch);
      const both: Buf = this.batch.prior instanceof Float64Array ? new Float64Array((F + R) * W) : new Float32Array((F + R) * W);
      both.set(steps.subarray(0, F * W));
      both.set(recon.subarray(0, R * W), F * W);
      cached = both;
      if (this.priorCacheBytes + both.byteLength <= PRIOR_CACHE_BYTES) {
        this.priorCache.set(key, both);
        this.priorCacheBytes += both.byteLength;
      }
    }
    const prior = this.batch.prior!, pr = this.batch.priorRecon!;
    for (let f = 0; f < F; f++) prior.set(cached.subarray(f * W, (f + 1) * W) as never, (f * B + b) * W);
    for (let q = 0; q < R; q++) pr.set(cached.subarray((F + q) * W, (F + q + 1) * W) as never, (q * B + b) * W);
  }
}

/** Most bytes of stride priors a batch builder keeps (a 32-walker cohort's windows need about 150 MB). */
const PRIOR_CACHE_BYTES = 256 * 1024 * 1024;
