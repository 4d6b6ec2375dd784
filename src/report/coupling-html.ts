// The coupling report of one take, self-contained HTML: a role-by-role heat matrix of static coupling,
// the dynamic factors over the gait cycle for the most asymmetric pair and its mirror, the classic
// relative-phase curves beside them, the ranked asymmetry table with intervals, the classic symmetry
// indices and the caution.
import type { ClassicCouplings } from '../analysis/classic-couplings.js';
import type { CouplingAsymmetry } from '../analysis/coupling-asymmetry.js';
import { staticKl, type TakeFactors } from '../analysis/factors.js';
import { DEFAULT_PAIRS, MOTION_NODES, pairIndex } from '../motion/roles.js';
import { htmlPage, htmlTable } from './html.js';
import { SIDE_STYLE } from './gait-html.js';
import { escapeXml, linePlotSvg } from './svg.js';
import { viridis } from './viridis.js';

/** The nodes whose couples score each joint (src/analysis/coupling-asymmetry.ts). */
const CARRIED: Record<string, string> = { hip: 'knee', knee: 'ankle', ankle: 'toe', 'shoulder/arm': 'elbow, wrist' };

/** What the coupling report shows. */
export interface CouplingReportData {
  file: string;
  model: string;
  version: string;
  factors: TakeFactors;
  /** Dynamic factors binned over the gait cycle (bins × pairs × D). */
  cycle: { mean: Float64Array; bins: number };
  asymmetry: CouplingAsymmetry | null;
  classic: ClassicCouplings;
  /** Classic symmetry indices of the gait parameters, %, by measure. */
  symmetryIndex: Record<string, number | null>;
  /** The gait analysis's low-pass filter behind the classic measures and symmetry indices (cutoff in Hz, null when off). */
  filter: { lowpass_hz: number | null; filter: string };
  /** Set when the take lies outside the model's straight-walking domain (src/model/domain.ts). */
  domainWarning?: string | null;
}

/** Returns the SVG heat matrix of static coupling (row: sender, column: receiver). */
function heatMatrixSvg(f: TakeFactors): string {
  const N = MOTION_NODES.length, cell = 26, left = 92, top = 92, size = N * cell;
  const values = Array.from({ length: f.pairs }, (_, p) => staticKl(f, p));
  const lo = Math.min(...values), hi = Math.max(...values), span = hi - lo || 1;
  const rgb = [0, 0, 0];
  const hex = (t: number) => { viridis(t, rgb); return `rgb(${rgb.map((c) => Math.round(c * 255)).join(',')})`; };
  const parts: string[] = [];
  for (let i = 0; i < N; i++)
    for (let j = 0; j < N; j++) {
      const x = left + j * cell, y = top + i * cell;
      if (i === j) { parts.push(`<rect x="${x}" y="${y}" width="${cell}" height="${cell}" fill="#f3f5f9"/>`); continue; }
      const v = values[pairIndex(i, j, N)]!;
      parts.push(`<rect x="${x}" y="${y}" width="${cell}" height="${cell}" fill="${hex((v - lo) / span)}"><title>${escapeXml(`${MOTION_NODES[i]} → ${MOTION_NODES[j]}: ${v.toFixed(3)} nats`)}</title></rect>`);
    }
  const label = (n: number) => MOTION_NODES[n]!;
  for (let n = 0; n < N; n++) {
    parts.push(`<text class="tick" x="${left - 6}" y="${top + n * cell + cell * 0.65}" text-anchor="end">${label(n)}</text>`);
    parts.push(`<text class="tick" transform="translate(${left + n * cell + cell * 0.6},${top - 6}) rotate(-60)">${label(n)}</text>`);
  }
  // Colour legend.
  const ly = top + size + 18;
  for (let k = 0; k < 100; k++) parts.push(`<rect x="${left + (k * size) / 100}" y="${ly}" width="${size / 100 + 0.5}" height="10" fill="${hex(k / 99)}"/>`);
  parts.push(`<text class="tick" x="${left}" y="${ly + 24}">${lo.toFixed(3)}</text><text class="tick" x="${left + size}" y="${ly + 24}" text-anchor="end">${hi.toFixed(3)} nats (viridis)</text>`);
  const W = left + size + 12, H = ly + 32;
  return `<svg class="plot" viewBox="0 0 ${W} ${H}" style="max-width:${W}px" role="img" aria-label="Static coupling heat matrix"><text class="plot-title" x="8" y="18">Static coupling, sender (row) → receiver (column)</text>${parts.join('')}</svg>`;
}

/** Returns the plots of each dynamic dimension over the gait cycle for pair p and its mirror. */
function dynamicPlots(d: CouplingReportData, p: number): string {
  const f = d.factors, P = f.pairs, D = f.dynamicDims, B = d.cycle.bins, m = DEFAULT_PAIRS.mirror[p]!;
  const x = Array.from({ length: B }, (_, b) => (100 * (b + 0.5)) / B);
  const series = (q: number, dim: number) => Array.from({ length: B }, (_, b) => d.cycle.mean[(b * P + q) * D + dim]!);
  const name = (q: number) => `${MOTION_NODES[DEFAULT_PAIRS.sender[q]!]}→${MOTION_NODES[DEFAULT_PAIRS.receiver[q]!]}`;
  const leftFirst = MOTION_NODES[DEFAULT_PAIRS.sender[p]!]!.startsWith('r_') ? [m, p] : [p, m];
  const plots: string[] = [];
  for (let dim = 0; dim < D; dim++)
    plots.push(linePlotSvg({
      title: `Dynamic factor ${dim + 1}${dim < 2 ? (dim === 0 ? ' (tied to sin of the phase)' : ' (tied to cos of the phase)') : ''}`,
      xLabel: 'gait cycle, % (each pair on its sender\'s side)', yLabel: 'posterior mean', x,
      series: leftFirst.map((q, k) => ({ label: name(q), y: series(q, dim), colour: k === 0 ? SIDE_STYLE.left.colour : SIDE_STYLE.right.colour, dash: k === 0 ? SIDE_STYLE.left.dash : SIDE_STYLE.right.dash })),
    }));
  return plots.join('\n');
}

/** Returns the classic relative-phase curves, left against right, per pair. */
function relativePhasePlots(c: ClassicCouplings): string {
  const names = [...new Set(c.pairs.map((p) => p.name))];
  return names.map((name) => {
    const sides = c.pairs.filter((p) => p.name === name);
    const n = sides[0]?.crp.mean.length ?? 0;
    return linePlotSvg({
      title: `Continuous relative phase, ${name}`, xLabel: 'gait cycle, %', yLabel: 'CRP, °',
      x: Array.from({ length: n }, (_, i) => (100 * i) / Math.max(1, n - 1)),
      series: sides.map((s) => ({ label: `${s.side} (${s.cycles} cycles)`, y: s.crp.mean.map((v) => (v === null ? NaN : v)), colour: SIDE_STYLE[s.side].colour, dash: SIDE_STYLE[s.side].dash })),
    });
  }).join('\n');
}

/** Returns the coupling report as one self-contained HTML page. */
export function couplingReportHtml(d: CouplingReportData, caution: string): string {
  const a = d.asymmetry, f = d.factors;
  const top = a ? a.ranked[0]! : null;
  const topIndex = top ? Array.from({ length: f.pairs }, (_, p) => p).find((p) => `${MOTION_NODES[DEFAULT_PAIRS.sender[p]!]}→${MOTION_NODES[DEFAULT_PAIRS.receiver[p]!]}` === top.pair) ?? 0 : 0;
  const fx = (v: number | null | undefined, k = 2) => (v === null || v === undefined || !Number.isFinite(v) ? null : v.toFixed(k));
  const body = [
    d.domainWarning ? `<p class="warn">${escapeXml(d.domainWarning.charAt(0).toUpperCase() + d.domainWarning.slice(1))}.</p>` : '',
    '<h2>Coupling asymmetry</h2>',
    a ? `<p>${escapeXml(a.summary)}</p>` : '<p class="warn">The model file holds no normative coupling figures, so no asymmetry is scored.</p>',
    a ? htmlTable(['pair', 'mirror', 'score', '95 % low', '95 % high', 'side farther from the cohort'], a.ranked.slice(0, 12).map((r) => [r.pair, r.mirror, fx(r.score), fx(r.ciLow), fx(r.ciHigh), { raw: r.side === 'midline' ? 'midline' : `<span class="side-${r.side}">${r.side}</span>` }])) : '',
    a ? `<p class="sub">${a.jointScores ? `Joint and side named by the learned joint discriminant of the model file (fitted on invented development walkers): the impairment class whose pattern of couple differences the take's resembles most, on either side.${a.pattern ? ` The best-fitting class is one of no single joint, ${escapeXml(a.pattern)}: the take score is its evidence, and the joint named is the best of the joint classes below.` : ''}` : 'Joint named by the mean couple score of the nodes each joint carries.'}</p>` : '',
    a ? htmlTable(['joint', ...(a.jointScores ? ['discriminant score'] : []), 'scored by the nodes it carries', 'mean couple score'], Object.entries(a.joints).map(([k, v]) => [k, ...(a.jointScores ? [fx(a.jointScores[k as keyof typeof a.jointScores])] : []), CARRIED[k] ?? '', fx(v)])) : '',
    '<p class="sub">Pair score: RMS over factor dimensions of the pair-minus-mirror difference of the static factors, z-scored against the model\'s normative cohort. Take score: with the learned discriminant, its evidence (log-likelihood ratio of the best-matching one-sided impairment against a normal take; above 0 the impairment fits better), else the mean of the five highest pair scores. Intervals: bootstrap over blocks of windows.</p>',
    '<h2>Static coupling</h2>',
    `<p class="sub">${f.windowEnds.length} windows of 2 s, one every ${(f.times[1] !== undefined ? f.times[1] - f.times[0]! : 0.5).toFixed(2)} s. Colour: information in each ordered pair's static factors (KL of the posterior from the prior).</p>`,
    `<div>${heatMatrixSvg(f)}</div>`,
    `<h2>Gait-phase factors of ${escapeXml(top ? `${top.pair} and ${top.mirror}` : 'the first pair')}</h2>`,
    `<div class="grid-plots">${dynamicPlots(d, topIndex)}</div>`,
    '<h2>Classic coupling measures</h2>',
    `<div class="grid-plots">${relativePhasePlots(d.classic)}</div>`,
    htmlTable(['pair', 'relative phase MARP L−R, °', '95 %', 'coupling angle RMS L−R, °', '95 %'], d.classic.asymmetry.map((x) => [
      x.pair, fx(x.left_vs_right.crp_marp_diff, 1), x.ci?.crp_marp_diff ? `${x.ci.crp_marp_diff[0].toFixed(1)} to ${x.ci.crp_marp_diff[1].toFixed(1)}` : null,
      fx(x.left_vs_right.vc_angle_rms_diff, 1), x.ci?.vc_angle_rms_diff ? `${x.ci.vc_angle_rms_diff[0].toFixed(1)} to ${x.ci.vc_angle_rms_diff[1].toFixed(1)}` : null,
    ])),
    '<h2>Symmetry indices of the gait parameters</h2>',
    htmlTable(['measure', 'symmetry index, %'], Object.entries(d.symmetryIndex).map(([k, v]) => [k.replace(/_/g, ' '), fx(v, 1)])),
    `<p class="sub">Methods: ${escapeXml(Object.values(d.classic.method).join(' · '))}</p>`,
    `<dl class="facts"><dt>Low-pass filter</dt><dd>${d.filter.lowpass_hz === null ? 'off' : `${d.filter.lowpass_hz} Hz, ${escapeXml(d.filter.filter)}`}, on joint positions, before the gait events, joint angles, classic measures and symmetry indices; the coupling model reads the unfiltered take resampled to its rate</dd></dl>`,
  ].join('\n');
  return htmlPage({
    title: `Joint coupling: ${d.file}`,
    subtitle: `coupling model ${d.model}`,
    caution, body,
    footer: `jointloom ${d.version} · coupling report · subjects are pseudonymous IDs`,
  });
}
