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

/** Steps of recent motion a past stride is matched on (about 0.13 s at 30 Hz) and the lag search step. */
const MATCH_STEPS = 4;
const LAG_STEP = 0.25;

/** Returns the squared mismatch of pelvis-relative poses over the last `k` steps up to `end` and the same steps `lag` earlier. */
function lagMismatch(positions: Float64Array, nodeCount: number, end: number, lag: number, k: number, a: Float64Array, b: Float64Array): number {
  let e = 0;
  for (let t = end - k + 1; t <= end; t++) {
    at(positions, nodeCount, t - lag, 0, b, 0);
    for (let n = 1; n < nodeCount; n++) {
      at(positions, nodeCount, t - lag, n, a, 0);
      for (let c = 0; c < 3; c++) {
        const cur = positions[(t * nodeCount + n) * 3 + c]! - positions[t * nodeCount * 3 + c]!;
        e += (cur - (a[c]! - b[c]!)) ** 2;
      }
    }
  }
  return e;
}

/**
 * Writes the phase-registered stride mean into out [horizon × nodes × 3] and returns the stride period:
 * like strideForecast, but each of the last `strides` strides is taken at the lag (within ±20 % of m
 * periods, in quarter steps) whose pelvis-relative poses best match the last few observed steps, so a
 * stride that came early or late (step times drift like a random walk) is aligned on the current phase
 * rather than on whole periods. Reads nothing after `end`; falls back to constant velocity without a period.
 */
export function registeredStrideForecast(positions: Float64Array, nodeCount: number, rate: number, end: number, horizon: number, strides: number, out: Float64Array): number {
  const P = stridePeriodAt(positions, nodeCount, rate, end);
  if (!Number.isFinite(P) || end - P - MATCH_STEPS - 1 < 0) { constantVelocity(positions, nodeCount, end, horizon, out); return NaN; }
  const a = new Float64Array(3), b = new Float64Array(3), lags: number[] = [];
  for (let m = 1; m <= strides; m++) {
    const centre = m * P;
    if (end - centre * 1.2 - MATCH_STEPS - 1 < 0) break;
    let best = centre, bestE = Infinity;
    for (let lag = centre - 0.2 * P; lag <= centre + 0.2 * P; lag += LAG_STEP) {
      const e = lagMismatch(positions, nodeCount, end, lag, MATCH_STEPS, a, b);
      if (e < bestE) { bestE = e; best = lag; }
    }
    lags.push(best);
  }
  if (lags.length === 0) lags.push(P);
  const tmp = new Float64Array(3), pel = new Float64Array(3), W = nodeCount * 3;
  for (let k = 0; k < horizon; k++) {
    const s = end + 1 + k;
    for (let n = 0; n < nodeCount; n++) {
      let x = 0, y = 0, z = 0;
      for (const lag of lags) {
        const src = s - lag;
        if (src <= end) at(positions, nodeCount, src, n, tmp, 0);
        else {
          // A source inside the horizon: the forecast made so far (linear blend), as strideForecast does.
          const i = Math.floor(src - end - 1), w = src - end - 1 - i;
          for (let c = 0; c < 3; c++) {
            const lo = i >= 0 ? out[(i * nodeCount + n) * 3 + c]! : positions[(end * nodeCount + n) * 3 + c]!;
            tmp[c] = lo * (1 - w) + out[((i + 1) * nodeCount + n) * 3 + c]! * w;
          }
        }
        at(positions, nodeCount, end - lag, 0, pel, 0);
        x += tmp[0]! + positions[end * W]! - pel[0]!;
        y += tmp[1]! + positions[end * W + 1]! - pel[1]!;
        z += tmp[2]!;
      }
      const o = (k * nodeCount + n) * 3;
      out[o] = x / lags.length; out[o + 1] = y / lags.length; out[o + 2] = z / lags.length;
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
