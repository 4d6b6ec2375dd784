// Segment frames from joint centres: orthonormal right-handed axes with the documented anatomical meaning.
import { describe, expect, it } from 'vitest';
import { FRAME_STRIDE, choosePelvisUp, segmentFrames, type SegmentFrames } from '../../src/gait/segments.js';
import { figureInput } from '../fixtures/gait/pose.js';

const D = Math.PI / 180;

/** Returns axis a (0 X, 1 Y, 2 Z) of a frame array at frame f. */
function axis(a: Float64Array, f: number, k: number): [number, number, number] {
  const o = f * FRAME_STRIDE + 3 + 3 * k;
  return [a[o]!, a[o + 1]!, a[o + 2]!];
}
const dot = (u: number[], v: number[]) => u[0]! * v[0]! + u[1]! * v[1]! + u[2]! * v[2]!;
const cross = (u: number[], v: number[]) => [u[1]! * v[2]! - u[2]! * v[1]!, u[2]! * v[0]! - u[0]! * v[2]!, u[0]! * v[1]! - u[1]! * v[0]!];

function allFrames(seg: SegmentFrames): Float64Array[] {
  return [seg.pelvis, ...seg.thigh, ...seg.shank, ...seg.foot];
}

describe('segment frames', () => {
  const input = figureInput([
    {},
    { heading: 37, tilt: 8, obliquity: -4, rotation: 9, left: { hipFlexion: 35, hipAbduction: 6, kneeFlexion: 62, ankleDorsiflexion: -15, toeOut: 7 }, right: { hipFlexion: -12, kneeFlexion: -8, ankleDorsiflexion: 12 } },
  ]);
  const seg = segmentFrames(input);
  it('are orthonormal and right-handed (X × Y = Z) for every segment', () => {
    for (const a of allFrames(seg))
      for (let f = 0; f < 2; f++) {
        const [x, y, z] = [axis(a, f, 0), axis(a, f, 1), axis(a, f, 2)];
        for (const v of [x, y, z]) expect(Math.hypot(...v)).toBeCloseTo(1, 12);
        expect(dot(x, y)).toBeCloseTo(0, 12);
        expect(dot(y, z)).toBeCloseTo(0, 12);
        const c = cross(x, y);
        for (let i = 0; i < 3; i++) expect(c[i]).toBeCloseTo(z[i]!, 12);
      }
  });
  it('point X forward, Y to the left and Z up at the rest pose', () => {
    // The figure stands facing +X with its left on +Y (the canonical Z-up frame).
    for (const a of allFrames(seg)) {
      expect(axis(a, 0, 0)[0]).toBeCloseTo(1, 12);
      expect(axis(a, 0, 1)[1]).toBeCloseTo(1, 12);
      expect(axis(a, 0, 2)[2]).toBeCloseTo(1, 12);
    }
  });
  it('keep the knee hinge axis to the left when the knee is bent backwards', () => {
    // Right knee hyperextended by 8°: the hip-knee-ankle plane's normal points right, the hinge is turned left.
    const y = axis(seg.thigh[1], 1, 1);
    const pelvisLeft = axis(seg.pelvis, 1, 1);
    expect(dot(y, pelvisLeft)).toBeGreaterThan(0.99);
  });
  it('take the pelvis forward from the hips line and the vertical when there is no spine joint', () => {
    // Heading 37°, obliquity 0: forward is (cos 37°, sin 37°, 0) whatever the tilt (the vertical is used).
    const flat = figureInput([{ heading: 37, tilt: 15 }], {}, { noSpine: true });
    expect(choosePelvisUp(flat).source).toBe('up axis');
    const s = segmentFrames(flat);
    const x = axis(s.pelvis, 0, 0);
    expect(x[0]).toBeCloseTo(Math.cos(37 * D), 12);
    expect(x[1]).toBeCloseTo(Math.sin(37 * D), 12);
    expect(x[2]).toBeCloseTo(0, 12);
    expect(choosePelvisUp(input)).toEqual({ source: 'spine', joint: 1 });
  });
  it('put the pelvis origin midway between the hips', () => {
    // Figure built with the hip midpoint at (0, 0, 0.95).
    const o = seg.pelvis.subarray(FRAME_STRIDE, FRAME_STRIDE + 3);
    expect(Array.from(o).map((v) => +v.toFixed(12))).toEqual([0, 0, 0.95]);
  });
});
