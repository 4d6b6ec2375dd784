// Time normalisation of per-frame series to 0-100 % of the gait cycle, and per-cycle scalars (peaks, ranges).
//
// A cycle runs from one initial contact (`start`, 0 %) to the next of the same side (`end`, 100 %); both may be
// fractional frames (sub-frame event times). Sample i of n sits at frame start + (end − start) · i / (n − 1)
// and is read by linear interpolation between the two neighbouring frames, so sample 0 and sample n − 1 are
// the series at the two contacts.
import { InputError } from '../errors/index.js';

/** Samples of a normalised cycle: 0, 1, ..., 100 % (common practice). */
export const CYCLE_SAMPLES = 101;

/** One gait cycle in frames: from a contact to the next contact of the same side. */
export interface CycleSpan {
  start: number;
  end: number;
}

/** Normalised curves of several cycles with their mean and sample SD per sample. */
export interface NormalisedCycles {
  samples: number;
  cycles: number;
  /** cycles × samples, row per cycle. */
  curves: Float64Array;
  /** Per sample: mean over the cycles whose value there is finite (NaN when none). */
  mean: Float64Array;
  /** Per sample: sample standard deviation (n − 1) over those cycles (NaN when fewer than two). */
  sd: Float64Array;
  /** Per sample: how many cycles had a finite value. */
  count: Int32Array;
}

/** Returns the series' value at a fractional frame by linear interpolation (ends clamped to the series). */
export function sampleAt(series: ArrayLike<number>, x: number): number {
  const n = series.length;
  if (x <= 0) return series[0]!;
  if (x >= n - 1) return series[n - 1]!;
  const i = Math.floor(x), t = x - i;
  return t === 0 ? series[i]! : series[i]! + t * (series[i + 1]! - series[i]!);
}

/** Throws InputError unless the cycle lies inside a series of n frames with end after start. */
function checkCycle(c: CycleSpan, n: number, k: number): void {
  if (!(Number.isFinite(c.start) && Number.isFinite(c.end) && c.start >= 0 && c.end > c.start && c.end <= n - 1))
    throw new InputError(`gait cycle ${k} (frames ${c.start} to ${c.end}) does not lie inside the ${n} frames of the series`);
}

/** Returns the series normalised over each cycle to `samples` points, with mean and SD per point. */
export function normaliseCycles(series: ArrayLike<number>, cycles: readonly CycleSpan[], samples = CYCLE_SAMPLES, out?: Float64Array): NormalisedCycles {
  if (!Number.isInteger(samples) || samples < 2) throw new InputError(`a normalised cycle needs at least 2 samples (got ${samples})`);
  const C = cycles.length;
  const curves = out ?? new Float64Array(C * samples);
  for (let k = 0; k < C; k++) {
    const c = cycles[k]!;
    checkCycle(c, series.length, k);
    const step = (c.end - c.start) / (samples - 1);
    for (let i = 0; i < samples; i++) curves[k * samples + i] = sampleAt(series, i === samples - 1 ? c.end : c.start + i * step);
  }
  const { mean, sd, count } = columnStats(curves, C, samples);
  return { samples, cycles: C, curves, mean, sd, count };
}

/** Returns per column of a rows × cols matrix the mean, sample SD and count of its finite values. */
export function columnStats(m: Float64Array, rows: number, cols: number): { mean: Float64Array; sd: Float64Array; count: Int32Array } {
  const mean = new Float64Array(cols), sd = new Float64Array(cols), count = new Int32Array(cols);
  for (let i = 0; i < cols; i++) {
    let n = 0, s = 0;
    for (let k = 0; k < rows; k++) { const v = m[k * cols + i]!; if (Number.isFinite(v)) { n++; s += v; } }
    const mu = n > 0 ? s / n : NaN;
    let ss = 0;
    for (let k = 0; k < rows; k++) { const v = m[k * cols + i]!; if (Number.isFinite(v)) ss += (v - mu) * (v - mu); }
    mean[i] = mu;
    sd[i] = n > 1 ? Math.sqrt(ss / (n - 1)) : NaN;
    count[i] = n;
  }
  return { mean, sd, count };
}

/** Returns the cycles between successive contact frames (the spans [ic_k, ic_k+1]). */
export function cyclesFromContacts(contacts: readonly number[]): CycleSpan[] {
  const out: CycleSpan[] = [];
  for (let k = 0; k + 1 < contacts.length; k++) out.push({ start: contacts[k]!, end: contacts[k + 1]! });
  return out;
}

/**
 * Returns per cycle the largest value of the series in swing, from the cycle's toe-off to its end (NaN for a
 * cycle with no toe-off inside it); `toeOffs` are the side's toe-off frames, in any order.
 */
export function peakInSwing(series: ArrayLike<number>, cycles: readonly CycleSpan[], toeOffs: readonly number[]): Float64Array {
  const out = new Float64Array(cycles.length);
  cycles.forEach((c, k) => {
    checkCycle(c, series.length, k);
    let to = NaN;
    for (const t of toeOffs) if (t > c.start && t < c.end && !(t >= to)) to = t;
    if (Number.isNaN(to)) { out[k] = NaN; return; }
    let best = Math.max(sampleAt(series, to), sampleAt(series, c.end));
    for (let f = Math.ceil(to); f <= Math.floor(c.end); f++) if (series[f]! > best) best = series[f]!;
    out[k] = best;
  });
  return out;
}

/** Returns per cycle the range of motion, largest minus smallest value over the cycle (NaN if any is NaN). */
export function rangeOfMotion(series: ArrayLike<number>, cycles: readonly CycleSpan[]): Float64Array {
  const out = new Float64Array(cycles.length);
  cycles.forEach((c, k) => {
    checkCycle(c, series.length, k);
    let lo = Math.min(sampleAt(series, c.start), sampleAt(series, c.end));
    let hi = Math.max(sampleAt(series, c.start), sampleAt(series, c.end));
    let bad = !Number.isFinite(lo) || !Number.isFinite(hi);
    for (let f = Math.ceil(c.start); f <= Math.floor(c.end); f++) {
      const v = series[f]!;
      if (!Number.isFinite(v)) bad = true;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    out[k] = bad ? NaN : hi - lo;
  });
  return out;
}

/** Returns mean and sample SD (n − 1) of the finite values of a list (NaN when there are too few). */
export function meanSd(xs: ArrayLike<number>): { mean: number; sd: number; n: number } {
  let n = 0, s = 0;
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) { n++; s += xs[i]!; }
  const mean = n > 0 ? s / n : NaN;
  let ss = 0;
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) ss += (xs[i]! - mean) ** 2;
  return { mean, sd: n > 1 ? Math.sqrt(ss / (n - 1)) : NaN, n };
}
