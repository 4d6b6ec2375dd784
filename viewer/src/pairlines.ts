// The pair-line layer: one thin line per role pair, coloured by the pair's value on viridis, with a
// filter by body side. Fed by the server's pair distance spread, or by the coupling model's factor heat
// (static, or dynamic at the current window: heat.ts), swapped in with setSource.
import { Color, SRGBColorSpace, type InterleavedBufferAttribute } from 'three';
import { LineMaterial } from 'three/addons/lines/LineMaterial.js';
import { LineSegments2 } from 'three/addons/lines/LineSegments2.js';
import { LineSegmentsGeometry } from 'three/addons/lines/LineSegmentsGeometry.js';
import type { ViewPairs } from '../../src/view/types.js';
import { viridis } from '../../src/report/viridis.js';
import { pairPasses, type PairFilter } from './pairlines-filter.js';

export type { PairFilter };

export class PairLines {
  readonly lines: LineSegments2;
  readonly material: LineMaterial;
  private ends = new Int32Array(0);
  private buffer: Float32Array = new Float32Array(0);
  private attr: InterleavedBufferAttribute | null = null;
  private readonly geometry = new LineSegmentsGeometry();

  private filter: PairFilter = 'all';

  constructor(private pairs: ViewPairs, private readonly positions: Float32Array, private readonly J: number) {
    this.material = new LineMaterial({ vertexColors: true, linewidth: 1.6, transparent: true, opacity: 0.8, depthWrite: false, worldUnits: false });
    this.lines = new LineSegments2(this.geometry, this.material);
    this.lines.frustumCulled = false;
    this.lines.visible = false;
    this.lines.renderOrder = 1;
    this.setFilter('all');
  }

  /** Returns the pairs and measure drawn now. */
  get source(): ViewPairs {
    return this.pairs;
  }

  /** Draws another measure over its own pairs (the filter is kept) and returns how many are drawn. */
  setSource(pairs: ViewPairs): number {
    this.pairs = pairs;
    return this.setFilter(this.filter);
  }

  /** Keeps only the pairs that pass the filter and returns how many are drawn. */
  setFilter(filter: PairFilter): number {
    this.filter = filter;
    const kept = this.pairs.pairs.filter((p) => pairPasses(p.label, filter));
    this.ends = new Int32Array(kept.length * 2);
    const colours = new Float32Array(kept.length * 6);
    const span = this.pairs.max - this.pairs.min || 1;
    const rgb = [0, 0, 0];
    const c = new Color();
    kept.forEach((p, i) => {
      this.ends[i * 2] = p.a;
      this.ends[i * 2 + 1] = p.b;
      viridis((p.value - this.pairs.min) / span, rgb);
      // Viridis is published in sRGB; three's vertex colours are linear.
      c.setRGB(rgb[0]!, rgb[1]!, rgb[2]!, SRGBColorSpace);
      colours.set([c.r, c.g, c.b, c.r, c.g, c.b], i * 6);
    });
    this.geometry.setPositions(new Float32Array(Math.max(1, kept.length) * 6));
    this.geometry.setColors(kept.length ? colours : new Float32Array(6));
    this.geometry.instanceCount = kept.length;
    this.attr = this.geometry.getAttribute('instanceStart') as InterleavedBufferAttribute;
    this.buffer = this.attr.data.array as Float32Array;
    return kept.length;
  }

  /** Writes display frame d into the line buffer (only while shown). */
  setFrame(d: number): void {
    if (!this.lines.visible || !this.attr) return;
    const p = this.positions, b = this.buffer, e = this.ends, base = d * this.J * 3;
    for (let k = 0; k < e.length; k++) {
      const o = base + e[k]! * 3;
      b[k * 3] = p[o]!;
      b[k * 3 + 1] = p[o + 1]!;
      b[k * 3 + 2] = p[o + 2]!;
    }
    this.attr.data.needsUpdate = true;
  }
}

/** Paints the viridis bar into a 2D canvas, low values on the left. */
export function paintLegendBar(canvas: HTMLCanvasElement): void {
  const ctx = canvas.getContext('2d');
  if (!ctx) return;
  const c = [0, 0, 0];
  for (let x = 0; x < canvas.width; x++) {
    viridis(x / (canvas.width - 1), c);
    ctx.fillStyle = `rgb(${Math.round(c[0]! * 255)}, ${Math.round(c[1]! * 255)}, ${Math.round(c[2]! * 255)})`;
    ctx.fillRect(x, 0, 1, canvas.height);
  }
}
