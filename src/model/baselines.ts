// Forecast baselines every model forecast is scored against in the same run. Each predicts node
// positions for steps end+1 .. end+horizon from the track up to step `end` only (causal).
import { stridePeriodAt } from './period.js';

export const BASELINE_NAMES = ['zero_motion', 'constant_velocity', 'last_stride', 'stride_mean'] as const;
export type BaselineName = (typeof BASELINE_NAMES)[number];

/** Returns the position (out[0..2]) of node n at fractional step s by linear interpolation; s <= end. */
function at(positions: Float64Array, nodeCount: number, s: number, n: number, out: Float64Array, o: number): void {
  const i = Math.floor(s), w = s - i;
  const a = (i * nodeCount + n) * 3, b = ((i + 1) * nodeCount + n) * 3;
  for (let k = 0; k < 3; k++) out[o + k] = w > 0 ? positions[a + k]! * (1 - w) + positions[b + k]! * w : positions[a + k]!;
}

/** Writes the zero-motion forecast (the last observed pose held) into out [horizon × nodes × 3]. */
export function zeroMotion(positions: Float64Array, nodeCount: number, end: number, horizon: number, out: Float64Array): Float64Array {
  const W = nodeCount * 3;
  for (let k = 0; k < horizon; k++) out.set(positions.subarray(end * W, end * W + W), k * W);
  return out;
}

/** Writes the constant-velocity forecast (last one-step velocity carried on) into out. */
export function constantVelocity(positions: Float64Array, nodeCount: number, end: number, horizon: number, out: Float64Array): Float64Array {
  const W = nodeCount * 3;
  for (let k = 0; k < horizon; k++)
    for (let c = 0; c < W; c++) {
      const p = positions[end * W + c]!, v = end > 0 ? p - positions[(end - 1) * W + c]! : 0;
      out[k * W + c] = p + (k + 1) * v;
    }
  return out;
}

/**
 * Writes the mean over the last `strides` strides of the pose one, two, ... strides before each
 * future step, each moved on by the pelvis travel over as many strides (phase-aligned stride mean);
 * with strides = 1 this repeats the last stride. Steps that would fall after `end` use the forecast
 * itself. Falls back to constant velocity when no stride period can be found. Returns the period used.
 */
export function strideForecast(positions: Float64Array, nodeCount: number, rate: number, end: number, horizon: number, strides: number, out: Float64Array): number {
  const P = stridePeriodAt(positions, nodeCount, rate, end);
  const W = nodeCount * 3;
  if (!Number.isFinite(P)) { constantVelocity(positions, nodeCount, end, horizon, out); return NaN; }
  const usable = Math.max(1, Math.min(strides, Math.floor(end / P)));
  if (end - P < 0) { constantVelocity(positions, nodeCount, end, horizon, out); return NaN; }
  const tmp = new Float64Array(3), pel = new Float64Array(3);
  for (let k = 0; k < horizon; k++) {
    const s = end + 1 + k;
    for (let n = 0; n < nodeCount; n++) {
      let x = 0, y = 0, z = 0, used = 0;
      for (let m = 1; m <= usable; m++) {
        const src = s - m * P;
        if (src < 0) break;
        if (src <= end) at(positions, nodeCount, src, n, tmp, 0);
        else {
          // A source step inside the horizon: take it from the forecast made so far (linear blend).
          const i = Math.floor(src - end - 1), w = src - end - 1 - i;
          for (let a = 0; a < 3; a++) {
            const lo = i >= 0 ? out[(i * nodeCount + n) * 3 + a]! : positions[(end * nodeCount + n) * 3 + a]!;
            const hi = out[((i + 1) * nodeCount + n) * 3 + a]!;
            tmp[a] = lo * (1 - w) + hi * w;
          }
        }
        // Travel of the pelvis over m strides, measured over the last m strides before `end`.
        at(positions, nodeCount, Math.max(0, end - m * P), 0, pel, 0);
        x += tmp[0]! + positions[end * W]! - pel[0]!;
        y += tmp[1]! + positions[end * W + 1]! - pel[1]!;
        z += tmp[2]!;
        used++;
      }
      const o = (k * nodeCount + n) * 3;
      out[o] = x / used; out[o + 1] = y / used; out[o + 2] = z / used;
    }
  }
  return P;
}

/** Writes the named baseline's forecast into out [horizon × nodes × 3]. */
export function baselineForecast(name: BaselineName, positions: Float64Array, nodeCount: number, rate: number, end: number, horizon: number, out: Float64Array): Float64Array {
  switch (name) {
    case 'zero_motion': return zeroMotion(positions, nodeCount, end, horizon, out);
    case 'constant_velocity': return constantVelocity(positions, nodeCount, end, horizon, out);
    case 'last_stride': strideForecast(positions, nodeCount, rate, end, horizon, 1, out); return out;
    case 'stride_mean': strideForecast(positions, nodeCount, rate, end, horizon, 3, out); return out;
  }
}
