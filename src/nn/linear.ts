// The affine layer y = x·W + b on a batch of rows, with its backward pass.
import { addColumnSums, matmul, matmulABt, matmulAtB } from './matmul.js';
import type { Buf } from './types.js';

/** Returns y after y[rows×out] = x[rows×in]·W[in×out] + b (b may be null; accumulate adds to y instead). */
export function linearForward(
  x: Buf, w: Buf, b: Buf | null, y: Buf, rows: number, inDim: number, outDim: number, accumulate = false,
): Buf {
  if (!accumulate) {
    matmul(x, w, y, rows, inDim, outDim, false);
  } else {
    matmul(x, w, y, rows, inDim, outDim, true);
  }
  if (b) for (let i = 0; i < rows; i++) for (let j = 0, o = i * outDim; j < outDim; j++) y[o + j] = y[o + j]! + b[j]!;
  return y;
}

/**
 * Returns dx after the backward pass of linearForward for upstream gradient dy[rows×out]: dW += xᵀ·dy,
 * db += column sums of dy (db may be null), and dx += dy·Wᵀ (dx may be null; overwritten when accumulateDx
 * is false).
 */
export function linearBackward(
  x: Buf, w: Buf, dy: Buf, dx: Buf | null, dw: Buf, db: Buf | null,
  rows: number, inDim: number, outDim: number, accumulateDx = true,
): Buf | null {
  matmulAtB(x, dy, dw, rows, inDim, outDim, true);
  if (db) addColumnSums(dy, db, rows, outDim);
  if (dx) matmulABt(dy, w, dx, rows, outDim, inDim, accumulateDx);
  return dx;
}
