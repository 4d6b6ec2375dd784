// Signal helpers of event detection: the stride period of a periodic signal, robust peak picking with a
// least separation, and sub-frame peak refinement.

/**
 * Returns the stride period in frames of `x` over the frames where `mask` is set, from the first strong
 * peak of its autocorrelation between `minLag` and `maxLag` frames; NaN when no clear period is found.
 */
export function stridePeriod(x: Float64Array, mask: Uint8Array, minLag: number, maxLag: number): number {
  const n = x.length;
  let mean = 0, count = 0;
  for (let i = 0; i < n; i++) if (mask[i]) { mean += x[i]!; count++; }
  if (count < 2 * minLag) return NaN;
  mean /= count;
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = mask[i] ? x[i]! - mean : 0;
  const hi = Math.min(maxLag, n - 2);
  if (hi <= minLag) return NaN;
  const r = new Float64Array(hi + 2);
  let r0 = 0;
  for (let i = 0; i < n; i++) r0 += y[i]! * y[i]!;
  if (!(r0 > 0)) return NaN;
  let best = -Infinity;
  for (let lag = minLag - 1; lag <= hi + 1; lag++) {
    let s = 0, m = 0;
    for (let i = 0; i + lag < n; i++) if (mask[i] && mask[i + lag]) { s += y[i]! * y[i + lag]!; m++; }
    // Normalise by the overlap so long lags are not penalised for being short.
    r[lag] = m > 0 ? (s / m) * (count / r0) : 0;
    if (lag >= minLag && lag <= hi && r[lag]! > best) best = r[lag]!;
  }
  if (!(best > 0.2)) return NaN;
  for (let lag = minLag; lag <= hi; lag++)
    if (r[lag]! >= r[lag - 1]! && r[lag]! >= r[lag + 1]! && r[lag]! >= 0.7 * best) return lag + parabolicOffset(r[lag - 1]!, r[lag]!, r[lag + 1]!);
  return NaN;
}

/** Returns the offset (−0.5..0.5) of the vertex of the parabola through three equally spaced samples from the middle one. */
export function parabolicOffset(a: number, b: number, c: number): number {
  const d = a - 2 * b + c;
  if (d === 0) return 0;
  const o = (0.5 * (a - c)) / d;
  return o > 0.5 ? 0.5 : o < -0.5 ? -0.5 : o;
}

/**
 * Returns the frames of local maxima of `x` that stand in the top 40 % of the range of `x` over ±halfWin
 * frames, with no two closer than `minSep` frames (the higher wins), in frame order. Frames within `edge`
 * of the ends are never peaks, as a maximum there may be the signal's edge and not its turn. Where `allow`
 * is given, only frames it accepts are candidates (so that peaks outside the walking passes suppress none inside).
 */
export function pickPeaks(x: Float64Array, minSep: number, halfWin: number, edge = 1, allow?: Uint8Array): number[] {
  const n = x.length;
  const cands: number[] = [];
  for (let i = Math.max(1, edge); i < n - Math.max(1, edge); i++) {
    if (!(x[i]! > x[i - 1]! && x[i]! >= x[i + 1]!) || (allow && !allow[i])) continue;
    let lo = Infinity, hi = -Infinity;
    for (let k = Math.max(0, i - halfWin), b = Math.min(n - 1, i + halfWin); k <= b; k++) {
      const v = x[k]!;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    if (x[i]! >= lo + 0.6 * (hi - lo)) cands.push(i);
  }
  cands.sort((p, q) => x[q]! - x[p]!);
  const taken: number[] = [];
  for (const c of cands) if (taken.every((t) => Math.abs(t - c) >= minSep)) taken.push(c);
  return taken.sort((p, q) => p - q);
}

/** Returns the sub-frame position of the extremum of `x` at integer frame `i` by parabolic refinement. */
export function refinePeak(x: Float64Array, i: number): number {
  if (i <= 0 || i >= x.length - 1) return i;
  return i + parabolicOffset(x[i - 1]!, x[i]!, x[i + 1]!);
}
