// Mean over time: pools a sequence of per-step feature blocks into one block (the static factor posterior
// is read from the window's pooled pair embedding).
import type { Buf } from './types.js';

/** Returns out (width) after out = (1/steps) Σ_t x[t] for x laid out steps × width. */
export function meanPoolTime(x: Buf, steps: number, width: number, out: Buf): Buf {
  out.fill(0, 0, width);
  for (let t = 0; t < steps; t++) {
    const o = t * width;
    for (let i = 0; i < width; i++) out[i] = out[i]! + x[o + i]!;
  }
  const inv = 1 / steps;
  for (let i = 0; i < width; i++) out[i] = out[i]! * inv;
  return out;
}

/** Returns dx after the backward pass of meanPoolTime: dx[t] += dOut / steps for every step. */
export function meanPoolTimeBackward(dOut: Buf, steps: number, width: number, dx: Buf): Buf {
  const inv = 1 / steps;
  for (let t = 0; t < steps; t++) {
    const o = t * width;
    for (let i = 0; i < width; i++) dx[o + i] = dx[o + i]! + dOut[i]! * inv;
  }
  return dx;
}
