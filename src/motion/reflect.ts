// The left/right reflection of window state: y → −y for position and velocity, left and right nodes
// swapped. In the window frame (x forward, y left, z up) this is the reflection across the subject's
// sagittal plane through the pelvis at the last observed step; applied twice it is the identity, bit for
// bit (negation and swaps are exact).

/** Values per node per step: position x, y, z then velocity x, y, z. */
export const STATE_SIZE = 6;

/**
 * Returns `out` holding `state` (steps × nodes × 6) reflected: node i of `out` is node mirror[i] of
 * `state` with its y position and y velocity negated. `out` may be `state` (in place).
 */
export function mirrorState(state: Float64Array, nodeMirror: Int32Array, out: Float64Array): Float64Array {
  const N = nodeMirror.length;
  const W = N * STATE_SIZE;
  const steps = Math.floor(state.length / W);
  for (let k = 0; k < steps; k++) {
    const base = k * W;
    for (let i = 0; i < N; i++) {
      const m = nodeMirror[i]!;
      if (m < i) continue; // the pair was handled at its lower index
      const oi = base + i * STATE_SIZE, om = base + m * STATE_SIZE;
      for (let c = 0; c < STATE_SIZE; c++) {
        const sign = c === 1 || c === 4 ? -1 : 1;
        const vi = state[oi + c]!, vm = state[om + c]!;
        out[oi + c] = sign * vm;
        out[om + c] = sign * vi;
      }
    }
  }
  return out;
}
