// The decoder: one Markov message-passing step, x(t) → x(t + 1), for every node of a stack of windows.
//   message  m_ij = σ([s, d]_ij·wg + bg) · ss(x_i·Wa + x_j·Wb + [s, d]_ij·Wz + bz)
//   update   Δx_j = ρ·(ss(x_j·W1x + (Σ_i m_ij)·W1m + nodeBias_j + b1)·W2 + b2),   x_j(t + 1) = x_j(t) + Δx_j + k(x_j)
// where k is the fixed kinematic step (positions advanced by velocity / rate, model.ts) when switched on,
// or, when the pass carries a fixed step (cache.step: the stride prior's change of state, model.ts), that
// step instead; it does not depend on x, so it adds nothing to the backward pass.
// The first message layer is split per node (x·Wa, x·Wb once per node) and per pair only its factor part
// ([s, d]·Wz, computed once per dynamic point in decoderFactors); the layer after the sum is W1m, applied
// once per node; ss is softsign (softsign.ts); ρ is the configuration's fixed residualScale. With noCoupling there are no messages at all: the update sees only its own node.
import { STATE_SIZE } from '../motion/reflect.js';
import { sigmoid } from '../nn/activations.js';
import { linearBackward, linearForward } from '../nn/linear.js';
import type { Buf } from '../nn/types.js';
import { totalPoints } from './config.js';
import type { CouplingModel } from './model.js';
import { softsign, softsignBackward } from './softsign.js';
import type { DecoderCache, Workspace } from './workspace.js';

/**
 * Fills ws.zp = [s, d]·Wz + bz and ws.gate = σ([s, d]·wg + bg) for every pair of dynamic points `from` …
 * Kt − 1 (the earlier points drive no decoded transition); a no-op without coupling.
 */
export function decoderFactors(model: CouplingModel, ws: Workspace, B: number, from: number): void {
  const p = model.params, c = model.config;
  if (!p.msgWz || !p.gateW) return;
  const P = ws.pairs.count, Z = c.staticDims + c.dynamicDims, M = c.messageHidden;
  const r0 = from * B * P, rows = totalPoints(c) * B * P - r0;
  linearForward(ws.zin.subarray(r0 * Z), p.msgWz.value, p.msgBz!.value, ws.zp.subarray(r0 * M), rows, Z, M);
  const gate = ws.gate.subarray(r0);
  linearForward(ws.zin.subarray(r0 * Z), p.gateW.value, p.gateB!.value, gate, rows, Z, 1);
  for (let i = 0; i < rows; i++) gate[i] = sigmoid(gate[i]!);
}

/**
 * Backward of decoderFactors from the same `from`: turns ws.dzp and ws.dgate (gradient on the gate's
 * output) into ws.dzin (zero for the points before `from`) and the weight gradients.
 */
export function decoderFactorsBackward(model: CouplingModel, ws: Workspace, B: number, from: number): void {
  const p = model.params, c = model.config;
  const P = ws.pairs.count, Z = c.staticDims + c.dynamicDims, M = c.messageHidden;
  const all = totalPoints(c) * B * P, r0 = from * B * P, rows = all - r0;
  if (!p.msgWz || !p.gateW) {
    ws.dzin.fill(0, 0, all * Z);
    return;
  }
  ws.dzin.fill(0, 0, r0 * Z);
  const gate = ws.gate.subarray(r0), dgate = ws.dgate.subarray(r0), zin = ws.zin.subarray(r0 * Z), dzin = ws.dzin.subarray(r0 * Z);
  for (let i = 0; i < rows; i++) {
    const g = gate[i]!;
    dgate[i] = dgate[i]! * g * (1 - g);
  }
  linearBackward(zin, p.gateW.value, dgate, dzin, p.gateW.grad, p.gateB!.grad, rows, Z, 1, false);
  linearBackward(zin, p.msgWz.value, ws.dzp.subarray(r0 * M), dzin, p.msgWz.grad, p.msgBz!.grad, rows, Z, M, true);
}

/** Returns cache.out after one decoder step on cache.x (cache.blocks × B windows), with block q reading dynamic point cache.points[q]. */
export function decoderForward(model: CouplingModel, ws: Workspace, cache: DecoderCache, B: number): Buf {
  const p = model.params, c = model.config, N = c.nodes, U = c.updateHidden, M = c.messageHidden;
  const rows = cache.blocks * B * N, x = cache.x, h1 = cache.h1;
  linearForward(x, p.upW1x.value, p.upB1.value, h1, rows, STATE_SIZE, U);
  const nb = p.upNode.value;
  for (let r = 0; r < rows; r++) {
    const o = r * U, n = (r % N) * U;
    for (let j = 0; j < U; j++) h1[o + j] = h1[o + j]! + nb[n + j]!;
  }
  if (p.msgWa && p.msgWb && p.upW1m) {
    linearForward(x, p.msgWa.value, null, cache.a, rows, STATE_SIZE, M);
    linearForward(x, p.msgWb.value, null, cache.b, rows, STATE_SIZE, M);
    pairMessages(ws, cache, B, N, M);
    linearForward(cache.agg, p.upW1m.value, null, h1, rows, M, U, true);
  }
  softsign(h1, h1, rows * U);
  linearForward(h1, p.upW2.value, p.upB2.value, cache.out, rows, U, STATE_SIZE);
  const out = cache.out, rho = c.residualScale;
  for (let i = 0; i < rows * STATE_SIZE; i++) out[i] = rho * out[i]! + x[i]!;
  const kin = model.kinematic, fixed = cache.step;
  if (fixed) for (let i = 0; i < rows * STATE_SIZE; i++) out[i] = out[i]! + fixed[i]!;
  else if (kin) {
    const { gain, bias } = kin;
    for (let r = 0; r < rows; r++) {
      const o = r * STATE_SIZE, n = (r % N) * 3;
      for (let a = 0; a < 3; a++) out[o + a] = out[o + a]! + gain[n + a]! * x[o + 3 + a]! + bias[n + a]!;
    }
  }
  return out;
}

/** Writes cache.u (softsign of each pair's pre-activation; skipped when cache.keep is false) and cache.agg (gated messages summed at each receiver). */
function pairMessages(ws: Workspace, cache: DecoderCache, B: number, N: number, M: number): void {
  const { senders, receivers, count: P } = ws.pairs;
  const { a, b, u, agg } = cache, zp = ws.zp, gate = ws.gate, keep = cache.keep;
  agg.fill(0, 0, cache.blocks * B * N * M);
  for (let q = 0; q < cache.blocks; q++) {
    const point = cache.points[q]!;
    for (let w = 0; w < B; w++) {
      const base = (q * B + w) * N, zBase = (point * B + w) * P, uBase = (q * B + w) * P;
      for (let k = 0; k < P; k++) {
        const s = (base + senders[k]!) * M, r = (base + receivers[k]!) * M, z = (zBase + k) * M, o = (uBase + k) * M;
        const g = gate[zBase + k]!;
        // Math.abs rather than a sign test: the sign is unpredictable, a branch would mispredict.
        if (keep)
          for (let j = 0; j < M; j++) {
            const pre = a[s + j]! + b[r + j]! + zp[z + j]!;
            const v = pre / (1 + Math.abs(pre));
            u[o + j] = v;
            agg[r + j] = agg[r + j]! + g * v;
          }
        else
          for (let j = 0; j < M; j++) {
            const pre = a[s + j]! + b[r + j]! + zp[z + j]!;
            agg[r + j] = agg[r + j]! + (g * pre) / (1 + Math.abs(pre));
          }
      }
    }
  }
}

/**
 * Backward of decoderForward for dOut (gradient on cache.out; consumed: it is scaled in place by the
 * residual scale). Accumulates the decoder weight gradients, ws.dzp and ws.dgate; dx (may be null) +=
 * gradient on cache.x.
 */
export function decoderBackward(model: CouplingModel, ws: Workspace, cache: DecoderCache, B: number, dOut: Buf, dx: Buf | null): void {
  if (!cache.keep) throw new Error('decoder cache was run without keeping its messages');
  const p = model.params, c = model.config, N = c.nodes, U = c.updateHidden, M = c.messageHidden;
  const rows = cache.blocks * B * N, h1 = cache.h1, dH1 = ws.dH1;
  if (dx) {
    for (let i = 0; i < rows * STATE_SIZE; i++) dx[i] = dx[i]! + dOut[i]!;
    const kin = model.kinematic;
    if (kin && !cache.step)
      for (let r = 0; r < rows; r++) {
        const o = r * STATE_SIZE, n = (r % N) * 3;
        for (let a = 0; a < 3; a++) dx[o + 3 + a] = dx[o + 3 + a]! + kin.gain[n + a]! * dOut[o + a]!;
      }
  }
  const rho = c.residualScale;
  if (rho !== 1) for (let i = 0; i < rows * STATE_SIZE; i++) dOut[i] = rho * dOut[i]!;
  linearBackward(h1, p.upW2.value, dOut, dH1, p.upW2.grad, p.upB2.grad, rows, U, STATE_SIZE, false);
  softsignBackward(h1, dH1, dH1, rows * U);
  const gn = p.upNode.grad;
  for (let r = 0; r < rows; r++) {
    const o = r * U, n = (r % N) * U;
    for (let j = 0; j < U; j++) gn[n + j] = gn[n + j]! + dH1[o + j]!;
  }
  linearBackward(cache.x, p.upW1x.value, dH1, dx, p.upW1x.grad, p.upB1.grad, rows, STATE_SIZE, U, true);
  if (p.msgWa && p.msgWb && p.upW1m) {
    linearBackward(cache.agg, p.upW1m.value, dH1, ws.dAgg, p.upW1m.grad, null, rows, M, U, false);
    ws.dA.fill(0, 0, rows * M);
    ws.dB.fill(0, 0, rows * M);
    pairMessagesBackward(ws, cache, B, N, M);
    linearBackward(cache.x, p.msgWa.value, ws.dA, dx, p.msgWa.grad, null, rows, STATE_SIZE, M, true);
    linearBackward(cache.x, p.msgWb.value, ws.dB, dx, p.msgWb.grad, null, rows, STATE_SIZE, M, true);
  }
}

/** Backward of pairMessages: from ws.dAgg into ws.dA, ws.dB, ws.dzp and ws.dgate. */
function pairMessagesBackward(ws: Workspace, cache: DecoderCache, B: number, N: number, M: number): void {
  const { senders, receivers, count: P } = ws.pairs;
  const { u } = cache, gate = ws.gate, dAgg = ws.dAgg, dA = ws.dA, dB = ws.dB, dzp = ws.dzp, dgate = ws.dgate;
  for (let q = 0; q < cache.blocks; q++) {
    const point = cache.points[q]!;
    for (let w = 0; w < B; w++) {
      const base = (q * B + w) * N, zBase = (point * B + w) * P, uBase = (q * B + w) * P;
      for (let k = 0; k < P; k++) {
        const s = (base + senders[k]!) * M, r = (base + receivers[k]!) * M, z = (zBase + k) * M, o = (uBase + k) * M;
        const g = gate[zBase + k]!;
        let dg = 0;
        for (let j = 0; j < M; j++) {
          const v = u[o + j]!, d = dAgg[r + j]!;
          dg += d * v;
          const av = 1 - Math.abs(v);
          const dp = d * g * av * av;
          dA[s + j] = dA[s + j]! + dp;
          dB[r + j] = dB[r + j]! + dp;
          dzp[z + j] = dzp[z + j]! + dp;
        }
        dgate[zBase + k] = dgate[zBase + k]! + dg;
      }
    }
  }
}
