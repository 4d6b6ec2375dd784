// Fitting the pair readouts (readout.ts) of a trained model and its twin: the decoded forecast of every
// training window with full history is compared with the recorded future at the knot steps; the
// readout is the ridge regression of that difference on the window's features, its weight picked on the
// held-out subjects' windows. Mirror images of the training windows are added, as training adds them,
// and copies with capture jitter on the history (jitter.ts) and the clean window's target: the standard
// readout is fitted with mildly jittered copies, the jitter-robust one with fully jittered copies, and
// a window whose measured jitter lies well above that of the clean training windows gets the robust one
// (readout.ts, jitterThreshold). Why: fitted on clean motion alone, the readout's weights on the last
// few lags acted as differences and amplified a noisy capture's jitter (a demo take's 1-s error went
// from 19.7 mm without the readout to 56.8 mm with it; on fully jittered held-out copies its knot error
// was 79.5 milli-leg-lengths against 13.2 without it). One readout fitted on every level stopped that
// but raised the clean held-out cohort's 1-s error from 16.1 to 16.7 mm (eval:forecast), most of it at
// the short horizons the lags serve. A switch between the clean-only readout and a robust one needs a
// threshold below the mildest noisy capture, and clean takes measured up to 3.9 milli-leg-lengths
// while 0.3° of rotation noise measured 5.0: with the threshold at 5.7 the clean-only readout met
// jittered copies below it and raised their error (31.7 against 13.2 without it), hence the mild copies.
import { denormalise } from '../motion/normalise.js';
import { STATE_SIZE } from '../motion/reflect.js';
import { jitterPositions, NODE_PARENT, type JitterLevel } from '../motion/jitter.js';
import { windowsOf, type Window } from '../motion/window.js';
import { Pcg32 } from '../nn/prng.js';
import type { TrainingTake } from './batch.js';
import { modelWindowOptions } from './config.js';
import { createForecaster, decodePaths } from './forecast.js';
import type { CouplingModel } from './model.js';
import {
  captureJitter, fitReadout, knotError, mirrorNodeVectors, readoutFeatures, readoutFeaturesOfPositions, readoutHistory, readoutKnots, readoutScratch,
  type PairReadout, type ReadoutData, type ReadoutFit, type ReadoutSenders,
} from './readout.js';

/** Sample paths averaged for a window's decoded mean while fitting (the factors' draws barely move it). */
const FIT_SAMPLES = 4;

/**
 * The jitter of the augmented copies: each copy draws its level uniformly between none and this (window
 * frame, leg lengths). 1° per axis at every node joint gives toes a frame-to-frame jitter of about 0.1 leg
 * lengths in second differences at 30 Hz; the demo's noisy capture (0.6° on every rotation channel) shows
 * about half that, and a clean one about a quarter (its walking alone).
 */
export const READOUT_JITTER: JitterLevel = { rotation: Math.PI / 180, shift: 0.003 };

/** Options of readoutData. */
export interface ReadoutDataOptions {
  /** Add each window's mirror image (and its jittered copies' images). */
  mirror: boolean;
  /** One jittered copy per entry, its level drawn up to the entry times READOUT_JITTER (empty: none). */
  jitterScales: readonly number[];
  /** Only the windows whose index is `index` modulo `of` (a thread's share; mergeReadoutData joins the shares). */
  part?: { index: number; of: number };
}

/** Returns the readout fitting data of `model` (its readout ignored) over the windows of `takes` every `stride` steps. */
export function readoutData(model: CouplingModel, takes: readonly TrainingTake[], stride: number, options: ReadoutDataOptions): ReadoutData {
  const c = model.config, N = c.nodes, F = c.forecast, W = N * STATE_SIZE, knots = readoutKnots(c), K = knots.length;
  const saved = model.readout;
  model.readout = null;
  try {
    const fc = createForecaster(model, FIT_SAMPLES), scratch = readoutScratch(c), mean = new Float64Array(F * W);
    const out: ReadoutData = { features: [], targets: [], jitter: [], copy: [], window: [] };
    let i = 0;
    const push = (features: Float64Array, target: Float64Array, copy: number, mirror: Int32Array) => {
      // The mirror image has the same jitter (a reflection keeps every distance).
      const jitter = captureJitter(scratch.positions, readoutHistory(c), N);
      out.features.push(features);
      out.targets.push(target);
      out.jitter!.push(jitter);
      out.copy!.push(copy);
      out.window!.push(i);
      if (!options.mirror) return;
      out.features.push(mirrorNodeVectors(features, mirror, new Float64Array(features.length)));
      out.targets.push(mirrorNodeVectors(target, mirror, new Float64Array(N * K * 3)));
      out.jitter!.push(jitter);
      out.copy!.push(copy);
      out.window!.push(i);
    };
    const part = options.part ?? { index: 0, of: 1 };
    for (const t of takes)
      for (const win of windowsOf(t.track, stride, modelWindowOptions(c))) {
        if (win.futureSteps !== F || win.historySteps !== readoutHistory(c)) continue;
        const f = readoutFeatures(c, win.history, win.historySteps, scratch);
        if (!f) continue;
        // Another thread's window: counted (its draws are seeded by its index), not decoded here.
        if (i % part.of !== part.index) {
          i++;
          continue;
        }
        const paths = decodePaths(fc, win, new Pcg32(1 + i, 0x726f7574));
        mean.fill(0);
        for (let m = 0; m < FIT_SAMPLES; m++) for (let j = 0; j < F * W; j++) mean[j] = mean[j]! + paths[m * F * W + j]! / FIT_SAMPLES;
        denormalise(model.stats, mean, mean);
        const target = targetOf(win, mean, knots, N);
        push(Float64Array.from(f), target, -1, t.track.nodeMirror);
        // Jittered copies: the same window's positions (readoutFeatures left them in the scratch) with capture jitter, the clean target.
        const clean = Float64Array.from(scratch.positions), rng = new Pcg32(1 + i, 0x6a697474);
        options.jitterScales.forEach((scale, q) => {
          const level = { rotation: scale * READOUT_JITTER.rotation * rng.next(), shift: scale * READOUT_JITTER.shift * rng.next() };
          jitterPositions(clean, win.historySteps, NODE_PARENT, level, rng, scratch.positions);
          push(Float64Array.from(readoutFeaturesOfPositions(c, scratch)), target, q, t.track.nodeMirror);
        });
        i++;
      }
    return out;
  } finally {
    model.readout = saved;
  }
}

/**
 * Returns the threads' shares of one readoutData call (options.part 0 … of − 1) joined in window order:
 * the very data one thread would have made (each window's draws are seeded by its index).
 */
export function mergeReadoutData(parts: readonly ReadoutData[]): ReadoutData {
  const entries = parts.flatMap((d) => d.features.map((_, e) => ({ d, e, w: d.window![e]! })));
  // A stable sort: a window's entries keep their order (clean, mirror, copies).
  entries.sort((x, y) => x.w - y.w);
  return {
    features: entries.map((x) => x.d.features[x.e]!), targets: entries.map((x) => x.d.targets[x.e]!),
    jitter: entries.map((x) => x.d.jitter![x.e]!), copy: entries.map((x) => x.d.copy![x.e]!), window: entries.map((x) => x.w),
  };
}

/** Returns the training data of fitModelReadout (every `stride` steps, mirrored, with both jittered copies), or one thread's share of it. */
export function readoutTrainingData(model: CouplingModel, train: readonly TrainingTake[], stride: number, part?: { index: number; of: number }): ReadoutData {
  return readoutData(model, train, stride, { mirror: true, jitterScales: READOUT_JITTER_SCALES, ...(part ? { part } : {}) });
}

/** Returns the windows of `data` whose copy index (−1: the clean window, k: its k-th jittered copy) is one of `copies`. */
function subset(data: ReadoutData, copies: readonly number[]): ReadoutData {
  const keep = data.features.map((_, i) => copies.includes(data.copy?.[i] ?? -1));
  const pick = <T>(xs: T[] | undefined) => xs?.filter((_, i) => keep[i]);
  return { features: pick(data.features)!, targets: pick(data.targets)!, jitter: pick(data.jitter), copy: pick(data.copy), window: pick(data.window) };
}

/** Returns the recorded future minus the decoded mean (window frame, leg lengths) at the knots, nodes × knots × 3. */
function targetOf(win: Window, mean: Float64Array, knots: readonly number[], N: number): Float64Array {
  const K = knots.length, out = new Float64Array(N * K * 3);
  knots.forEach((k, q) => {
    for (let n = 0; n < N; n++)
      for (let a = 0; a < 3; a++) {
        const o = (k * N + n) * STATE_SIZE + a;
        out[(n * K + q) * 3 + a] = win.future[o]! - mean[o]!;
      }
  });
  return out;
}

/** Held-out knot error (leg lengths) without the readout and with the one fitted, on one kind of window. */
export interface KnotErrorPair { before: number; after: number }

/** A readout fit of one model: the fit (null when there was nothing to fit on) and, when no readout was kept, why. */
export interface ReadoutOutcome {
  /** The standard readout's fit; its readout carries the jitter switch. */
  fit: ReadoutFit | null;
  /** The jitter-robust readout's fit (null when there was nothing to fit on). */
  robust: ReadoutFit | null;
  /** Null when the readout was kept; else the reason it was not (the forecast is then the decoder's alone). */
  dropped: string | null;
  /** The switched readout's held-out knot error on the clean windows, their mildly and their fully jittered copies (null without a fit). */
  clean: KnotErrorPair | null;
  mild: KnotErrorPair | null;
  jittered: KnotErrorPair | null;
  /** The standard readout's alone on the fully jittered copies (what the switch saves). */
  jitteredCleanOnly: number | null;
}

/**
 * The jittered copies of every window, as scales of READOUT_JITTER: copy 0 (up to a quarter of it, whose
 * measured jitter reaches about that of the jitteriest clean takes) for the standard readout, copy 1 (up
 * to all of it) for the robust one. The held-out windows get the same copies.
 */
export const READOUT_JITTER_SCALES = [0.25, 1] as const;

/** The jitter threshold is this factor times the 99th percentile of the clean training windows' measured jitter. */
export const JITTER_THRESHOLD_FACTOR = 1.5;

/**
 * Returns the jitter threshold of the switch: JITTER_THRESHOLD_FACTOR times the 99th percentile (type 7)
 * of the clean windows' measured jitter. Not the threshold with the lowest held-out error: on clean
 * windows the two readouts differ little, so that one wandered into the clean range (measured: 1.7
 * milli-leg-lengths, below half of the clean demo takes), while the clean readout on a noisy window costs
 * several times its error. Measured captureJitter (milli-leg-lengths): clean invented takes 1.1-3.9
 * (training cohort at 60 Hz, held-out bodies at 100 and 120 Hz, the demo takes), captures with 0.3-1°
 * of rotation-channel noise 5-18; the factor puts the threshold in that gap.
 */
export function jitterThreshold(cleanJitter: readonly number[]): number {
  const v = [...cleanJitter].sort((a, b) => a - b), x = 0.99 * (v.length - 1), i = Math.floor(x);
  const q = i + 1 < v.length ? v[i]! + (x - i) * (v[i + 1]! - v[i]!) : v[i]!;
  return JITTER_THRESHOLD_FACTOR * q;
}

/**
 * Fits `model.readout` from the training takes' windows (every `stride` steps, mirrored) and their mildly
 * jittered copies, with the ridge weight picked on the held-out takes' windows and copies of the same
 * kinds (every `validStride` steps), and its jitter-robust counterpart from the windows and their fully
 * jittered copies; every node's features reach every receiver unless the model has no coupling. The
 * switch's threshold comes from the clean training windows' jitter (jitterThreshold). The readout is
 * kept only where the held-out windows show that it lowers the error at the knots, on the clean windows
 * and on both kinds of jittered copy; otherwise (or with too few windows of full history to fit or judge
 * it) `model.readout` is null and the outcome says why. `trainingData`: readoutTrainingData's of the
 * training takes, when already made (post-fit.ts makes it in shares on two threads).
 */
export function fitModelReadout(model: CouplingModel, train: readonly TrainingTake[], valid: readonly TrainingTake[], stride: number, validStride: number, trainingData?: ReadoutData): ReadoutOutcome {
  const senders: ReadoutSenders = model.config.noCoupling ? 'self' : 'all';
  model.readout = null;
  const history = `${(readoutHistory(model.config) / model.config.rate).toFixed(1)} s of history and 1 s of future`;
  const none = (dropped: string): ReadoutOutcome => ({ fit: null, robust: null, dropped, clean: null, mild: null, jittered: null, jitteredCleanOnly: null });
  const trainData = trainingData ?? readoutTrainingData(model, train, stride);
  const trainClean = subset(trainData, [-1]);
  if (trainClean.features.length < 2) return none(`no training window has ${history}`);
  const validData = readoutData(model, valid, validStride, { mirror: false, jitterScales: READOUT_JITTER_SCALES });
  const validClean = subset(validData, [-1]), validMild = subset(validData, [0]), validJittered = subset(validData, [1]);
  if (validClean.features.length === 0) return none(`no held-out window has ${history} to judge it on`);
  const N = model.config.nodes;
  // The standard readout: clean windows and their mildly jittered copies; the robust one: clean windows and their fully jittered copies.
  const fit = fitReadout(model.config, senders, subset(trainData, [-1, 0]), subset(validData, [-1, 0]));
  const robust = fitReadout(model.config, senders, subset(trainData, [-1, 1]), subset(validData, [-1, 1]));
  fit.readout.jitter = { threshold: jitterThreshold(trainClean.jitter!), robust: robust.readout };
  const pair = (d: ReadoutData): KnotErrorPair => ({ before: knotError(null, d, N), after: knotError(fit.readout, d, N) });
  const clean = pair(validClean), mild = pair(validMild), jittered = pair(validJittered);
  const jitteredCleanOnly = knotError({ ...fit.readout, jitter: null }, validJittered, N);
  const outcome = (dropped: string | null): ReadoutOutcome => ({ fit, robust, dropped, clean, mild, jittered, jitteredCleanOnly });
  if (!(clean.after < clean.before)) return outcome('it did not lower the held-out error');
  if (!(mild.after < mild.before) || !(jittered.after < jittered.before)) return outcome('it raised the held-out error on jittered copies');
  model.readout = fit.readout;
  return outcome(null);
}

/** A readout outcome as a training summary reports it (errors in leg lengths). */
export interface ReadoutSummaryJson {
  kept: boolean;
  dropped: string | null;
  senders: ReadoutSenders | null;
  lambda: number | null;
  train_windows: number;
  valid_windows: number;
  /** The standard readout's fit on its held-out windows (clean windows and their mildly jittered copies): before, after at its weight, per weight. */
  valid_knot_error_before: number | null;
  valid_knot_error_after: number | null;
  valid_knot_error: { lambda: number; error: number }[];
  /** Before and after (the switched readout) on the held-out clean windows and on their jittered copies. */
  valid_knot_error_clean: KnotErrorPair | null;
  valid_knot_error_jittered: KnotErrorPair | null;
  valid_knot_error_mild: KnotErrorPair | null;
  /** The standard readout alone on the fully jittered copies. */
  valid_knot_error_jittered_clean_only: number | null;
  /** The measured capture jitter (leg lengths) above which a window gets the robust readout, and that readout's ridge weight (null: no readout kept, or no switch). */
  jitter_threshold: number | null;
  robust_lambda: number | null;
  /** The robust readout's held-out knot error per ridge weight (clean and jittered windows). */
  robust_valid_knot_error: { lambda: number; error: number }[];
}

/** Returns a readout outcome for a training summary: kept or why not, its weight and the held-out knot error before and after. */
export function readoutSummaryJson(o: ReadoutOutcome | null): ReadoutSummaryJson | null {
  if (!o) return null;
  const f = o.fit, after = f ? Math.min(...f.validError.map((e) => e.error)) : null;
  return {
    kept: o.dropped === null, dropped: o.dropped, senders: f?.readout.senders ?? null, lambda: o.dropped === null ? f!.readout.lambda : null,
    train_windows: f?.trainWindows ?? 0, valid_windows: f?.validWindows ?? 0,
    valid_knot_error_before: f?.validNone ?? null, valid_knot_error_after: after !== null && Number.isFinite(after) ? after : null,
    valid_knot_error: f?.validError ?? [],
    valid_knot_error_clean: o.clean, valid_knot_error_jittered: o.jittered, valid_knot_error_mild: o.mild, valid_knot_error_jittered_clean_only: o.jitteredCleanOnly,
    jitter_threshold: o.dropped === null ? f!.readout.jitter?.threshold ?? null : null, robust_lambda: o.dropped === null && f!.readout.jitter ? o.robust!.readout.lambda : null,
    robust_valid_knot_error: o.robust?.validError ?? [],
  };
}
