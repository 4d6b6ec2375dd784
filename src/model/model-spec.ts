// A model as plain data a worker thread can be sent (structured clone): configuration, statistics,
// weights and readout. Rebuilt on the other side it is the same model bit for bit (its spread is not
// carried: the workers that read a spec calibrate their own or need none).
import type { MotionStats } from '../motion/normalise.js';
import type { ModelConfig } from './config.js';
import { createModel, type CouplingModel } from './model.js';
import type { PairReadout } from './readout.js';

/** What a worker thread needs to rebuild a model. */
export interface ModelSpec {
  config: ModelConfig;
  stats: MotionStats;
  weights: Float32Array;
  /** Its readout as it stands (kept when a post-fit does not refit it, so the spread is calibrated with it). */
  readout: PairReadout | null;
}

/** Returns the model as a spec (the weights copied). */
export function modelSpec(model: CouplingModel): ModelSpec {
  return { config: model.config, stats: model.stats, weights: Float32Array.from(model.store.valueView()), readout: model.readout };
}

/** Returns the model a spec describes. */
export function modelFromSpec(spec: ModelSpec): CouplingModel {
  const model = createModel(spec.config, spec.stats, { seed: 1 });
  model.store.valueView().set(spec.weights);
  model.readout = spec.readout;
  return model;
}
