// The strip under the scrub bar: walking passes as bands, gait events as ticks (left above, right
// below; initial contact a full tick, toe-off a short one) and the playhead.
import type { ViewEvents, ViewTake } from '../../src/view/types.js';
import { LEFT_CSS, RIGHT_CSS } from './colours.js';

export class EventStrip {
  constructor(private readonly canvas: HTMLCanvasElement, private readonly take: ViewTake, private readonly events: ViewEvents) {}

  /** Returns the display frame under a client x position. */
  frameAt(clientX: number): number {
    const r = this.canvas.getBoundingClientRect();
    const f = ((clientX - r.left) / Math.max(1, r.width)) * (this.take.displayFrames - 1);
    return Math.round(Math.min(this.take.displayFrames - 1, Math.max(0, f)));
  }

  /** Redraws the strip with the playhead at display frame d (the bands and ticks are cached per size). */
  draw(d: number): void {
    const c = this.canvas, dpr = window.devicePixelRatio || 1;
    const w = Math.max(1, Math.round(c.clientWidth * dpr)), h = Math.round(22 * dpr);
    if (c.width !== w || c.height !== h || !this.layer) {
      c.width = w;
      c.height = h;
      this.layer = this.paintLayer(w, h, dpr);
    }
    const ctx = c.getContext('2d');
    if (!ctx) return;
    ctx.clearRect(0, 0, w, h);
    ctx.drawImage(this.layer, 0, 0);
    const dur = Math.max(1e-9, (this.take.displayFrames - 1) / this.take.displayFps);
    ctx.fillStyle = '#1d2329';
    ctx.fillRect(Math.round((d / this.take.displayFps / dur) * (w - 1)) - dpr, 0, 2 * dpr, h);
  }

  private layer: HTMLCanvasElement | null = null;

  private paintLayer(w: number, h: number, dpr: number): HTMLCanvasElement {
    const layer = document.createElement('canvas');
    layer.width = w;
    layer.height = h;
    const ctx = layer.getContext('2d');
    if (!ctx) return layer;
    const dur = Math.max(1e-9, (this.take.displayFrames - 1) / this.take.displayFps);
    const x = (t: number) => (t / dur) * (w - 1);
    ctx.fillStyle = '#e4e8ec';
    for (const p of this.events.passes) ctx.fillRect(x(p.startS), 0, Math.max(1, x(p.endS) - x(p.startS)), h);
    const mid = h / 2;
    for (const e of this.events.events) {
      const left = e.side === 'left';
      ctx.strokeStyle = left ? LEFT_CSS : RIGHT_CSS;
      ctx.globalAlpha = e.steady ? 1 : 0.45;
      ctx.lineWidth = Math.max(1, dpr * (e.kind === 'initial_contact' ? 2 : 1.5));
      const len = e.kind === 'initial_contact' ? mid - 1 : (mid - 1) * 0.5;
      const xe = Math.round(x(e.time)) + 0.5;
      ctx.beginPath();
      ctx.moveTo(xe, left ? mid - len : mid);
      ctx.lineTo(xe, left ? mid : mid + len);
      ctx.stroke();
    }
    return layer;
  }
}
