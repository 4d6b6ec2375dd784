// The forecast overlay: the model's mean forecast as a violet skeleton of its 17 nodes outlined in white,
// and every sample as a faint one-pixel violet skeleton; one forecast step at a time, written into existing
// buffers (no allocation per frame). The mean is drawn over the recorded skeleton (no depth test), so
// its white outline cuts the recorded bones where the two cross and the forecast always reads whole.
import { BufferAttribute, BufferGeometry, Group, InstancedMesh, type InterleavedBufferAttribute, LineBasicMaterial, LineSegments, MeshLambertMaterial, SphereGeometry } from 'three';
import { LineMaterial } from 'three/addons/lines/LineMaterial.js';
import { LineSegments2 } from 'three/addons/lines/LineSegments2.js';
import { LineSegmentsGeometry } from 'three/addons/lines/LineSegmentsGeometry.js';
import type { ViewForecast } from '../../src/view/types.js';
import { FORECAST_COLOUR, FORECAST_OUTLINE } from './colours.js';

interface Lines {
  lines: LineSegments2;
  material: LineMaterial;
  buffer: Float32Array;
  attr: InterleavedBufferAttribute;
}

function makeLines(segments: number, material: LineMaterial, order: number): Lines {
  const geometry = new LineSegmentsGeometry();
  geometry.setPositions(new Float32Array(segments * 6));
  const lines = new LineSegments2(geometry, material);
  lines.frustumCulled = false;
  lines.renderOrder = order;
  const attr = geometry.getAttribute('instanceStart') as InterleavedBufferAttribute;
  return { lines, material, buffer: attr.data.array as Float32Array, attr };
}

/** Writes the bones of one pose (flat nodes x 3 from `src` at `base`) into `out` from segment `seg`. */
function writeBones(src: readonly number[], base: number, ends: Int32Array, out: Float32Array, seg: number): void {
  for (let k = 0; k < ends.length; k++) {
    const o = base + ends[k]! * 3, w = (seg * 2 + k) * 3;
    out[w] = src[o]!;
    out[w + 1] = src[o + 1]!;
    out[w + 2] = src[o + 2]!;
  }
}

export class ForecastView {
  readonly group = new Group();
  private readonly outline: Lines;
  private readonly mean: Lines;
  // Samples as plain 1-px GL lines: screen-space wide lines cost several times as much per segment in a
  // software renderer, and the faint samples gain nothing from width.
  private readonly spread: { lines: LineSegments; buffer: Float32Array; attr: BufferAttribute };
  private readonly joints: InstancedMesh;
  private readonly ends: Int32Array;
  private data: ViewForecast | null = null;
  private shownStep = -1;

  /** Builds the overlay for forecasts of `nodes` nodes with the given bones and at most `maxSamples` samples. */
  constructor(private readonly nodeCount: number, bones: readonly [number, number][], private readonly maxSamples: number) {
    this.ends = Int32Array.from(bones.flat());
    const B = bones.length;
    // Render order after the recorded skeleton (0): the white outline, then the violet core, then the joints.
    this.outline = makeLines(B, new LineMaterial({ color: FORECAST_OUTLINE, linewidth: 9, worldUnits: false, depthTest: false, depthWrite: false }), 3);
    this.mean = makeLines(B, new LineMaterial({ color: FORECAST_COLOUR, linewidth: 4, worldUnits: false, depthTest: false }), 4);
    // Samples are depth-tested (faint lines behind the mean stay behind it) and drawn in the transparent pass.
    const spreadBuffer = new Float32Array(B * maxSamples * 6), spreadAttr = new BufferAttribute(spreadBuffer, 3);
    const spreadGeometry = new BufferGeometry().setAttribute('position', spreadAttr);
    const spreadLines = new LineSegments(spreadGeometry, new LineBasicMaterial({ color: FORECAST_COLOUR, transparent: true, opacity: 0.45, depthWrite: false }));
    spreadLines.frustumCulled = false;
    spreadLines.renderOrder = 2;
    this.spread = { lines: spreadLines, buffer: spreadBuffer, attr: spreadAttr };
    this.joints = new InstancedMesh(new SphereGeometry(0.026, 10, 6), new MeshLambertMaterial({ color: FORECAST_COLOUR, depthTest: false }), nodeCount);
    this.joints.frustumCulled = false;
    this.joints.renderOrder = 5;
    const m = this.joints.instanceMatrix.array as Float32Array;
    for (let n = 0; n < nodeCount; n++) m.set([1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1, 0, 0, 0, 0, 1], n * 16);
    this.group.add(this.spread.lines, this.outline.lines, this.mean.lines, this.joints);
    this.group.visible = false;
  }

  /** The line materials (their pixel resolution is set on resize). */
  get materials(): LineMaterial[] {
    return [this.outline.material, this.mean.material];
  }

  /** Returns the forecast being drawn, or null. */
  get forecast(): ViewForecast | null {
    return this.data;
  }

  /** Takes a new forecast to draw (null: none); the overlay shows nothing until `setStep`. */
  setForecast(f: ViewForecast | null): void {
    this.data = f;
    this.shownStep = -1;
    this.group.visible = false;
  }

  /** Shows forecast step k (1..steps; clamped) of the current forecast, or hides the overlay when k is null. */
  setStep(k: number | null): void {
    const f = this.data;
    if (!f || k === null) {
      this.group.visible = false;
      return;
    }
    const step = Math.min(f.steps, Math.max(1, k));
    this.group.visible = true;
    if (step === this.shownStep) return;
    this.shownStep = step;
    const N = this.nodeCount, base = (step - 1) * N * 3, B = this.ends.length / 2;
    writeBones(f.mean, base, this.ends, this.mean.buffer, 0);
    this.outline.buffer.set(this.mean.buffer);
    const S = Math.min(this.maxSamples, f.samples.length);
    for (let s = 0; s < S; s++) writeBones(f.samples[s]!, base, this.ends, this.spread.buffer, s * B);
    this.spread.lines.geometry.setDrawRange(0, S * B * 2);
    const m = this.joints.instanceMatrix.array as Float32Array;
    for (let n = 0; n < N; n++) {
      m[n * 16 + 12] = f.mean[base + n * 3]!;
      m[n * 16 + 13] = f.mean[base + n * 3 + 1]!;
      m[n * 16 + 14] = f.mean[base + n * 3 + 2]!;
    }
    this.joints.instanceMatrix.needsUpdate = true;
    this.mean.attr.data.needsUpdate = true;
    this.outline.attr.data.needsUpdate = true;
    this.spread.attr.needsUpdate = true;
  }

  /** Sets the line materials' pixel resolution. */
  setResolution(w: number, h: number): void {
    for (const m of this.materials) m.resolution.set(w, h);
  }
}
