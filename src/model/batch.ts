// Training data for the coupling model: takes (a track, its subject and an optional causal gait phase),
// references to windows in them, and the builder that turns a list of window references into a
// normalised, time-major Batch without allocating (one window buffer per take, reused).
import { mirrorState } from '../motion/reflect.js';
import { frameNodes, type FrameNodes } from '../motion/frame.js';
import { normalise, type MotionStats } from '../motion/normalise.js';
import type { Track } from '../motion/track.js';
import { allocateWindow, fillWindow, resolveWindowOptions, windowEnds, type ResolvedWindowOptions, type Window } from '../motion/window.js';
import type { ParamStore } from '../nn/params.js';
import { modelWindowOptions, observedPoints, pointStep, type ModelConfig } from './config.js';
import type { Batch } from './encoder.js';
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

  /** A builder for batches of `size` windows of `takes`, normalised by `stats`, in the store's precision. */
  constructor(private readonly config: ModelConfig, private readonly stats: MotionStats, private readonly takes: readonly TrainingTake[], size: number, store: ParamStore) {
    const steps = config.observe + config.forecast, W = config.nodes * 6;
    this.batch = { size, state: store.alloc(steps * size * W), group: new Int32Array(size), phase: new Float64Array(size * observedPoints(config)) };
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
      if (this.prior) {
        const H = win.historySteps, hist = this.prior.history.subarray(0, H * W);
        if (ref.mirrored) mirrorState(win.history, track.nodeMirror, hist);
        else hist.set(win.history);
        const steps = stridePriorSteps(c, this.stats, hist, H, this.prior.steps, this.prior.scratch), prior = this.batch.prior!;
        for (let f = 0; f < F; f++) {
          const o = (f * B + b) * W, q = f * W;
          for (let i = 0; i < W; i++) prior[o + i] = steps[q + i]!;
        }
        const recon = strideReconSteps(c, this.stats, hist, H, this.prior.recon, this.prior.scratch), pr = this.batch.priorRecon!;
        for (let q = 0; q < c.reconSteps; q++) {
          const o = (q * B + b) * W, r = q * W;
          for (let i = 0; i < W; i++) pr[o + i] = recon[r + i]!;
        }
      }
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
    }
    return this.batch;
  }
}
