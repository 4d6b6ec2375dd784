// Shared helpers of the coupling-model tests: a tiny configuration, identity statistics and random batches.
import type { MotionStats } from '../../src/motion/normalise.js';
import type { ModelConfig } from '../../src/model/config.js';
import { observedPoints } from '../../src/model/config.js';
import type { Batch } from '../../src/model/encoder.js';
import { SIGNATURE_FEATURES } from '../../src/model/signature.js';
import { Pcg32 } from '../../src/nn/prng.js';
import type { Buf } from '../../src/nn/types.js';

/** A configuration small enough for finite differences over every weight (3 nodes, 4 observed steps). */
export const TINY: Partial<ModelConfig> = {
  nodes: 3, observe: 4, forecast: 3, hidden: 3, pairHidden: 3, staticDims: 2, dynamicDims: 2, dynamicStride: 2,
  messageHidden: 3, updateHidden: 4, reconSteps: 2, rate: 2,
};

/** Returns statistics that leave the state unchanged (mean 0, SD 1) for `nodes` nodes. */
export function identityStats(nodes: number): MotionStats {
  return { nodes: Array.from({ length: nodes }, (_, i) => `n${i}`), count: 1, mean: new Float64Array(nodes * 6), sd: new Float64Array(nodes * 6).fill(1) };
}

/** Returns a batch of `size` windows of smooth random state for a configuration, in the precision of `like`. */
export function randomBatch(c: ModelConfig, size: number, like: Buf, seed: number, groups?: number[]): Batch {
  const rng = new Pcg32(seed, 7);
  const steps = c.observe + c.forecast, W = c.nodes * 6;
  const state = like instanceof Float64Array ? new Float64Array(steps * size * W) : new Float32Array(steps * size * W);
  for (let b = 0; b < size; b++)
    for (let i = 0; i < W; i++) {
      const a = rng.gauss(), w = 0.3 + rng.next(), ph = 6 * rng.next();
      for (let t = 0; t < steps; t++) state[(t * size + b) * W + i] = a * Math.sin(w * t + ph);
    }
  const K = observedPoints(c);
  const phase = new Float64Array(size * K);
  for (let i = 0; i < phase.length; i++) phase[i] = i % 3 === 2 ? NaN : 6 * rng.next();
  const batch: Batch = { size, state, group: Int32Array.from(groups ?? Array.from({ length: size }, (_, i) => i)), phase };
  if (c.stridePrior) {
    // Fixed prior steps of the stride prior: any values will do for a gradient check (they are constants).
    const prior = like instanceof Float64Array ? new Float64Array(c.forecast * size * W) : new Float32Array(c.forecast * size * W);
    for (let i = 0; i < prior.length; i++) prior[i] = 0.2 * rng.gauss();
    batch.prior = prior;
    const recon = like instanceof Float64Array ? new Float64Array(c.reconSteps * size * W) : new Float32Array(c.reconSteps * size * W);
    for (let i = 0; i < recon.length; i++) recon[i] = 0.2 * rng.gauss();
    batch.priorRecon = recon;
  }
  if (c.signatureWeight > 0 && !c.noCoupling) {
    // Standardised take signatures; the last of three or more windows has none (its term is skipped).
    const per = c.nodes * (c.nodes - 1) * SIGNATURE_FEATURES;
    batch.signature = new Float64Array(size * per);
    for (let i = 0; i < batch.signature.length; i++) batch.signature[i] = size > 2 && i >= (size - 1) * per ? NaN : rng.gauss();
  }
  return batch;
}
