// A causal temporal convolution over a sequence of row blocks (the alternative to the GRU for per-node
// temporal embeddings): y[t] = b + Σ_k x[t − k·dilation]·W_k, steps before the first counting as zero.
// Every tap is one matrix product over all steps at once (no loop over time), backward likewise.
import { linearForward } from './linear.js';
import { addColumnSums, matmul, matmulABt, matmulAtB } from './matmul.js';
import type { Param, ParamStore } from './params.js';
import type { Pcg32 } from './prng.js';
import type { Buf } from './types.js';

/** Weights [kernel × in × out] (tap k looks k·dilation steps back) and bias [out]. */
export interface CausalConvParams {
  readonly inDim: number;
  readonly outDim: number;
  readonly kernel: number;
  readonly dilation: number;
  readonly w: Param;
  readonly b: Param;
}

/** Returns a causal convolution registered as `${name}.w` / `.b` (Xavier over kernel·in inputs, zero bias). */
export function createCausalConv(
  store: ParamStore, name: string, inDim: number, outDim: number, kernel: number, dilation: number, rng: Pcg32,
): CausalConvParams {
  const w = store.add(`${name}.w`, [kernel * inDim, outDim], 'xavier', rng);
  return { inDim, outDim, kernel, dilation, w, b: store.add(`${name}.b`, [outDim], 'zeros') };
}

/** Returns y (steps × rows × out) after the convolution of x (steps × rows × in). */
export function causalConvForward(p: CausalConvParams, x: Buf, y: Buf, steps: number, rows: number): Buf {
  const { inDim: I, outDim: O } = p, wv = p.w.value;
  linearForward(x, wv.subarray(0, I * O), p.b.value, y, steps * rows, I, O);
  for (let k = 1; k < p.kernel; k++) {
    const s = k * p.dilation;
    if (s >= steps) break;
    const m = (steps - s) * rows;
    matmul(x.subarray(0, m * I), wv.subarray(k * I * O, (k + 1) * I * O), y.subarray(s * rows * O), m, I, O, true);
  }
  return y;
}

/** Returns dx after the backward pass for dy: dW and db accumulate, dx += gradient on x (may be null). */
export function causalConvBackward(p: CausalConvParams, x: Buf, dy: Buf, dx: Buf | null, steps: number, rows: number): Buf | null {
  const { inDim: I, outDim: O } = p, wv = p.w.value, wg = p.w.grad;
  addColumnSums(dy, p.b.grad, steps * rows, O);
  for (let k = 0; k < p.kernel; k++) {
    const s = k * p.dilation;
    if (s >= steps) break;
    const m = (steps - s) * rows;
    const xs = x.subarray(0, m * I), dys = dy.subarray(s * rows * O);
    matmulAtB(xs, dys, wg.subarray(k * I * O, (k + 1) * I * O), m, I, O, true);
    if (dx) matmulABt(dys, wv.subarray(k * I * O, (k + 1) * I * O), dx.subarray(0, m * I), m, O, I, true);
  }
  return dx;
}
