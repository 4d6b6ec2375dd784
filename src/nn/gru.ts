// A gated recurrent unit (Cho et al. 2014) in the "reset after" form (the reset gate scales the recurrent
// projection, as in cuDNN and Keras reset_after=true), run over a sequence with backpropagation through time:
//   z = σ(x·Wz + bz + h·Uz + cz)        update gate
//   r = σ(x·Wr + br + h·Ur + cr)        reset gate
//   n = tanh(x·Wn + bn + r ⊙ (h·Un + cn))
//   h' = (1 − z) ⊙ n + z ⊙ h
// Gate blocks sit side by side in the weights: Wx [in×3H] and Uh [H×3H] as [z | r | n], biases bx, bh [3H].
// The input projections of all steps are one matrix product before the loop (and one after, in backward).
import { sigmoid, tanh } from './activations.js';
import { linearBackward, linearForward } from './linear.js';
import { addColumnSums, matmulABt, matmulAtB } from './matmul.js';
import type { Param, ParamStore } from './params.js';
import type { Pcg32 } from './prng.js';
import type { Buf } from './types.js';

/** The four tensors of a GRU. */
export interface GruParams {
  readonly inDim: number;
  readonly hidden: number;
  readonly wx: Param;
  readonly bx: Param;
  readonly uh: Param;
  readonly bh: Param;
}

/** Everything a forward pass over `steps` steps keeps for the backward pass, plus scratch. */
export interface GruCache {
  readonly rows: number;
  readonly steps: number;
  /** Input projections x·Wx + bx for every step, steps × rows × 3H. */
  readonly xp: Buf;
  /** Gates z, r, candidate n and the recurrent candidate term h·Un + cn, each steps × rows × H. */
  readonly z: Buf;
  readonly r: Buf;
  readonly n: Buf;
  readonly hn: Buf;
  /** Hidden states, (steps + 1) × rows × H: block 0 is h0, block t + 1 the output of step t. */
  readonly h: Buf;
  /** Scratch: recurrent projection of one step (rows × 3H), its gradient, the gradient on h. */
  readonly hu: Buf;
  readonly dhu: Buf;
  readonly dh: Buf;
  /** Gradients on the input projections of every step (steps × rows × 3H). */
  readonly dxp: Buf;
}

/** Returns GRU parameters registered as `${name}.wx|bx|uh|bh` (Xavier weights, zero biases). */
export function createGru(store: ParamStore, name: string, inDim: number, hidden: number, rng: Pcg32): GruParams {
  return {
    inDim, hidden,
    wx: store.add(`${name}.wx`, [inDim, 3 * hidden], 'xavier', rng),
    bx: store.add(`${name}.bx`, [3 * hidden], 'zeros'),
    uh: store.add(`${name}.uh`, [hidden, 3 * hidden], 'xavier', rng),
    bh: store.add(`${name}.bh`, [3 * hidden], 'zeros'),
  };
}

/** Returns a cache for sequences of `steps` steps over `rows` independent rows. */
export function createGruCache(store: ParamStore, p: GruParams, rows: number, steps: number): GruCache {
  const H = p.hidden, a = (n: number) => store.alloc(n);
  return {
    rows, steps,
    xp: a(steps * rows * 3 * H), z: a(steps * rows * H), r: a(steps * rows * H), n: a(steps * rows * H), hn: a(steps * rows * H),
    h: a((steps + 1) * rows * H), hu: a(rows * 3 * H), dhu: a(rows * 3 * H), dh: a(rows * H), dxp: a(steps * rows * 3 * H),
  };
}

/**
 * Returns the hidden states of steps 1..steps (a view of cache.h, steps × rows × H) after running the GRU
 * over x (steps × rows × in) from h0 (rows × H; null for zeros).
 */
export function gruForward(p: GruParams, x: Buf, h0: Buf | null, cache: GruCache): Buf {
  const { rows, steps } = cache, H = p.hidden, RH = rows * H;
  linearForward(x, p.wx.value, p.bx.value, cache.xp, steps * rows, p.inDim, 3 * H);
  if (h0) cache.h.set(h0.subarray(0, RH) as never, 0);
  else cache.h.fill(0, 0, RH);
  for (let t = 0; t < steps; t++) gruCellForward(p, cache, t);
  return cache.h.subarray(RH, (steps + 1) * RH);
}

/** Returns cache.h after one step t: reads h block t and xp of step t, writes gates of step t and h block t + 1. */
export function gruCellForward(p: GruParams, cache: GruCache, t: number): Buf {
  const { rows, hu, z, r, n, hn, h, xp } = cache, H = p.hidden, H3 = 3 * H, RH = rows * H;
  const hPrev = h.subarray(t * RH, (t + 1) * RH);
  linearForward(hPrev, p.uh.value, p.bh.value, hu, rows, H, H3);
  const x0 = t * rows * H3, g0 = t * RH, hOut = (t + 1) * RH;
  for (let i = 0; i < rows; i++) {
    const xi = x0 + i * H3, ui = i * H3, gi = g0 + i * H, hi = t * RH + i * H, oi = hOut + i * H;
    for (let j = 0; j < H; j++) {
      const zj = sigmoid(xp[xi + j]! + hu[ui + j]!);
      const rj = sigmoid(xp[xi + H + j]! + hu[ui + H + j]!);
      const hnj = hu[ui + 2 * H + j]!;
      const nj = tanh(xp[xi + 2 * H + j]! + rj * hnj);
      z[gi + j] = zj;
      r[gi + j] = rj;
      n[gi + j] = nj;
      hn[gi + j] = hnj;
      h[oi + j] = (1 - zj) * nj + zj * h[hi + j]!;
    }
  }
  return h;
}

/**
 * Returns dx after backpropagation through time. dHs (steps × rows × H) holds the gradient of the loss on
 * each step's output (as returned by gruForward). Weight gradients accumulate into the store; dx += gradient
 * on x (may be null); dh0 += gradient on h0 (may be null).
 */
export function gruBackward(p: GruParams, x: Buf, cache: GruCache, dHs: Buf, dx: Buf | null, dh0: Buf | null): Buf | null {
  const { rows, steps, dh } = cache, H = p.hidden, RH = rows * H;
  dh.fill(0);
  for (let t = steps - 1; t >= 0; t--) {
    const up = t * RH;
    for (let i = 0; i < RH; i++) dh[i] = dh[i]! + dHs[up + i]!;
    gruCellBackward(p, cache, t);
  }
  if (dh0) for (let i = 0; i < RH; i++) dh0[i] = dh0[i]! + dh[i]!;
  linearBackward(x, p.wx.value, cache.dxp, dx, p.wx.grad, p.bx.grad, steps * rows, p.inDim, 3 * H, true);
  return dx;
}

/**
 * Returns cache.dh after one backward step t: on entry cache.dh is the gradient on h block t + 1, on exit the
 * gradient on h block t. Writes dxp of step t and accumulates Uh and bh gradients.
 */
export function gruCellBackward(p: GruParams, cache: GruCache, t: number): Buf {
  const { rows, z, r, n, hn, h, dh, dhu, dxp } = cache, H = p.hidden, H3 = 3 * H, RH = rows * H;
  const g0 = t * RH, x0 = t * rows * H3;
  for (let i = 0; i < rows; i++) {
    const gi = g0 + i * H, di = i * H, ui = i * H3, xi = x0 + i * H3, hi = t * RH + i * H;
    for (let j = 0; j < H; j++) {
      const d = dh[di + j]!, zj = z[gi + j]!, rj = r[gi + j]!, nj = n[gi + j]!;
      const dn = d * (1 - zj);
      const dz = d * (h[hi + j]! - nj);
      const dan = dn * (1 - nj * nj);
      const daz = dz * zj * (1 - zj);
      const dr = dan * hn[gi + j]!;
      const dar = dr * rj * (1 - rj);
      dxp[xi + j] = daz;
      dxp[xi + H + j] = dar;
      dxp[xi + 2 * H + j] = dan;
      dhu[ui + j] = daz;
      dhu[ui + H + j] = dar;
      dhu[ui + 2 * H + j] = dan * rj;
      dh[di + j] = d * zj; // the direct path h → h'; the recurrent path is added below
    }
  }
  const hPrev = h.subarray(t * RH, (t + 1) * RH);
  matmulAtB(hPrev, dhu, p.uh.grad, rows, H, H3, true);
  addColumnSums(dhu, p.bh.grad, rows, H3);
  matmulABt(dhu, p.uh.value, dh, rows, H3, H, true);
  return dh;
}
