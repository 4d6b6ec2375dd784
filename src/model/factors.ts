// The posterior factors of one window, for the analysis layer: per ordered pair the static factors'
// posterior mean and SD, and per dynamic point the dynamic factors' posterior mean and SD, with the
// observed step each point was read at. Only the observed part of the window is read.
import { allOrderedPairs, type PairList } from '../nn/pairs.js';
import { normalise } from '../motion/normalise.js';
import type { Window } from '../motion/window.js';
import { Pcg32 } from '../nn/prng.js';
import { observedPoints, pointStep } from './config.js';
import { encoderForward, type Batch } from './encoder.js';
import type { CouplingModel } from './model.js';
import { createWorkspace, type Workspace } from './workspace.js';

/** The factors of one window; pair k is senders[k] → receivers[k] in node indices (allOrderedPairs order). */
export interface WindowFactors {
  pairs: PairList;
  staticDims: number;
  dynamicDims: number;
  /** Pairs × S. */
  staticMean: Float64Array;
  staticSd: Float64Array;
  /** Points × pairs × D. */
  dynamicMean: Float64Array;
  dynamicSd: Float64Array;
  /** Observed step (0-based within the window) each dynamic point was read at. */
  pointSteps: number[];
}

/** Reusable buffers of factor read-outs for one model. */
export interface FactorReader {
  model: CouplingModel;
  ws: Workspace;
  batch: Batch;
}

/** Returns a reader (work buffers) for windowFactors. */
export function createFactorReader(model: CouplingModel): FactorReader {
  const c = model.config;
  if (c.noCoupling) throw new RangeError('a model without coupling has no pair factors');
  const batch: Batch = {
    size: 1, state: model.store.alloc((c.observe + c.forecast) * c.nodes * 6), group: new Int32Array(1),
    phase: new Float64Array(observedPoints(c)).fill(NaN),
  };
  return { model, ws: createWorkspace(model, 1), batch };
}

/** Returns the posterior factors of a window (means and SDs; no sampling). */
export function windowFactors(model: CouplingModel, win: Window, reader?: FactorReader): WindowFactors {
  const r = reader ?? createFactorReader(model);
  const c = model.config, T = c.observe, W = c.nodes * 6;
  if (win.observe !== T || win.nodeCount !== c.nodes) throw new RangeError(`the window has ${win.observe} observed steps of ${win.nodeCount} nodes; the model needs ${T} of ${c.nodes}`);
  r.batch.state.fill(0);
  r.batch.state.set(normalise(model.stats, win.observed, new Float64Array(T * W)) as never, 0);
  encoderForward(model, r.ws, r.batch, new Pcg32(1, 0), { sample: false, priorNoise: false });
  const P = r.ws.pairs.count, S = c.staticDims, D = c.dynamicDims, K = observedPoints(c);
  const sd = (lv: ArrayLike<number>, n: number) => Float64Array.from({ length: n }, (_, i) => Math.exp(0.5 * lv[i]!));
  return {
    pairs: allOrderedPairs(c.nodes), staticDims: S, dynamicDims: D,
    staticMean: Float64Array.from(r.ws.muSg.subarray(0, P * S)), staticSd: sd(r.ws.lvSg, P * S),
    dynamicMean: Float64Array.from(r.ws.muD.subarray(0, K * P * D)), dynamicSd: sd(r.ws.lvD, K * P * D),
    pointSteps: Array.from({ length: K }, (_, j) => pointStep(c, j)),
  };
}
