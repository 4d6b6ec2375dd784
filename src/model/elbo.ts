// The training objective: the negative evidence lower bound of a batch, per window,
//   loss = recon + rolloutWeight · rollout + β_s · KL static + β · KL dynamic + labelWeight · label
//          + signatureWeight · signature
// recon    one-step teacher-forced Gaussian NLL of the last `reconSteps` observed transitions (learned
//          per-feature noise);
// rollout  Gaussian NLL of the forecast steps decoded from the last observed state with the decoder's own
//          predictions fed back (backpropagated through the whole rollout), the dynamic factors rolled
//          forward with the prior mean (learned noise per forecast step and feature); with the stride prior
//          each rollout step adds the batch's fixed prior step (a constant: the gradient paths are unchanged),
//          and each teacher-forced transition the baseline's one-step change from the steps up to it;
// KL       (not with noCoupling, which runs no encoder) static factors against N(0, 1), the first dynamic point against N(0, 1) and every later one
//          against the learned autoregressive prior given the previous sample; reported per dimension;
// label    restricted labeling: squared distance of dynamic dimensions 0 and 1's posterior means (averaged
//          over pairs) from sin and cos of the gait phase, where the phase is known;
// signature squared distance of the static sample's linear read s_ij·sigW + sigB (averaged over pairs) from
//          the pair's standardised take signature (signature.ts), where the batch carries one.
// elboForward computes the loss; elboBackward (after it) accumulates the gradient of the loss into the
// store's gradient buffer.
import { STATE_SIZE } from '../motion/reflect.js';
import { gaussianNll, gaussianNllBackward, klGaussians, klGaussiansBackward, klStdNormal, klStdNormalBackward } from '../nn/gaussian.js';
import type { Pcg32 } from '../nn/prng.js';
import { observedPoints, pointOfStep, totalPoints } from './config.js';
import { decoderBackward, decoderFactors, decoderFactorsBackward, decoderForward } from './decoder.js';
import { encoderBackward, encoderForward, type Batch } from './encoder.js';
import type { CouplingModel } from './model.js';
import { SIGNATURE_FEATURES } from './signature.js';
import type { Workspace } from './workspace.js';

/** The terms of the loss, each per window (summed over steps, nodes and dimensions). */
export interface LossReport {
  total: number;
  recon: number;
  rollout: number;
  klStatic: number;
  klDynamic: number;
  label: number;
  signature: number;
  /** KL per factor dimension, per window. */
  klStaticPerDim: number[];
  klDynamicPerDim: number[];
}

/** Returns the loss of a batch after running the model forward; `sample` false uses posterior means (evaluation). */
export function elboForward(model: CouplingModel, ws: Workspace, batch: Batch, rng: Pcg32, sample = true): LossReport {
  const c = model.config, B = batch.size, N = c.nodes, T = c.observe, F = c.forecast, R = c.reconSteps;
  const S = c.staticDims, D = c.dynamicDims, K = observedPoints(c), P = ws.pairs.count, BP = B * P;
  const BN = B * N, W = N * STATE_SIZE, step = BN * STATE_SIZE;
  // Without coupling nothing reads the factors, so the encoder is not run (its KL would only add noise).
  const coupled = !c.noCoupling;
  if (coupled) encoderForward(model, ws, batch, rng, { sample, priorNoise: false });
  // Teacher-forced transitions t → t + 1 for t = T − 1 − R … T − 2.
  const t0 = T - 1 - R, tc = ws.teacher;
  decoderFactors(model, ws, B, pointOfStep(c, t0));
  tc.x = batch.state.subarray(t0 * step, (t0 + R) * step);
  const prior = c.stridePrior ? batch.prior : null, priorRecon = c.stridePrior ? batch.priorRecon : null;
  if (c.stridePrior && (!prior || prior.length < F * step || !priorRecon || priorRecon.length < R * step))
    throw new RangeError('the stride prior is on but the batch carries no prior steps');
  tc.step = priorRecon ? priorRecon.subarray(0, R * step) : null;
  for (let q = 0; q < R; q++) tc.points[q] = pointOfStep(c, t0 + q);
  decoderForward(model, ws, tc, B);
  const inv = 1 / B;
  const recon = gaussianNll(batch.state.subarray((t0 + 1) * step, (t0 + 1 + R) * step), tc.out, model.params.lvRecon.value, R * B, W, true, null) * inv;
  // Rollout from the last observed state.
  ws.roll.set(batch.state.subarray((T - 1) * step, T * step) as never, 0);
  let rollout = 0;
  for (let f = 0; f < F; f++) {
    const rc = ws.rollout[f]!;
    rc.x = ws.roll.subarray(f * step, (f + 1) * step);
    rc.step = prior ? prior.subarray(f * step, (f + 1) * step) : null;
    rc.points[0] = pointOfStep(c, T - 1 + f);
    decoderForward(model, ws, rc, B);
    ws.roll.set(rc.out.subarray(0, step) as never, (f + 1) * step);
    rollout += gaussianNll(batch.state.subarray((T + f) * step, (T + f + 1) * step), rc.out, model.params.lvRollout.value.subarray(f * W, (f + 1) * W), B, W, true, null);
  }
  rollout *= inv;
  // KL terms per dimension.
  ws.perDimStatic.fill(0);
  ws.perDimDynamic.fill(0);
  const klS = coupled ? klStdNormal(ws.muSg, ws.lvSg, BP, S, ws.perDimStatic) * inv : 0;
  let klD = coupled ? klStdNormal(ws.muD, ws.lvD, BP, D, ws.perDimDynamic) : 0;
  if (coupled && K > 1) {
    const blk = BP * D;
    klD += klGaussians(ws.muD.subarray(blk), ws.lvD.subarray(blk), ws.muP.subarray(blk), ws.lvP.subarray(blk), (K - 1) * BP, D, ws.perDimDynamic);
  }
  klD *= inv;
  const label = coupled && c.restrictedLabeling ? labelLoss(model, ws, batch, null) * inv : 0;
  const signature = signatureActive(model, batch) ? signatureLoss(model, ws, batch, null) * inv : 0;
  const total = recon + c.rolloutWeight * rollout + c.staticBeta * klS + c.beta * klD + c.labelWeight * label + c.signatureWeight * signature;
  return {
    total, recon, rollout, klStatic: klS, klDynamic: klD, label, signature,
    klStaticPerDim: Array.from(ws.perDimStatic, (v) => v * inv),
    klDynamicPerDim: Array.from(ws.perDimDynamic, (v) => v * inv),
  };
}

/**
 * Returns Σ over windows, labelled points and pairs of ((μ0 − sin φ)² + (μ1 − cos φ)²) / P. With `scale`
 * non-null, adds scale times its gradient into ws.dmuD instead of only computing it.
 */
function labelLoss(model: CouplingModel, ws: Workspace, batch: Batch, scale: number | null): number {
  const c = model.config, B = batch.size, D = c.dynamicDims, K = observedPoints(c), P = ws.pairs.count;
  let total = 0;
  for (let j = 0; j < K; j++)
    for (let b = 0; b < B; b++) {
      const phi = batch.phase[b * K + j]!;
      if (!Number.isFinite(phi)) continue;
      const sn = Math.sin(phi), cs = Math.cos(phi), base = (j * B + b) * P;
      for (let k = 0; k < P; k++) {
        const o = (base + k) * D, e0 = ws.muD[o]! - sn, e1 = ws.muD[o + 1]! - cs;
        total += (e0 * e0 + e1 * e1) / P;
        if (scale !== null) {
          ws.dmuD[o] = ws.dmuD[o]! + (scale * 2 * e0) / P;
          ws.dmuD[o + 1] = ws.dmuD[o + 1]! + (scale * 2 * e1) / P;
        }
      }
    }
  return total;
}

/** Whether the signature term runs on this batch: switched on, coupled, and the batch carries signatures. */
function signatureActive(model: CouplingModel, batch: Batch): boolean {
  return model.config.signatureWeight > 0 && model.params.sigW !== null && batch.signature !== undefined;
}

/**
 * Returns Σ over windows, pairs and features of (s_bk·sigW + sigB − y_bk)² / P for the windows with a
 * signature. With `scale` non-null, writes scale times its gradient on the static samples into ws.dsSig and
 * adds it on sigW and sigB.
 */
function signatureLoss(model: CouplingModel, ws: Workspace, batch: Batch, scale: number | null): number {
  const c = model.config, B = batch.size, S = c.staticDims, G = SIGNATURE_FEATURES, P = ws.pairs.count;
  const w = model.params.sigW!.value, bias = model.params.sigB!.value, y = batch.signature!;
  const gw = model.params.sigW!.grad, gb = model.params.sigB!.grad;
  if (scale !== null) ws.dsSig.fill(0, 0, B * P * S);
  const e = new Float64Array(G);
  let total = 0;
  for (let b = 0; b < B; b++) {
    if (!Number.isFinite(y[b * P * G]!)) continue;
    for (let k = 0; k < P; k++) {
      const r = b * P + k, sv = r * S, yo = r * G;
      for (let g = 0; g < G; g++) {
        let v = bias[g]!;
        for (let d = 0; d < S; d++) v += ws.sS[sv + d]! * w[d * G + g]!;
        e[g] = v - y[yo + g]!;
        total += (e[g]! * e[g]!) / P;
      }
      if (scale === null) continue;
      const f = (2 * scale) / P;
      for (let g = 0; g < G; g++) gb[g] = gb[g]! + f * e[g]!;
      for (let d = 0; d < S; d++) {
        const sd = ws.sS[sv + d]!;
        let acc = 0;
        for (let g = 0; g < G; g++) {
          gw[d * G + g] = gw[d * G + g]! + f * e[g]! * sd;
          acc += w[d * G + g]! * e[g]!;
        }
        ws.dsSig[sv + d] = f * acc;
      }
    }
  }
  return total;
}

/** Accumulates into the store's gradients the gradient of the loss of the latest elboForward on this batch. */
export function elboBackward(model: CouplingModel, ws: Workspace, batch: Batch): void {
  const c = model.config, p = model.params, B = batch.size, N = c.nodes, T = c.observe, F = c.forecast, R = c.reconSteps;
  const S = c.staticDims, D = c.dynamicDims, K = observedPoints(c), Kt = totalPoints(c), P = ws.pairs.count, BP = B * P;
  const BN = B * N, W = N * STATE_SIZE, step = BN * STATE_SIZE, inv = 1 / B;
  const M = c.messageHidden;
  ws.dzp.fill(0, 0, c.noCoupling ? 0 : Kt * BP * M);
  ws.dgate.fill(0, 0, Kt * BP);
  // Rollout, last step first; ws.dX carries the gradient on the state fed into step f.
  const dX = ws.dX, dOut = ws.dOut;
  dX.fill(0, 0, step);
  const rw = c.rolloutWeight * inv;
  for (let f = F - 1; f >= 0; f--) {
    const rc = ws.rollout[f]!;
    for (let i = 0; i < step; i++) dOut[i] = dX[i]!;
    const target = batch.state.subarray((T + f) * step, (T + f + 1) * step);
    gaussianNllBackward(target, rc.out, p.lvRollout.value.subarray(f * W, (f + 1) * W), B, W, true, rw, dOut, p.lvRollout.grad.subarray(f * W, (f + 1) * W), null);
    dX.fill(0, 0, step);
    decoderBackward(model, ws, rc, B, dOut, f > 0 ? dX : null);
  }
  // Teacher-forced transitions.
  const t0 = T - 1 - R, tc = ws.teacher;
  dOut.fill(0, 0, R * step);
  gaussianNllBackward(batch.state.subarray((t0 + 1) * step, (t0 + 1 + R) * step), tc.out, p.lvRecon.value, R * B, W, true, inv, dOut, p.lvRecon.grad, null);
  decoderBackward(model, ws, tc, B, dOut, null);
  if (c.noCoupling) return;
  decoderFactorsBackward(model, ws, B, pointOfStep(c, t0));
  // KL and labeling gradients on the posteriors and the prior.
  const kb = c.beta * inv, blk = BP * D;
  ws.dmuSg.fill(0, 0, BP * S);
  ws.dlvSg.fill(0, 0, BP * S);
  klStdNormalBackward(ws.muSg, ws.lvSg, BP * S, c.staticBeta * inv, ws.dmuSg, ws.dlvSg);
  ws.dmuD.fill(0, 0, K * blk);
  ws.dlvD.fill(0, 0, K * blk);
  ws.dmuP.fill(0, 0, K * blk);
  ws.dlvP.fill(0, 0, K * blk);
  klStdNormalBackward(ws.muD, ws.lvD, blk, kb, ws.dmuD, ws.dlvD);
  if (K > 1)
    klGaussiansBackward(ws.muD.subarray(blk), ws.lvD.subarray(blk), ws.muP.subarray(blk), ws.lvP.subarray(blk), (K - 1) * blk, kb,
      ws.dmuD.subarray(blk), ws.dlvD.subarray(blk), ws.dmuP.subarray(blk), ws.dlvP.subarray(blk));
  if (c.restrictedLabeling) labelLoss(model, ws, batch, c.labelWeight * inv);
  const signed = signatureActive(model, batch);
  if (signed) signatureLoss(model, ws, batch, c.signatureWeight * inv);
  encoderBackward(model, ws, batch, signed ? ws.dsSig : null);
}
