// Forecasting from one window: the encoder runs once on the observed part; each sample then draws its
// own static factors and last dynamic factors from the posterior, rolls the dynamic factors forward with
// the learned prior (with its noise), decodes the forecast steps from the last observed state (with the
// stride prior's fixed steps from the observed part when the model has it on), and adds
// the learned per-step noise (times the model's spread calibration and, when the model has it, the
// window's own backcast factor: spread.ts). Samples and their mean are mapped
// back to world metres with the window's toWorld (so a mirrored window lands on its own take).
import { denormalise, normalise } from '../motion/normalise.js';
import { STATE_SIZE } from '../motion/reflect.js';
import type { Window } from '../motion/window.js';
import { Pcg32 } from '../nn/prng.js';
import type { Buf } from '../nn/types.js';
import { observedPoints, pointOfStep, totalPoints } from './config.js';
import { decoderFactors, decoderForward } from './decoder.js';
import { encoderForward, type Batch } from './encoder.js';
import { stridePriorScratch, stridePriorSteps, type CouplingModel, type StridePriorScratch } from './model.js';
import { readoutCorrection, readoutScratch, type ReadoutScratch } from './readout.js';
import { backcastError, backcastScratch, spreadFactor, type BackcastScratch } from './spread.js';
import { createWorkspace, type Workspace } from './workspace.js';

/** Options of forecast. */
export interface ForecastOptions {
  /** Number of samples (default 20). */
  samples?: number;
  /** Seed of the sampling (default 1): same seed, same samples. */
  seed?: number;
  /**
   * Static factor posteriors to use instead of the window's own (pairs × staticDims means and log
   * variances, e.g. another take's): the informativeness check gives each take another's static factors.
   */
  staticFactors?: { mean: ArrayLike<number>; logVar: ArrayLike<number> };
}

/** A forecast of the model's forecast steps after a window's last observed step. */
export interface ForecastResult {
  steps: number;
  nodeCount: number;
  sampleCount: number;
  /** Mean predicted positions, steps × nodes × 3, world metres (canonical frame, Z up). */
  mean: Float64Array;
  /** Sampled positions, samples × steps × nodes × 3, world metres (with the learned noise). */
  samples: Float64Array;
  /** Mean predicted state, steps × nodes × 6, world metres and metres per second. */
  meanState: Float64Array;
  /**
   * Which pair readout corrected the forecast: 'standard', 'jitter-robust' (the window's measured capture
   * jitter lay above the model's threshold), or null (no readout, or a window without its full history).
   */
  readout: ReadoutUsed;
  /** The window's measured capture jitter (readout.ts captureJitter, leg lengths; null where no readout ran or it has no jitter switch). */
  captureJitter: number | null;
}

/** Which pair readout a forecast used. */
export type ReadoutUsed = 'standard' | 'jitter-robust' | null;

/** Reusable buffers of forecasting with one model and sample count. */
export interface Forecaster {
  model: CouplingModel;
  sampleCount: number;
  encoderWs: Workspace;
  sampleWs: Workspace;
  batch: Batch;
  /** Work arrays of the window's backcast error (the spread's per-window factor). */
  backcast: BackcastScratch;
  /** With the stride prior: its steps tiled over the samples (forecast × samples × N × 6) and work arrays. */
  prior: { tiled: Buf; steps: Float64Array; scratch: StridePriorScratch } | null;
  /** With a pair readout: its work arrays and the correction of the current window (forecast × N × 3); the scratch records which readout made it. */
  readout: { scratch: ReadoutScratch; correction: Float64Array; used: ReadoutUsed } | null;
}

/** Returns a forecaster (work buffers) for `samples` samples per forecast. */
export function createForecaster(model: CouplingModel, samples = 20): Forecaster {
  const c = model.config, W = c.nodes * STATE_SIZE;
  const batch: Batch = {
    size: 1, state: model.store.alloc((c.observe + c.forecast) * W), group: new Int32Array(1),
    phase: new Float64Array(observedPoints(c)).fill(NaN),
  };
  const sampleWs = createWorkspace(model, samples);
  for (const rc of sampleWs.rollout) rc.keep = false;
  const prior = c.stridePrior ? { tiled: model.store.alloc(c.forecast * samples * W), steps: new Float64Array(c.forecast * W), scratch: stridePriorScratch(c) } : null;
  const readout = model.readout ? { scratch: readoutScratch(c), correction: new Float64Array(c.forecast * c.nodes * 3), used: null } : null;
  return { model, sampleCount: samples, encoderWs: createWorkspace(model, 1), sampleWs, batch, prior, backcast: backcastScratch(c), readout };
}

/**
 * Returns the deterministic decoded paths of every sample (samples × steps × N × 6, normalised, before
 * the output noise) of the forecaster's sample workspace after encoding `win`; rng draws the factors.
 * With a pair readout (and the window's full history) its correction is added to every path.
 */
export function decodePaths(fc: Forecaster, win: Window, rng: Pcg32, staticFactors?: ForecastOptions['staticFactors']): Float64Array {
  const { model, encoderWs: e, sampleWs: s, batch } = fc;
  const c = model.config, N = c.nodes, W = N * STATE_SIZE, T = c.observe, F = c.forecast, S = c.staticDims, D = c.dynamicDims;
  const K = observedPoints(c), Kt = totalPoints(c), P = e.pairs.count, Sm = fc.sampleCount, Z = S + D;
  if (win.observe !== T || win.nodeCount !== N || win.rate !== c.rate)
    throw new RangeError(`the window has ${win.observe} observed steps of ${win.nodeCount} nodes at ${win.rate} Hz; the model needs ${T} of ${N} at ${c.rate} Hz`);
  const obs = normalise(model.stats, win.observed, new Float64Array(win.observed.length));
  batch.state.fill(0);
  batch.state.set(obs as never, 0);
  const first = pointOfStep(c, T - 1);
  // Without coupling the decoder reads no factors, so the encoder is not run.
  if (!c.noCoupling) {
    encoderForward(model, e, batch, rng, { sample: false, priorNoise: false });
    if (staticFactors) {
      if (staticFactors.mean.length !== P * S || staticFactors.logVar.length !== P * S) throw new RangeError(`static factors need ${P} pairs × ${S} dimensions`);
      for (let i = 0; i < P * S; i++) { e.muSg[i] = staticFactors.mean[i]!; e.lvSg[i] = staticFactors.logVar[i]!; }
    }
    // Per sample: static sample, last posterior dynamic sample, then the prior rolled forward with noise.
    const A = model.params.priorA.value, cc = model.params.priorC.value, lv = model.params.priorLv.value;
    const dPrev = new Float64Array(D), dCur = new Float64Array(D);
    s.zin.fill(0);
    for (let m = 0; m < Sm; m++)
      for (let k = 0; k < P; k++) {
        const i0 = k * S;
        for (let j = first; j < Kt; j++) {
          if (j < K) {
            const o = ((K - 1) * P + k) * D;
            for (let q = 0; q < D; q++) dCur[q] = j === K - 1 ? e.muD[o + q]! + Math.exp(0.5 * e.lvD[o + q]!) * rng.gauss() : e.muD[(j * P + k) * D + q]!;
          } else {
            for (let q = 0; q < D; q++) {
              let v = cc[q]!;
              for (let r = 0; r < D; r++) v += dPrev[r]! * A[r * D + q]!;
              dCur[q] = v + Math.exp(0.5 * lv[q]!) * rng.gauss();
            }
          }
          const z = ((j * Sm + m) * P + k) * Z;
          for (let q = 0; q < D; q++) s.zin[z + S + q] = dCur[q]!;
          dPrev.set(dCur);
        }
        for (let q = 0; q < S; q++) {
          const v = e.muSg[i0 + q]! + Math.exp(0.5 * e.lvSg[i0 + q]!) * rng.gauss();
          for (let j = first; j < Kt; j++) s.zin[((j * Sm + m) * P + k) * Z + q] = v;
        }
      }
    decoderFactors(model, s, Sm, first);
  }
  const step = Sm * W;
  // The stride prior from the window's causal history (window frame, mirrored like the window), one copy per sample.
  if (fc.prior) {
    const steps = stridePriorSteps(c, model.stats, win.history, win.historySteps, fc.prior.steps, fc.prior.scratch), tiled = fc.prior.tiled;
    for (let f = 0; f < F; f++) for (let m = 0; m < Sm; m++) tiled.set(steps.subarray(f * W, (f + 1) * W) as never, (f * Sm + m) * W);
  }
  for (let m = 0; m < Sm; m++) s.roll.set(obs.subarray((T - 1) * W, T * W) as never, m * W);
  const paths = new Float64Array(Sm * F * W);
  for (let f = 0; f < F; f++) {
    const rc = s.rollout[f]!;
    rc.x = s.roll.subarray(f * step, (f + 1) * step);
    rc.points[0] = pointOfStep(c, T - 1 + f);
    rc.step = fc.prior ? fc.prior.tiled.subarray(f * step, (f + 1) * step) : null;
    decoderForward(model, s, rc, Sm);
    s.roll.set(rc.out.subarray(0, step) as never, (f + 1) * step);
    for (let m = 0; m < Sm; m++) paths.set(rc.out.subarray(m * W, (m + 1) * W) as never, (m * F + f) * W);
  }
  if (fc.readout) fc.readout.used = null;
  if (model.readout) addReadout(fc, win, paths);
  return paths;
}

/** Adds the pair readout's correction of `win` to every path (normalised): positions, and velocities as its backward differences. */
function addReadout(fc: Forecaster, win: Window, paths: Float64Array): void {
  const { model } = fc, c = model.config, N = c.nodes, W = N * STATE_SIZE, F = c.forecast, sd = model.stats.sd;
  // Made here on first use, so a forecaster built before the readout was fitted applies it too.
  fc.readout ??= { scratch: readoutScratch(c), correction: new Float64Array(F * N * 3), used: null };
  const d = readoutCorrection(c, model.readout!, win.history, win.historySteps, fc.readout.scratch, fc.readout.correction);
  if (!d) return;
  fc.readout.used = fc.readout.scratch.robust ? 'jitter-robust' : 'standard';
  for (let f = 0; f < F; f++)
    for (let n = 0; n < N; n++)
      for (let a = 0; a < 3; a++) {
        const p = d[(f * N + n) * 3 + a]!, prev = f > 0 ? d[((f - 1) * N + n) * 3 + a]! : 0;
        const dp = p / sd[n * STATE_SIZE + a]!, dv = ((p - prev) * c.rate) / sd[n * STATE_SIZE + 3 + a]!;
        for (let m = 0; m < fc.sampleCount; m++) {
          const o = (m * F + f) * W + n * STATE_SIZE + a;
          paths[o] = paths[o]! + dp;
          paths[o + 3] = paths[o + 3]! + dv;
        }
      }
}

/** Writes positions (steps × N × 3) of world state (steps × N × 6) into out from `offset`. */
export function positionsOf(state: Float64Array, out: Float64Array, offset: number): void {
  const n = state.length / STATE_SIZE;
  for (let i = 0; i < n; i++) for (let a = 0; a < 3; a++) out[offset + i * 3 + a] = state[i * STATE_SIZE + a]!;
}

/** Returns world state of normalised window state (steps × N × 6), through the window's frame. */
export function toWorld(fc: Forecaster, win: Window, state: Float64Array): Float64Array {
  const out = denormalise(fc.model.stats, state, new Float64Array(state.length));
  return win.toWorld(out, out);
}

/** Returns the forecast of the model's forecast steps after `win` (only its observed part is read). */
export function forecast(model: CouplingModel, win: Window, options: ForecastOptions = {}, forecaster?: Forecaster): ForecastResult {
  const fc = forecaster ?? createForecaster(model, options.samples ?? 20);
  if (fc.model !== model) throw new RangeError('the forecaster belongs to another model');
  const rng = new Pcg32(options.seed ?? 1, 0x666f7265);
  const c = model.config, N = c.nodes, W = N * STATE_SIZE, F = c.forecast, Sm = fc.sampleCount;
  const paths = decodePaths(fc, win, rng, options.staticFactors);
  // The noise SD: the learned per-step SD times the calibrated scale and this window's backcast factor.
  const lv = model.params.lvRollout.value;
  const k = model.spreadScale * (model.spreadAdapt ? spreadFactor(model.spreadAdapt, backcastError(c, win.history, win.historySteps, fc.backcast)) : 1);
  const meanNorm = new Float64Array(F * W), one = new Float64Array(F * W);
  const samples = new Float64Array(Sm * F * N * 3);
  for (let m = 0; m < Sm; m++) {
    for (let i = 0; i < F * W; i++) {
      const v = paths[m * F * W + i]!;
      meanNorm[i] = meanNorm[i]! + v / Sm;
      one[i] = v + k * Math.exp(0.5 * lv[i]!) * rng.gauss();
    }
    positionsOf(toWorld(fc, win, one), samples, m * F * N * 3);
  }
  const meanState = toWorld(fc, win, meanNorm);
  const mean = new Float64Array(F * N * 3);
  positionsOf(meanState, mean, 0);
  return { steps: F, nodeCount: N, sampleCount: Sm, mean, samples, meanState, readout: fc.readout?.used ?? null, captureJitter: fc.readout?.used ? fc.readout.scratch.jitter : null };
}
