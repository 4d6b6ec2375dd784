// Pair lists over the joint graph and the two pair kernels of the model: per-node projections combined by
// gather-add over the pairs (P[k] = A[sender k] + B[receiver k], with A = H·Wa and B = H·Wb computed once
// per node), and summation of pair messages at their receivers (scatter-add). Backward of a gather is a
// scatter-add and vice versa. Both loop over pairs in list order, so results are deterministic.
import { linearBackward, linearForward } from './linear.js';
import type { Buf } from './types.js';

/** Directed pairs (sender → receiver) over `nodes` rows. */
export interface PairList {
  readonly nodes: number;
  readonly count: number;
  readonly senders: Int32Array;
  readonly receivers: Int32Array;
}

/** Returns all ordered pairs i → j with i ≠ j over n nodes, sender-major (n·(n − 1) pairs). */
export function allOrderedPairs(n: number): PairList {
  const count = n * (n - 1);
  const senders = new Int32Array(count), receivers = new Int32Array(count);
  let k = 0;
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++)
      if (i !== j) {
        senders[k] = i;
        receivers[k] = j;
        k++;
      }
  return { nodes: n, count, senders, receivers };
}

/** Returns the pair list repeated over `blocks` stacked graphs (block b's nodes are rows b·nodes … ). */
export function tilePairs(pairs: PairList, blocks: number): PairList {
  const count = pairs.count * blocks;
  const senders = new Int32Array(count), receivers = new Int32Array(count);
  for (let b = 0; b < blocks; b++) {
    const o = b * pairs.count, base = b * pairs.nodes;
    for (let k = 0; k < pairs.count; k++) {
      senders[o + k] = pairs.senders[k]! + base;
      receivers[o + k] = pairs.receivers[k]! + base;
    }
  }
  return { nodes: pairs.nodes * blocks, count, senders, receivers };
}

/** Returns out after out[k, :] = a[sender k, :] + b[receiver k, :] (+ bias) for every pair, width dim. */
export function gatherAddPairs(a: Buf, b: Buf, bias: Buf | null, pairs: PairList, dim: number, out: Buf): Buf {
  const { count, senders, receivers } = pairs;
  for (let k = 0; k < count; k++) {
    const s = senders[k]! * dim, r = receivers[k]! * dim, o = k * dim;
    if (bias) for (let j = 0; j < dim; j++) out[o + j] = a[s + j]! + b[r + j]! + bias[j]!;
    else for (let j = 0; j < dim; j++) out[o + j] = a[s + j]! + b[r + j]!;
  }
  return out;
}

/** Returns dA after the backward pass of gatherAddPairs: dA[sender] += dP, dB[receiver] += dP, dBias += Σ dP (may be null). */
export function gatherAddPairsBackward(dP: Buf, pairs: PairList, dim: number, dA: Buf, dB: Buf, dBias: Buf | null): Buf {
  const { count, senders, receivers } = pairs;
  for (let k = 0; k < count; k++) {
    const s = senders[k]! * dim, r = receivers[k]! * dim, o = k * dim;
    for (let j = 0; j < dim; j++) {
      const g = dP[o + j]!;
      dA[s + j] = dA[s + j]! + g;
      dB[r + j] = dB[r + j]! + g;
    }
  }
  if (dBias) for (let k = 0; k < count; k++) for (let j = 0; j < dim; j++) dBias[j] = dBias[j]! + dP[k * dim + j]!;
  return dA;
}

/** Scratch of nodeProjectPairs: the per-node projections and their gradients (nodes × dim each). */
export interface PairProjectionScratch {
  readonly a: Buf;
  readonly b: Buf;
  readonly da: Buf;
  readonly db: Buf;
}

/**
 * Returns out (pairs × dim) after the split first layer of a pair MLP on node features h (nodes × inDim):
 * out[k] = h[s]·Wa + h[r]·Wb + bias, computed as A = h·Wa and B = h·Wb once per node, then gather-add.
 */
export function nodeProjectPairs(
  h: Buf, wa: Buf, wb: Buf, bias: Buf | null, pairs: PairList, inDim: number, dim: number, scratch: PairProjectionScratch, out: Buf,
): Buf {
  linearForward(h, wa, null, scratch.a, pairs.nodes, inDim, dim);
  linearForward(h, wb, null, scratch.b, pairs.nodes, inDim, dim);
  return gatherAddPairs(scratch.a, scratch.b, bias, pairs, dim, out);
}

/**
 * Returns dh after the backward pass of nodeProjectPairs for dP (pairs × dim): dWa, dWb and dBias (may be
 * null) accumulate; dh += gradient on h (may be null).
 */
export function nodeProjectPairsBackward(
  h: Buf, wa: Buf, wb: Buf, dP: Buf, pairs: PairList, inDim: number, dim: number, scratch: PairProjectionScratch,
  dh: Buf | null, dWa: Buf, dWb: Buf, dBias: Buf | null,
): Buf | null {
  const n = pairs.nodes * dim;
  scratch.da.fill(0, 0, n);
  scratch.db.fill(0, 0, n);
  gatherAddPairsBackward(dP, pairs, dim, scratch.da, scratch.db, dBias);
  linearBackward(h, wa, scratch.da, dh, dWa, null, pairs.nodes, inDim, dim, true);
  linearBackward(h, wb, scratch.db, dh, dWb, null, pairs.nodes, inDim, dim, true);
  return dh;
}

/** Returns out (nodes × dim) after out[i] = Σ over pairs k with receiver i of m[k] (or out += … when accumulate). */
export function scatterAddToReceivers(m: Buf, pairs: PairList, dim: number, out: Buf, accumulate = false): Buf {
  if (!accumulate) out.fill(0, 0, pairs.nodes * dim);
  const { count, receivers } = pairs;
  for (let k = 0; k < count; k++) {
    const r = receivers[k]! * dim, o = k * dim;
    for (let j = 0; j < dim; j++) out[r + j] = out[r + j]! + m[o + j]!;
  }
  return out;
}

/** Returns dM after the backward pass of scatterAddToReceivers: dM[k] += dOut[receiver k] (a gather). */
export function scatterAddToReceiversBackward(dOut: Buf, pairs: PairList, dim: number, dM: Buf): Buf {
  const { count, receivers } = pairs;
  for (let k = 0; k < count; k++) {
    const r = receivers[k]! * dim, o = k * dim;
    for (let j = 0; j < dim; j++) dM[o + j] = dM[o + j]! + dOut[r + j]!;
  }
  return dM;
}
