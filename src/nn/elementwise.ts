// Row-wise helpers the model composes: scaling rows by a per-row gate, adding and copying column blocks.
import type { Buf } from './types.js';

/** Returns out after out[r, :] = g[r] · m[r, :] for rows×dim m (out may be m). */
export function scaleRows(m: Buf, g: Buf, out: Buf, rows: number, dim: number): Buf {
  for (let r = 0; r < rows; r++) {
    const s = g[r]!, o = r * dim;
    for (let j = 0; j < dim; j++) out[o + j] = s * m[o + j]!;
  }
  return out;
}

/** Returns dm after the backward pass of scaleRows: dm += g·dOut (dm may be null) and dg[r] += ⟨m[r], dOut[r]⟩. */
export function scaleRowsBackward(m: Buf, g: Buf, dOut: Buf, dm: Buf | null, dg: Buf, rows: number, dim: number): Buf | null {
  for (let r = 0; r < rows; r++) {
    const s = g[r]!, o = r * dim;
    let acc = 0;
    for (let j = 0; j < dim; j++) {
      const d = dOut[o + j]!;
      acc += d * m[o + j]!;
      if (dm) dm[o + j] = dm[o + j]! + s * d;
    }
    dg[r] = dg[r]! + acc;
  }
  return dm;
}

/** Returns out after copying columns [0, width) of each row of src (stride srcStride) into out at column offset (stride outStride). */
export function copyColumns(
  src: Buf, srcStride: number, srcOffset: number, out: Buf, outStride: number, outOffset: number, rows: number, width: number,
): Buf {
  for (let r = 0; r < rows; r++) {
    const s = r * srcStride + srcOffset, o = r * outStride + outOffset;
    for (let j = 0; j < width; j++) out[o + j] = src[s + j]!;
  }
  return out;
}

/** Returns out after out[r, off:off+width] += src[r, srcOff:srcOff+width] (the backward pass of copyColumns). */
export function addColumns(
  src: Buf, srcStride: number, srcOffset: number, out: Buf, outStride: number, outOffset: number, rows: number, width: number,
): Buf {
  for (let r = 0; r < rows; r++) {
    const s = r * srcStride + srcOffset, o = r * outStride + outOffset;
    for (let j = 0; j < width; j++) out[o + j] = out[o + j]! + src[s + j]!;
  }
  return out;
}
