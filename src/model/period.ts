// The current stride period of a track, estimated only from steps up to a given one (causal).

/** Shortest and longest stride searched for, seconds (common practice for walking: about 0.8-1.6 s). */
export const MIN_STRIDE_S = 0.7;
export const MAX_STRIDE_S = 2.0;

/**
 * Returns the stride period in steps (fractional, refined by a parabola) from the autocorrelation of
 * pelvis-relative node positions over the `historyS` seconds ending at step `end` (inclusive), or NaN
 * when the history is too short or shows no rhythm.
 */
export function stridePeriodAt(positions: Float64Array, nodeCount: number, rate: number, end: number, historyS = 4): number {
  const minLag = Math.max(2, Math.floor(MIN_STRIDE_S * rate));
  const maxLag = Math.ceil(MAX_STRIDE_S * rate);
  const len = Math.min(end + 1, Math.round(historyS * rate));
  if (len < minLag * 2 + 2) return NaN;
  const start = end + 1 - len;
  const W = nodeCount * 3;
  // Pelvis-relative signal, mean removed per channel.
  const sig = new Float64Array(len * W);
  for (let t = 0; t < len; t++) {
    const o = (start + t) * W;
    for (let n = 0; n < nodeCount; n++)
      for (let a = 0; a < 3; a++) sig[t * W + n * 3 + a] = positions[o + n * 3 + a]! - positions[o + a]!;
  }
  for (let c = 0; c < W; c++) {
    let m = 0;
    for (let t = 0; t < len; t++) m += sig[t * W + c]!;
    m /= len;
    for (let t = 0; t < len; t++) sig[t * W + c]! -= m;
  }
  const top = Math.min(maxLag, len - minLag);
  const r = new Float64Array(top + 2);
  for (let lag = minLag - 1; lag <= top + 1 && lag < len; lag++) {
    let num = 0, e0 = 0, e1 = 0;
    for (let t = lag; t < len; t++)
      for (let c = 0; c < W; c++) {
        const a = sig[t * W + c]!, b = sig[(t - lag) * W + c]!;
        num += a * b; e0 += a * a; e1 += b * b;
      }
    r[lag] = e0 > 0 && e1 > 0 ? num / Math.sqrt(e0 * e1) : 0;
  }
  // The stride is the first local maximum within 90 % of the strongest one: multiples of the stride
  // correlate as well, a step of the other side correlates less.
  let best = -1;
  for (let lag = minLag; lag <= top; lag++) if (r[lag]! > r[lag - 1]! && r[lag]! >= r[lag + 1]! && r[lag]! > best) best = r[lag]!;
  if (best < 0.3) return NaN;
  let bestLag = -1;
  for (let lag = minLag; lag <= top && bestLag < 0; lag++) if (r[lag]! > r[lag - 1]! && r[lag]! >= r[lag + 1]! && r[lag]! >= 0.9 * best) bestLag = lag;
  const a = r[bestLag - 1]!, b = r[bestLag]!, c = r[bestLag + 1]!;
  const den = a - 2 * b + c;
  const shift = den < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / den)) : 0;
  return bestLag + shift;
}
