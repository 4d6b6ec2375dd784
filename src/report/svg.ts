// Small, dependency-free SVG line plots for self-contained HTML reports.

export interface PlotSeries {
  label: string;
  /** y values, one per x. */
  y: ArrayLike<number>;
  /** Optional ± band around y (e.g. one SD), same length. */
  band?: ArrayLike<number>;
  colour: string;
  /** SVG stroke-dasharray, '' for solid. */
  dash: string;
}

export interface PlotMarker {
  x: number;
  label: string;
  colour: string;
  dash: string;
}

export interface LinePlot {
  title: string;
  xLabel: string;
  yLabel: string;
  x: ArrayLike<number>;
  series: PlotSeries[];
  markers?: PlotMarker[];
  /** A grey reference band drawn under everything: lower and upper curves. */
  reference?: { lower: ArrayLike<number>; upper: ArrayLike<number>; label: string };
  width?: number;
  height?: number;
}

/** Returns text safe inside XML/HTML element content and attribute values. */
export function escapeXml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** Returns round tick values covering [lo, hi], about `count` of them. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) { const c = Number.isFinite(lo) ? lo : 0; return [c - 1, c, c + 1]; }
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const ticks: number[] = [];
  for (let v = Math.floor(lo / step) * step; v <= hi + step * 1e-9; v += step) ticks.push(Math.round(v / step) * step);
  if (ticks[0]! > lo) ticks.unshift(ticks[0]! - step);
  if (ticks[ticks.length - 1]! < hi) ticks.push(ticks[ticks.length - 1]! + step);
  return ticks;
}

function fmtTick(v: number): string {
  const r = Math.round(v * 1000) / 1000;
  return String(r === 0 ? 0 : r);
}

/** Returns an SVG element drawing the plot: axes with ticks and labels, SD bands, lines, markers, legend. */
export function linePlotSvg(p: LinePlot): string {
  const W = p.width ?? 480, H = p.height ?? 290;
  const m = { l: 56, r: 12, t: 28, b: 76 };
  const n = p.x.length;
  let lo = Infinity, hi = -Infinity;
  const take = (v: number) => { if (Number.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); } };
  for (const s of p.series) for (let i = 0; i < n; i++) { const b = s.band ? s.band[i]! : 0; take(s.y[i]! - b); take(s.y[i]! + b); }
  if (p.reference) for (let i = 0; i < n; i++) { take(p.reference.lower[i]!); take(p.reference.upper[i]!); }
  const yt = niceTicks(lo, hi, 5);
  const y0 = yt[0]!, y1 = yt[yt.length - 1]!;
  const x0 = p.x[0]!, x1 = p.x[n - 1]!;
  const X = (v: number) => m.l + ((v - x0) / (x1 - x0 || 1)) * (W - m.l - m.r);
  const Y = (v: number) => H - m.b - ((v - y0) / (y1 - y0 || 1)) * (H - m.t - m.b);
  const path = (ys: ArrayLike<number>) => {
    let d = '';
    for (let i = 0; i < n; i++) if (Number.isFinite(ys[i]!)) d += `${d ? 'L' : 'M'}${X(p.x[i]!).toFixed(1)},${Y(ys[i]!).toFixed(1)}`;
    return d;
  };
  const area = (a: ArrayLike<number>, b: ArrayLike<number>) => {
    let d = '';
    for (let i = 0; i < n; i++) d += `${i ? 'L' : 'M'}${X(p.x[i]!).toFixed(1)},${Y(a[i]!).toFixed(1)}`;
    for (let i = n - 1; i >= 0; i--) d += `L${X(p.x[i]!).toFixed(1)},${Y(b[i]!).toFixed(1)}`;
    return d + 'Z';
  };
  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" role="img" aria-label="${escapeXml(p.title)}" class="plot">`);
  parts.push(`<text x="${m.l}" y="17" class="plot-title">${escapeXml(p.title)}</text>`);
  for (const t of yt) parts.push(`<line x1="${m.l}" x2="${W - m.r}" y1="${Y(t).toFixed(1)}" y2="${Y(t).toFixed(1)}" class="grid"/><text x="${m.l - 6}" y="${(Y(t) + 4).toFixed(1)}" class="tick" text-anchor="end">${fmtTick(t)}</text>`);
  for (const t of niceTicks(x0, x1, 5).filter((v) => v >= x0 && v <= x1)) parts.push(`<text x="${X(t).toFixed(1)}" y="${H - m.b + 16}" class="tick" text-anchor="middle">${fmtTick(t)}</text>`);
  if (y0 < 0 && y1 > 0) parts.push(`<line x1="${m.l}" x2="${W - m.r}" y1="${Y(0).toFixed(1)}" y2="${Y(0).toFixed(1)}" class="zero"/>`);
  if (p.reference) parts.push(`<path d="${area(p.reference.lower, p.reference.upper)}" class="reference"/>`);
  for (const s of p.series) {
    if (!s.band) continue;
    const lower = Array.from({ length: n }, (_, i) => s.y[i]! - s.band![i]!);
    const upper = Array.from({ length: n }, (_, i) => s.y[i]! + s.band![i]!);
    parts.push(`<path d="${area(lower, upper)}" fill="${s.colour}" fill-opacity="0.13" stroke="none"/>`);
  }
  for (const mk of p.markers ?? []) parts.push(`<line x1="${X(mk.x).toFixed(1)}" x2="${X(mk.x).toFixed(1)}" y1="${m.t}" y2="${H - m.b}" stroke="${mk.colour}" stroke-dasharray="${mk.dash}" stroke-width="1.2"><title>${escapeXml(mk.label)}</title></line>`);
  for (const s of p.series) parts.push(`<path d="${path(s.y)}" fill="none" stroke="${s.colour}" stroke-width="2" stroke-dasharray="${s.dash}"/>`);
  parts.push(`<rect x="${m.l}" y="${m.t}" width="${W - m.l - m.r}" height="${H - m.t - m.b}" class="frame"/>`);
  parts.push(`<text x="${(m.l + W - m.r) / 2}" y="${H - m.b + 32}" class="axis-label" text-anchor="middle">${escapeXml(p.xLabel)}</text>`);
  parts.push(`<text transform="translate(14 ${(m.t + H - m.b) / 2}) rotate(-90)" class="axis-label" text-anchor="middle">${escapeXml(p.yLabel)}</text>`);
  // Legend under the axis label: a short line sample per entry, in its style, wrapped to the width.
  const legend = [...p.series.map((s) => ({ label: s.label, colour: s.colour, dash: s.dash, w: 2 })), ...(p.markers ?? []).slice(0, 2).map((mk) => ({ label: mk.label, colour: mk.colour, dash: mk.dash, w: 1.2 }))];
  let lx = m.l;
  let ly = H - m.b + 50;
  for (const e of legend) {
    const w = 34 + e.label.length * 6.2;
    if (lx + w > W - m.r && lx > m.l) { lx = m.l; ly += 14; }
    parts.push(`<line x1="${lx}" x2="${lx + 22}" y1="${ly - 4}" y2="${ly - 4}" stroke="${e.colour}" stroke-width="${e.w}" stroke-dasharray="${e.dash}"/><text x="${lx + 26}" y="${ly}" class="legend">${escapeXml(e.label)}</text>`);
    lx += w;
  }
  if (p.reference) {
    if (lx + 120 > W - m.r) { lx = m.l; ly += 14; }
    parts.push(`<rect x="${lx}" y="${ly - 9}" width="18" height="9" class="reference"/><text x="${lx + 22}" y="${ly}" class="legend">${escapeXml(p.reference.label)}</text>`);
  }
  parts.push('</svg>');
  return parts.join('');
}
