// Resampling from a take's frame rate to the model rate by linear interpolation in time.
//
// Step k of the model sits at time k / rate; source frame f at time f · frameTime. Step k is
// (1 − w)·frame[i] + w·frame[i + 1] with i = ⌊u⌋, w = u − i, u = k / (rate · frameTime). When u lies
// within 1e-9 of a whole number it is snapped to it (w = 0), so an integer ratio (120 → 30 Hz) picks
// every fourth frame exactly. No low-pass is applied before decimating: walking kinematics carry little
// above 6 Hz (common practice: the usual 6 Hz kinematic cutoff), below the 15 Hz Nyquist limit of 30 Hz,
// so what folds back is mainly sensor jitter, which is passed on, not reduced.
//
// Causality: step k reads source frames up to ⌈u⌉ and nothing later (`lastSourceFrame`), so steps
// 0..k of a take truncated after that frame are bit for bit those of the full take.

/** Snap tolerance on the source position u (frames). */
const SNAP = 1e-9;

/** The source frame and weight of every model step. */
export interface ResamplePlan {
  steps: number;
  /** Source frame i of step k (the earlier of the two frames blended). */
  index: Int32Array;
  /** Weight w of frame i + 1 (0 when the step falls on frame i). */
  weight: Float64Array;
}

/** Returns the number of model steps a take of `frames` frames spans at `rate` (steps at k / rate within it). */
export function resampledLength(frames: number, frameTime: number, rate: number): number {
  if (frames <= 0) return 0;
  return Math.floor((frames - 1) * frameTime * rate + SNAP) + 1;
}

/** Returns the source position u of step k, snapped to a whole frame when within 1e-9 of one. */
function sourcePosition(k: number, frameTime: number, rate: number): number {
  const u = k / (rate * frameTime);
  const r = Math.round(u);
  return Math.abs(u - r) < SNAP ? r : u;
}

/** Returns the last source frame that model step k reads (⌈u⌉, or u itself on a whole frame). */
export function lastSourceFrame(k: number, frameTime: number, rate: number): number {
  return Math.ceil(sourcePosition(k, frameTime, rate));
}

/** Returns the source frame and weight of every model step of a take of `frames` frames. */
export function resamplePlan(frames: number, frameTime: number, rate: number): ResamplePlan {
  if (!(rate > 0) || !(frameTime > 0)) throw new RangeError(`resample rate and frame time must be positive (got ${rate}, ${frameTime})`);
  const steps = resampledLength(frames, frameTime, rate);
  const index = new Int32Array(steps), weight = new Float64Array(steps);
  for (let k = 0; k < steps; k++) {
    const u = sourcePosition(k, frameTime, rate);
    let i = Math.floor(u);
    let w = u - i;
    if (i >= frames - 1) { i = frames - 1; w = 0; }
    index[k] = i;
    weight[k] = w;
  }
  return { steps, index, weight };
}

/**
 * Returns `src` (frames × width, frame-major) resampled to the model rate: steps × width, written
 * into `out` when given (it must hold steps × width values).
 */
export function resampleLinear(src: Float64Array, frames: number, width: number, frameTime: number, rate: number, out?: Float64Array): Float64Array {
  const plan = resamplePlan(frames, frameTime, rate);
  const dst = out ?? new Float64Array(plan.steps * width);
  for (let k = 0; k < plan.steps; k++) blendInto(src, plan.index[k]! * width, width, plan.weight[k]!, dst, k * width);
  return dst;
}

/**
 * Writes (1 − w)·src[a..a+width) + w·src[a+width..a+2·width) into dst at `o`, as a + (b − a)·w;
 * with w = 0 it copies frame a exactly (frame a + 1 is not read).
 */
export function blendInto(src: Float64Array, a: number, width: number, w: number, dst: Float64Array, o: number): void {
  if (w === 0) {
    for (let c = 0; c < width; c++) dst[o + c] = src[a + c]!;
    return;
  }
  const b = a + width;
  for (let c = 0; c < width; c++) {
    const x = src[a + c]!;
    dst[o + c] = x + (src[b + c]! - x) * w;
  }
}
