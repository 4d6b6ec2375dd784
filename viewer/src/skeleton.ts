// The recorded skeleton: bones as wide lines (left solid teal, right dashed orange, trunk grey) and
// joints as small spheres; one display frame at a time, written into existing buffers (no allocation).
import { Color, Group, InstancedMesh, type InterleavedBufferAttribute, MeshLambertMaterial, SphereGeometry } from 'three';
import { LineMaterial } from 'three/addons/lines/LineMaterial.js';
import { LineSegments2 } from 'three/addons/lines/LineSegments2.js';
import { LineSegmentsGeometry } from 'three/addons/lines/LineSegmentsGeometry.js';
import type { ViewSide, ViewTake } from '../../src/view/types.js';
import { CENTRE_COLOUR, LEFT_COLOUR, RIGHT_COLOUR } from './colours.js';

interface BoneSet {
  lines: LineSegments2;
  /** Joint index pairs (parent, child), flattened. */
  ends: Int32Array;
  buffer: Float32Array;
  attr: InterleavedBufferAttribute;
}

const SIDE_COLOUR: Record<ViewSide, number> = { left: LEFT_COLOUR, right: RIGHT_COLOUR, centre: CENTRE_COLOUR };

export class SkeletonView {
  readonly group = new Group();
  readonly materials: LineMaterial[] = [];
  private readonly sets: BoneSet[] = [];
  private readonly joints: InstancedMesh;
  private readonly J: number;

  constructor(private readonly take: ViewTake, private readonly positions: Float32Array) {
    this.J = take.joints.length;
    for (const side of ['centre', 'left', 'right'] as const) {
      const ends: number[] = [];
      take.joints.forEach((j, i) => {
        if (j.parent >= 0 && j.side === side) ends.push(j.parent, i);
      });
      if (!ends.length) continue;
      const geometry = new LineSegmentsGeometry();
      geometry.setPositions(new Float32Array(ends.length * 3));
      const material = new LineMaterial({
        color: SIDE_COLOUR[side],
        linewidth: side === 'centre' ? 4 : 4.5,
        dashed: side === 'right',
        dashSize: 0.07,
        gapSize: 0.035,
        worldUnits: false,
      });
      const lines = new LineSegments2(geometry, material);
      lines.frustumCulled = false;
      const attr = geometry.getAttribute('instanceStart') as InterleavedBufferAttribute;
      this.sets.push({ lines, ends: Int32Array.from(ends), buffer: attr.data.array as Float32Array, attr });
      this.materials.push(material);
      this.group.add(lines);
    }
    const sphere = new SphereGeometry(0.024, 14, 10);
    this.joints = new InstancedMesh(sphere, new MeshLambertMaterial({ color: 0xffffff }), this.J);
    this.joints.frustumCulled = false;
    const c = new Color();
    const m = this.joints.instanceMatrix.array as Float32Array;
    take.joints.forEach((j, i) => {
      this.joints.setColorAt(i, c.setHex(SIDE_COLOUR[j.side]));
      const s = j.endSite ? 0.6 : 1;
      m.set([s, 0, 0, 0, 0, s, 0, 0, 0, 0, s, 0, 0, 0, 0, 1], i * 16);
    });
    this.group.add(this.joints);
    this.setFrame(0);
    // Bones are rigid, so the cumulative dash distances of frame 0 hold for every frame.
    for (const s of this.sets) s.lines.computeLineDistances();
  }

  /** Writes display frame d into the line and sphere buffers. */
  setFrame(d: number): void {
    const p = this.positions, base = d * this.J * 3;
    for (const s of this.sets) {
      const e = s.ends, b = s.buffer;
      for (let k = 0; k < e.length; k++) {
        const o = base + e[k]! * 3;
        b[k * 3] = p[o]!;
        b[k * 3 + 1] = p[o + 1]!;
        b[k * 3 + 2] = p[o + 2]!;
      }
      s.attr.data.needsUpdate = true;
    }
    const m = this.joints.instanceMatrix.array as Float32Array;
    for (let j = 0; j < this.J; j++) {
      const o = base + j * 3;
      m[j * 16 + 12] = p[o]!;
      m[j * 16 + 13] = p[o + 1]!;
      m[j * 16 + 14] = p[o + 2]!;
    }
    this.joints.instanceMatrix.needsUpdate = true;
  }

  /** Writes joint j's display position at frame d into out and returns out. */
  jointAt(d: number, j: number, out: { x: number; y: number; z: number }): { x: number; y: number; z: number } {
    const o = (d * this.J + j) * 3;
    out.x = this.positions[o]!;
    out.y = this.positions[o + 1]!;
    out.z = this.positions[o + 2]!;
    return out;
  }

  /** Sets the line materials' pixel resolution (needed by wide lines after a resize). */
  setResolution(w: number, h: number): void {
    for (const m of this.materials) m.resolution.set(w, h);
  }
}
