// The optimiser: Adam (Kingma and Ba 2015, Algorithm 1, with its bias corrections), optional decoupled
// weight decay (AdamW, Loshchilov and Hutter 2019), and gradient clipping by global norm (Pascanu,
// Mikolov and Bengio 2013). All loops run in index order, so a step is deterministic.
import type { Buf } from './types.js';

/** Settings of an Adam optimiser. */
export interface AdamOptions {
  lr: number;
  beta1?: number;
  beta2?: number;
  eps?: number;
  /** Decoupled weight decay per step, θ −= lr·weightDecay·θ (0 disables). */
  weightDecay?: number;
}

/** Adam state: first and second moment estimates and the step count. */
export class Adam {
  readonly m: Float32Array | Float64Array;
  readonly v: Float32Array | Float64Array;
  t = 0;
  readonly lr: number;
  readonly beta1: number;
  readonly beta2: number;
  readonly eps: number;
  readonly weightDecay: number;

  /** A fresh optimiser for `size` parameters (moments of the same precision as `like`, Float32 by default). */
  constructor(size: number, options: AdamOptions, like?: Buf) {
    const make = (n: number) => (like instanceof Float64Array ? new Float64Array(n) : new Float32Array(n));
    this.m = make(size);
    this.v = make(size);
    this.lr = options.lr;
    this.beta1 = options.beta1 ?? 0.9;
    this.beta2 = options.beta2 ?? 0.999;
    this.eps = options.eps ?? 1e-8;
    this.weightDecay = options.weightDecay ?? 0;
  }

  /**
   * Returns params after one update from grads: m ← β1·m + (1−β1)·g, v ← β2·v + (1−β2)·g²,
   * θ ← θ − lr·m̂/(√v̂ + ε) with m̂ = m/(1−β1^t), v̂ = v/(1−β2^t).
   */
  step(params: Buf, grads: Buf, n = params.length): Buf {
    this.t++;
    const { m, v, beta1: b1, beta2: b2, eps, lr } = this;
    const c1 = 1 / (1 - Math.pow(b1, this.t)), c2 = 1 / (1 - Math.pow(b2, this.t));
    const decay = lr * this.weightDecay;
    for (let i = 0; i < n; i++) {
      const g = grads[i]!;
      const mi = b1 * m[i]! + (1 - b1) * g;
      const vi = b2 * v[i]! + (1 - b2) * g * g;
      m[i] = mi;
      v[i] = vi;
      let p = params[i]!;
      if (decay !== 0) p -= decay * p;
      params[i] = p - (lr * (mi * c1)) / (Math.sqrt(vi * c2) + eps);
    }
    return params;
  }
}

/** Returns the Euclidean norm of the first n gradients, summed in float64 in index order. */
export function globalNorm(grads: Buf, n = grads.length): number {
  let s = 0;
  for (let i = 0; i < n; i++) {
    const g = grads[i]!;
    s += g * g;
  }
  return Math.sqrt(s);
}

/**
 * Returns the global norm before clipping, after scaling grads by maxNorm / norm when the norm exceeds
 * maxNorm (the rule of TensorFlow's clip_by_global_norm: g · maxNorm / max(norm, maxNorm)).
 */
export function clipGlobalNorm(grads: Buf, maxNorm: number, n = grads.length): number {
  const norm = globalNorm(grads, n);
  if (norm > maxNorm && norm > 0) {
    const s = maxNorm / norm;
    for (let i = 0; i < n; i++) grads[i] = grads[i]! * s;
  }
  return norm;
}
