// A multilayer perceptron composed of linear layers and activations, with a cache of each layer's output
// sized for a maximum number of rows, and its backward pass.
import { activate, activateBackward, type Activation } from './activations.js';
import { linearBackward, linearForward } from './linear.js';
import type { Param, ParamStore } from './params.js';
import type { Pcg32 } from './prng.js';
import type { Buf } from './types.js';

/** One layer: weights [in×out], bias [out], and its activation. */
export interface MlpLayer {
  readonly w: Param;
  readonly b: Param;
  readonly inDim: number;
  readonly outDim: number;
  readonly act: Activation;
}

/** An MLP with its per-layer output buffers (the cache for backward) and gradient scratch. */
export interface Mlp {
  readonly layers: readonly MlpLayer[];
  readonly maxRows: number;
  /** Output of each layer after its activation, maxRows × outDim. */
  readonly outs: Buf[];
  /** Gradient scratch per layer, maxRows × outDim. */
  readonly grads: Buf[];
}

/** Returns a new MLP whose layers are registered in the store as `${name}.${i}.w` / `.b` (Xavier weights, zero bias). */
export function createMlp(
  store: ParamStore, name: string, dims: readonly number[], acts: readonly Activation[], maxRows: number, rng: Pcg32,
): Mlp {
  if (acts.length !== dims.length - 1) throw new Error('an MLP needs one activation per layer');
  const layers: MlpLayer[] = [];
  const outs: Buf[] = [], grads: Buf[] = [];
  for (let i = 0; i + 1 < dims.length; i++) {
    const inDim = dims[i]!, outDim = dims[i + 1]!;
    layers.push({
      w: store.add(`${name}.${i}.w`, [inDim, outDim], 'xavier', rng),
      b: store.add(`${name}.${i}.b`, [outDim], 'zeros'),
      inDim, outDim, act: acts[i]!,
    });
    outs.push(store.alloc(maxRows * outDim));
    grads.push(store.alloc(maxRows * outDim));
  }
  return { layers, maxRows, outs, grads };
}

/** Returns the last layer's output buffer after running x[rows×in] through the MLP. */
export function mlpForward(mlp: Mlp, x: Buf, rows: number): Buf {
  if (rows > mlp.maxRows) throw new Error(`MLP sized for ${mlp.maxRows} rows, got ${rows}`);
  let input = x;
  for (let i = 0; i < mlp.layers.length; i++) {
    const L = mlp.layers[i]!, out = mlp.outs[i]!;
    linearForward(input, L.w.value, L.b.value, out, rows, L.inDim, L.outDim);
    activate(L.act, out, out, rows * L.outDim);
    input = out;
  }
  return input;
}

/**
 * Returns dx after backpropagating dy (gradient on the last output) through the MLP run by the latest
 * mlpForward on x: weight and bias gradients accumulate into the store, dx += gradient on x (dx may be null).
 * Softplus layers are not allowed here since their derivative needs the pre-activation.
 */
export function mlpBackward(mlp: Mlp, x: Buf, dy: Buf, dx: Buf | null, rows: number): Buf | null {
  let upstream = dy;
  for (let i = mlp.layers.length - 1; i >= 0; i--) {
    const L = mlp.layers[i]!, out = mlp.outs[i]!, g = mlp.grads[i]!;
    if (L.act === 'softplus') throw new Error('mlpBackward cannot differentiate a softplus layer from its output');
    activateBackward(L.act, out, out, upstream, g, rows * L.outDim);
    const input = i === 0 ? x : mlp.outs[i - 1]!;
    const dIn = i === 0 ? dx : mlp.grads[i - 1]!;
    linearBackward(input, L.w.value, g, dIn, L.w.grad, L.b.grad, rows, L.inDim, L.outDim, i === 0);
    upstream = dIn ?? upstream;
  }
  return dx;
}
