// The parameter store: every weight of a model in one flat buffer and every gradient in another, so that
// saving, loading, reducing across workers and the optimiser step each touch a single array. Each named
// tensor is a view (subarray) into both.
import type { Pcg32 } from './prng.js';
import type { Buf } from './types.js';

/** How a tensor's values start. */
export type Init = 'xavier' | 'zeros' | 'ones' | { constant: number } | { normal: number };

/** One named tensor: its shape, its place in the flat buffers, and views of its values and gradients. */
export interface Param {
  readonly name: string;
  readonly shape: readonly number[];
  readonly offset: number;
  readonly size: number;
  /** View of the values; replaced when the store grows, so read it at call time. */
  value: Buf;
  /** View of the gradients; replaced when the store grows. */
  grad: Buf;
}

/** Named tensors over one flat value buffer and one flat gradient buffer. */
export class ParamStore {
  values: Buf;
  grads: Buf;
  readonly params: Param[] = [];
  private readonly byName = new Map<string, Param>();
  private used = 0;
  private readonly double: boolean;

  /** precision 64 makes Float64Array buffers (for gradient checks); training uses the default 32. */
  constructor(options: { precision?: 32 | 64 } = {}) {
    this.double = options.precision === 64;
    this.values = this.alloc(0);
    this.grads = this.alloc(0);
  }

  /** Returns a zeroed buffer of the store's precision. */
  alloc(n: number): Buf {
    return this.double ? new Float64Array(n) : new Float32Array(n);
  }

  /** Returns the total number of scalars held. */
  get size(): number {
    return this.used;
  }

  /** Returns a new tensor of the given shape, initialised from rng (needed by 'xavier' and 'normal'). */
  add(name: string, shape: readonly number[], init: Init, rng?: Pcg32): Param {
    if (this.byName.has(name)) throw new Error(`parameter ${name} declared twice`);
    const size = shape.reduce((a, b) => a * b, 1);
    const offset = this.used;
    this.grow(offset + size);
    const p: Param = { name, shape: [...shape], offset, size, value: this.values.subarray(offset, offset + size), grad: this.grads.subarray(offset, offset + size) };
    this.params.push(p);
    this.byName.set(name, p);
    initialise(p.value, shape, init, rng);
    return p;
  }

  /** Returns the tensor of that name (throws when absent). */
  get(name: string): Param {
    const p = this.byName.get(name);
    if (!p) throw new Error(`no parameter named ${name}`);
    return p;
  }

  /** Returns the gradient buffer after setting it to zero. */
  zeroGrads(): Buf {
    return this.grads.fill(0);
  }

  private grow(n: number): void {
    if (n > this.values.length) {
      const cap = Math.max(n, this.values.length * 2, 64);
      const v = this.alloc(cap), g = this.alloc(cap);
      v.set(this.values as never);
      g.set(this.grads as never);
      this.values = v;
      this.grads = g;
      for (const p of this.params) {
        p.value = v.subarray(p.offset, p.offset + p.size);
        p.grad = g.subarray(p.offset, p.offset + p.size);
      }
    }
    this.used = n;
  }

  /** Returns the store's values trimmed to its size (a view). */
  valueView(): Buf {
    return this.values.subarray(0, this.used);
  }

  /** Returns the store's gradients trimmed to its size (a view). */
  gradView(): Buf {
    return this.grads.subarray(0, this.used);
  }
}

/**
 * Returns out filled per the init rule. Xavier/Glorot uniform (Glorot and Bengio 2010): U(-a, a) with
 * a = sqrt(6 / (fanIn + fanOut)), fanIn the first dimension and fanOut the product of the others.
 */
export function initialise(out: Buf, shape: readonly number[], init: Init, rng?: Pcg32): Buf {
  if (init === 'zeros') return out.fill(0);
  if (init === 'ones') return out.fill(1);
  if (typeof init === 'object' && 'constant' in init) return out.fill(init.constant);
  if (!rng) throw new Error('random initialisation needs a generator');
  if (typeof init === 'object' && 'normal' in init) {
    for (let i = 0; i < out.length; i++) out[i] = init.normal * rng.gauss();
    return out;
  }
  const fanIn = shape.length > 1 ? shape[0]! : 1;
  const fanOut = shape.length > 1 ? shape.slice(1).reduce((a, b) => a * b, 1) : shape[0]!;
  const a = Math.sqrt(6 / (fanIn + fanOut));
  for (let i = 0; i < out.length; i++) out[i] = (2 * rng.next() - 1) * a;
  return out;
}

/**
 * Returns out after out = parts[0] + parts[1] + … elementwise, always added in index order, so that
 * gradients reduced from several workers are bit-identical from run to run.
 */
export function reduceInOrder(parts: readonly Buf[], out: Buf, n = out.length): Buf {
  if (parts.length === 0) return out.fill(0, 0, n);
  const first = parts[0]!;
  for (let i = 0; i < n; i++) out[i] = first[i]!;
  for (let k = 1; k < parts.length; k++) {
    const p = parts[k]!;
    for (let i = 0; i < n; i++) out[i] = out[i]! + p[i]!;
  }
  return out;
}
