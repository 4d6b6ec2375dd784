// Data-driven starting values of the learned noise levels: the log of the mean squared error that the
// freshly initialised decoder (the stride-mean forecast with the stride prior, about constant velocity with the kinematic step) makes on
// some training windows, per feature for the one-step reconstruction and per forecast step and feature
// for the rollout. Starting the Gaussian likelihood at the scale of the errors it will see keeps its
// gradient on the predicted means at full strength from the first step; a unit variance start leaves the
// means weakly driven while the log-variances crawl down at the optimiser's pace.
import { STATE_SIZE } from '../motion/reflect.js';
import { Pcg32 } from '../nn/prng.js';
import type { Batch } from './encoder.js';
import { elboForward } from './elbo.js';
import type { CouplingModel } from './model.js';
import type { Workspace } from './workspace.js';

/** Clamps the noise log-variances at the configuration's floor (after every optimiser step); returns the model. */
export function clampNoise(model: CouplingModel): CouplingModel {
  const lo = Math.log(model.config.noiseFloor);
  for (const p of [model.params.lvRecon.value, model.params.lvRollout.value]) for (let i = 0; i < p.length; i++) if (p[i]! < lo) p[i] = lo;
  return model;
}

/** Sets the model's noise log-variances from the errors of the current decoder on the batches; returns the model. */
export function initNoiseFromData(model: CouplingModel, ws: Workspace, batches: Iterable<Batch>): CouplingModel {
  const c = model.config, W = c.nodes * STATE_SIZE, T = c.observe, F = c.forecast, R = c.reconSteps;
  const recon = new Float64Array(W), roll = new Float64Array(F * W);
  let nRecon = 0, nRoll = 0;
  const rng = new Pcg32(1, 0x6e6f);
  for (const batch of batches) {
    const B = batch.size, step = B * W;
    elboForward(model, ws, batch, rng, false);
    const t0 = T - 1 - R, out = ws.teacher.out;
    for (let q = 0; q < R; q++)
      for (let b = 0; b < B; b++)
        for (let i = 0; i < W; i++) {
          const e = out[q * step + b * W + i]! - batch.state[(t0 + 1 + q) * step + b * W + i]!;
          recon[i] = recon[i]! + e * e;
        }
    nRecon += R * B;
    for (let f = 0; f < F; f++) {
      const o = ws.rollout[f]!.out;
      for (let b = 0; b < B; b++)
        for (let i = 0; i < W; i++) {
          const e = o[b * W + i]! - batch.state[(T + f) * step + b * W + i]!;
          roll[f * W + i] = roll[f * W + i]! + e * e;
        }
    }
    nRoll += B;
  }
  if (nRecon === 0) return model;
  const lr = model.params.lvRecon.value, lo = model.params.lvRollout.value;
  for (let i = 0; i < W; i++) lr[i] = Math.log(recon[i]! / nRecon + 1e-12);
  for (let i = 0; i < F * W; i++) lo[i] = Math.log(roll[i]! / nRoll + 1e-12);
  return clampNoise(model);
}
