// A small histogram for the cohort report: counts of values in equal bins, as inline SVG. Values far
// outside the rest (beyond three interquartile ranges from the quartiles, with at least four values)
// are left off the axis and named in a note, so one extreme take does not squash every other bar.
import { quantile } from '../norms/profile.js';
import { escapeXml, niceTicks } from './svg.js';

/** Returns an SVG histogram of `values` (non-finite ones are left out) with about `bins` bins. */
export function histogramSvg(title: string, xLabel: string, values: readonly number[], bins = 10, colour = '#3b6ea8'): string {
  const W = 440, H = 240, m = { l: 44, r: 12, t: 28, b: 48 };
  const finite = values.filter((v) => Number.isFinite(v));
  const { inside: xs, outside } = splitFarValues(finite);
  const ticks = niceTicks(xs.length ? Math.min(...xs) : 0, xs.length ? Math.max(...xs) : 1, bins);
  const lo = ticks[0]!, hi = ticks[ticks.length - 1]!;
  const nb = Math.max(1, ticks.length - 1);
  const counts = new Array<number>(nb).fill(0);
  for (const v of xs) counts[Math.min(nb - 1, Math.max(0, Math.floor(((v - lo) / (hi - lo || 1)) * nb)))]!++;
  const top = Math.max(1, ...counts);
  const X = (v: number) => m.l + ((v - lo) / (hi - lo || 1)) * (W - m.l - m.r);
  const Y = (c: number) => H - m.b - (c / top) * (H - m.t - m.b);
  const bars = counts.map((c, i) => {
    const x0 = X(lo + ((hi - lo) * i) / nb), x1 = X(lo + ((hi - lo) * (i + 1)) / nb);
    return c ? `<rect x="${(x0 + 1).toFixed(1)}" y="${Y(c).toFixed(1)}" width="${Math.max(1, x1 - x0 - 2).toFixed(1)}" height="${(H - m.b - Y(c)).toFixed(1)}" fill="${colour}"><title>${c}</title></rect>` : '';
  }).join('');
  const xt = ticks.map((t) => `<text class="tick" x="${X(t).toFixed(1)}" y="${H - m.b + 16}" text-anchor="middle">${escapeXml(String(+t.toFixed(3)))}</text>`).join('');
  const yt = [0, top].map((c) => `<text class="tick" x="${m.l - 6}" y="${(Y(c) + 4).toFixed(1)}" text-anchor="end">${c}</text>`).join('');
  const fmt = (v: number) => String(+v.toFixed(2));
  const note = outside.length
    ? `<text class="tick" x="${W - m.r}" y="${m.t + 14}" text-anchor="end">${escapeXml(`${outside.length} off the axis: ${outside.slice(0, 3).map(fmt).join(', ')}${outside.length > 3 ? ', …' : ''}`)}</text>`
    : '';
  return `<svg class="plot" viewBox="0 0 ${W} ${H}" role="img" aria-label="${escapeXml(title)}"><text class="plot-title" x="${m.l}" y="18">${escapeXml(title)}</text>` + note +
    `<rect class="frame" x="${m.l}" y="${m.t}" width="${W - m.l - m.r}" height="${H - m.t - m.b}"/>${bars}${xt}${yt}` +
    `<text class="axis-label" x="${(m.l + W - m.r) / 2}" y="${H - 10}" text-anchor="middle">${escapeXml(xLabel)}</text>` +
    `<text class="axis-label" x="12" y="${(m.t + H - m.b) / 2}" transform="rotate(-90 12 ${(m.t + H - m.b) / 2})" text-anchor="middle">takes</text></svg>`;
}

/** Returns the values within three interquartile ranges of the quartiles (type-7 quantiles), and the others (sorted); fewer than four values are all inside. */
export function splitFarValues(xs: readonly number[]): { inside: number[]; outside: number[] } {
  if (xs.length < 4) return { inside: [...xs], outside: [] };
  const q1 = quantile(xs, 0.25), q3 = quantile(xs, 0.75), iqr = q3 - q1;
  const lo = q1 - 3 * iqr, hi = q3 + 3 * iqr;
  return { inside: xs.filter((v) => v >= lo && v <= hi), outside: xs.filter((v) => v < lo || v > hi).sort((a, b) => a - b) };
}

/** One subject's line in a trend plot: a value per session ordinal (NaN where missing). */
export interface TrendSeries { label: string; y: readonly number[]; colour: string }

/** Returns an SVG of values across session ordinals 1..n, one line with dots per subject, whole-number x ticks. */
export function trendSvg(title: string, yLabel: string, series: readonly TrendSeries[]): string {
  const W = 440, H = 270, m = { l: 52, r: 12, t: 28, b: 74 };
  const n = Math.max(1, ...series.map((s) => s.y.length));
  const ys = series.flatMap((s) => s.y.filter((v) => Number.isFinite(v)));
  const yt = niceTicks(ys.length ? Math.min(...ys) : 0, ys.length ? Math.max(...ys) : 1, 5);
  const y0 = yt[0]!, y1 = yt[yt.length - 1]!;
  const X = (i: number) => m.l + (n === 1 ? 0.5 : i / (n - 1)) * (W - m.l - m.r - 20) + 10;
  const Y = (v: number) => H - m.b - ((v - y0) / (y1 - y0 || 1)) * (H - m.t - m.b);
  const parts: string[] = [];
  for (const t of yt) parts.push(`<line class="grid" x1="${m.l}" x2="${W - m.r}" y1="${Y(t).toFixed(1)}" y2="${Y(t).toFixed(1)}"/><text class="tick" x="${m.l - 6}" y="${(Y(t) + 4).toFixed(1)}" text-anchor="end">${escapeXml(String(+t.toFixed(3)))}</text>`);
  for (let i = 0; i < n; i++) parts.push(`<text class="tick" x="${X(i).toFixed(1)}" y="${H - m.b + 16}" text-anchor="middle">${i + 1}</text>`);
  series.forEach((s) => {
    let d = '';
    s.y.forEach((v, i) => { if (Number.isFinite(v)) d += `${d ? 'L' : 'M'}${X(i).toFixed(1)},${Y(v).toFixed(1)}`; });
    if (d) parts.push(`<path d="${d}" fill="none" stroke="${s.colour}" stroke-width="2"/>`);
    s.y.forEach((v, i) => { if (Number.isFinite(v)) parts.push(`<circle cx="${X(i).toFixed(1)}" cy="${Y(v).toFixed(1)}" r="3.5" fill="${s.colour}"><title>${escapeXml(`${s.label}, session ${i + 1}: ${+v.toFixed(3)}`)}</title></circle>`); });
  });
  const legend = series.map((s, i) => {
    const x = m.l + (i % 6) * 64, y = H - 22 + Math.floor(i / 6) * 14;
    return `<line x1="${x}" x2="${x + 16}" y1="${y - 4}" y2="${y - 4}" stroke="${s.colour}" stroke-width="2"/><text class="legend" x="${x + 20}" y="${y}">${escapeXml(s.label)}</text>`;
  }).join('');
  return `<svg class="plot" viewBox="0 0 ${W} ${H}" role="img" aria-label="${escapeXml(title)}"><text class="plot-title" x="${m.l}" y="18">${escapeXml(title)}</text>` +
    `<rect class="frame" x="${m.l}" y="${m.t}" width="${W - m.l - m.r}" height="${H - m.t - m.b}"/>${parts.join('')}` +
    `<text class="axis-label" x="${(m.l + W - m.r) / 2}" y="${H - m.b + 34}" text-anchor="middle">session (in date order)</text>` +
    `<text class="axis-label" x="12" y="${(m.t + H - m.b) / 2}" transform="rotate(-90 12 ${(m.t + H - m.b) / 2})" text-anchor="middle">${escapeXml(yLabel)}</text>${legend}</svg>`;
}
