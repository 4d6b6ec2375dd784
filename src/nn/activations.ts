// Elementwise nonlinearities with their derivatives. Forward may run in place (x === y); backward writes
// dx = dy·f' (not accumulated) and may run in place too (dx === dy).
import type { Buf } from './types.js';

/** The nonlinearities the layers offer. */
export type Activation = 'linear' | 'tanh' | 'relu' | 'leaky' | 'sigmoid' | 'softplus';

/** Slope of the leaky rectifier for negative inputs. */
export const LEAKY_SLOPE = 0.01;

/** Returns y after y = f(x) elementwise over the first n entries. */
export function activate(kind: Activation, x: Buf, y: Buf, n: number): Buf {
  switch (kind) {
    case 'linear':
      if (x !== y) for (let i = 0; i < n; i++) y[i] = x[i]!;
      break;
    case 'tanh':
      for (let i = 0; i < n; i++) y[i] = tanh(x[i]!);
      break;
    case 'relu':
      for (let i = 0; i < n; i++) {
        const v = x[i]!;
        y[i] = v > 0 ? v : 0;
      }
      break;
    case 'leaky':
      for (let i = 0; i < n; i++) {
        const v = x[i]!;
        y[i] = v > 0 ? v : LEAKY_SLOPE * v;
      }
      break;
    case 'sigmoid':
      for (let i = 0; i < n; i++) y[i] = sigmoid(x[i]!);
      break;
    case 'softplus':
      for (let i = 0; i < n; i++) y[i] = softplus(x[i]!);
      break;
  }
  return y;
}

/**
 * Returns dx after dx = dy·f'(x) elementwise. tanh, sigmoid, relu and leaky read the output y; softplus
 * reads the input x (the other argument may be anything).
 */
export function activateBackward(kind: Activation, x: Buf, y: Buf, dy: Buf, dx: Buf, n: number): Buf {
  switch (kind) {
    case 'linear':
      if (dx !== dy) for (let i = 0; i < n; i++) dx[i] = dy[i]!;
      break;
    case 'tanh':
      for (let i = 0; i < n; i++) {
        const v = y[i]!;
        dx[i] = dy[i]! * (1 - v * v);
      }
      break;
    case 'relu':
      for (let i = 0; i < n; i++) dx[i] = y[i]! > 0 ? dy[i]! : 0;
      break;
    case 'leaky':
      for (let i = 0; i < n; i++) dx[i] = y[i]! > 0 ? dy[i]! : LEAKY_SLOPE * dy[i]!;
      break;
    case 'sigmoid':
      for (let i = 0; i < n; i++) {
        const v = y[i]!;
        dx[i] = dy[i]! * v * (1 - v);
      }
      break;
    case 'softplus':
      for (let i = 0; i < n; i++) dx[i] = dy[i]! * sigmoid(x[i]!);
      break;
  }
  return dx;
}

/** Returns the logistic function 1 / (1 + e^-v), computed without overflow. */
export function sigmoid(v: number): number {
  if (v >= 0) return 1 / (1 + Math.exp(-v));
  const e = Math.exp(v);
  return e / (1 + e);
}

/**
 * Returns tanh(v) as −expm1(−2|v|) / (2 + expm1(−2|v|)) with the sign of v: one expm1 instead of
 * Math.tanh, faster in V8 and accurate to a few ulps in double precision (expm1 keeps small |v| exact).
 */
export function tanh(v: number): number {
  const e = Math.expm1(-2 * Math.abs(v));
  const r = -e / (2 + e);
  return v < 0 ? -r : r;
}

/** Returns log(1 + e^v), computed without overflow. */
export function softplus(v: number): number {
  return (v > 0 ? v : 0) + Math.log1p(Math.exp(-Math.abs(v)));
}
