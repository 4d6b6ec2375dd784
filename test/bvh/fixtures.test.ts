// Each real-exporter layout variant in test/fixtures/bvh parses to the take its text spells.
// Expected numbers are read by hand off the fixture text; FK positions are hand-computed with
// active right-handed rotations, R = R_A·R_B·R_C for channel order A B C (the BVH convention,
// common practice), and the rule that position channels replace the OFFSET (docs §3).
import { describe, expect, it } from 'vitest';
import { readBvhFile } from '../../src/bvh/parse.js';
import { frameRate, type Take } from '../../src/bvh/take.js';
import { forwardKinematics } from '../../src/skeleton/fk.js';
import { expectSameTake, fixturePath, parseFixture } from './support.js';

const ZXY = ['Zrotation', 'Xrotation', 'Yrotation'];
const POS = ['Xposition', 'Yposition', 'Zposition'];

/** Returns the world position of joint `j` at frame `f` from a FK array. */
function at(take: Take, fk: Float64Array, f: number, j: number): number[] {
  const o = (f * take.joints.length + j) * 3;
  return [fk[o]!, fk[o + 1]!, fk[o + 2]!];
}

/** Asserts a 3-vector is within 1e-9 of a hand-computed one. */
function expectNear(actual: number[], expected: number[]): void {
  expect(actual.length).toBe(3);
  for (let k = 0; k < 3; k++) expect(actual[k]).toBeCloseTo(expected[k]!, 9);
}

describe('layout variants of one small take (tabs, spaces, CRLF, no final newline, BOM)', () => {
  const variants = ['tabs.bvh', 'spaces.bvh', 'crlf.bvh', 'no-final-newline.bvh', 'bom.bvh'];
  // Values as written in the fixture text (spaces.bvh writes "1.50", "4.00": the same doubles).
  const frames = [
    [8.03, 35.01, 88.36, -3.41, 14.78, -164.35, -3.12, -7.23, 0.25, 1.5, -2.75, 4],
    [8.33, 35.02, 87.99, -3.42, 14.8, -164.3, -3.1, -7.2, 0.3, 1.55, -2.7, 4.1],
    [8.6, 35.03, 87.6, -3.45, 14.83, -164.25, -3.05, -7.15, 0.35, 1.6, -2.65, 4.2],
  ];
  for (const name of variants) {
    it(`${name}: skeleton, channels, frames and values`, () => {
      const t = parseFixture(name);
      expect(t.joints.map((j) => j.name)).toEqual(['Hips', 'Chest', 'Chest_End', 'LeftHip', 'LeftHip_End']);
      expect(t.joints.map((j) => j.parent)).toEqual([-1, 0, 1, 0, 3]);
      expect(t.joints.map((j) => j.endSite)).toEqual([false, false, true, false, true]);
      expect(t.joints.map((j) => j.offset)).toEqual([[0, 0, 0], [0, 5.21, 0], [0, 10.5, 0], [3.91, 0, 0], [0, -18.34, 0]]);
      expect(t.joints[0]!.channels).toEqual([...POS, ...ZXY]);
      expect(t.joints[1]!.channels).toEqual(ZXY);
      expect(t.joints[2]!.channels).toEqual([]);
      expect(t.joints.map((j) => j.channelStart)).toEqual([0, 6, 9, 9, 12]);
      expect(t.joints.map((j) => j.line)).toEqual([2, 6, 10, 15, 19]);
      expect(t.channelCount).toBe(12);
      expect(t.frameCount).toBe(3);
      expect(t.headerFrameCount).toBe(3);
      expect(t.frameTime).toBe(0.033333);
      expect(Array.from(t.values)).toEqual(frames.flat());
      expect(t.warnings).toEqual([]);
    });
  }
  it('all five variants give the same take', () => {
    const ref = parseFixture('tabs.bvh');
    for (const name of variants) expectSameTake(parseFixture(name), ref, true);
  });
  it('reading the variants from disk gives the in-memory result', () => {
    for (const name of variants) expectSameTake(readBvhFile(fixturePath(name), { file: name }), parseFixture(name), true);
  });
});

describe('number spellings', () => {
  it('negative-zero.bvh keeps the sign of -0, -0.0, -0.000, -0e5 in offsets and values', () => {
    const t = parseFixture('negative-zero.bvh');
    // IEEE 754: -0 is a distinct value; Object.is tells it from +0 (ECMAScript SameValue).
    const isNeg0 = (v: number) => Object.is(v, -0);
    const isPos0 = (v: number) => Object.is(v, 0);
    expect(t.joints.map((j) => j.name)).toEqual(['Pelvis', 'Tail', 'Tail_End']);
    expect(t.joints[0]!.offset.map(isNeg0)).toEqual([true, false, true]);
    expect(isPos0(t.joints[0]!.offset[1])).toBe(true);
    expect(isPos0(t.joints[1]!.offset[0])).toBe(true);
    expect(isNeg0(t.joints[1]!.offset[1])).toBe(true);
    expect(t.joints[1]!.offset[2]).toBe(2);
    expect(isNeg0(t.joints[2]!.offset[0])).toBe(true);
    const v = Array.from(t.values);
    expect(v.length).toBe(12);
    // Row 1: -0 0 -0.0 -0.000 0.0 -1
    expect([isNeg0(v[0]!), isPos0(v[1]!), isNeg0(v[2]!), isNeg0(v[3]!), isPos0(v[4]!)]).toEqual([true, true, true, true, true]);
    expect(v[5]).toBe(-1);
    // Row 2: 0 -0 1 -0e5 -0.0e-3 -0.5
    expect([isPos0(v[6]!), isNeg0(v[7]!), v[8] === 1, isNeg0(v[9]!), isNeg0(v[10]!), v[11] === -0.5]).toEqual([true, true, true, true, true, true]);
  });

  it('scientific.bvh reads e/E exponents with and without signs, exactly as Number() does', () => {
    const t = parseFixture('scientific.bvh');
    // Reference: ECMAScript Number() of the same spelling (the correctly rounded double).
    expect(t.joints[0]!.offset).toEqual([Number('1e-3'), Number('2.5E+01'), Number('-4.5e2')]);
    expect(t.joints[0]!.offset).toEqual([0.001, 25, -450]);
    expect(t.joints[1]!.offset).toEqual([0, 10, 3]);
    expect(t.joints[2]!.offset).toEqual([0, 12.5, 0]);
    expect(t.frameTime).toBe(Number('8.342e-3'));
    const text = [
      '1e-3 2.5E+01 -4.5e2 1E0 -1.5e-2 6.02e2 7e+0 -0.5E1 1.000e-10',
      '3.5e-300 1.5e308 -2.5E-05 0 12e3 -9.99E2 1e0 0.1e1 5E-1',
    ];
    const expected = text.join(' ').split(' ').map(Number);
    expect(Array.from(t.values)).toEqual(expected);
    expect(t.values[9]).toBe(3.5e-300);
    expect(t.values[10]).toBe(1.5e308);
    expect(t.frameCount).toBe(2);
    expect(t.warnings).toEqual([]);
  });
});

describe('tree shapes', () => {
  it('end-sites.bvh: End Sites with zero and non-zero offsets become channel-less joints named <parent>_End', () => {
    const t = parseFixture('end-sites.bvh');
    expect(t.joints.map((j) => j.name)).toEqual(['Hips', 'Head', 'Head_End', 'LeftFoot', 'LeftFoot_End']);
    expect(t.joints.map((j) => j.parent)).toEqual([-1, 0, 1, 0, 3]);
    expect(t.joints.map((j) => j.endSite)).toEqual([false, false, true, false, true]);
    expect(t.joints[2]!.offset).toEqual([0, 0, 0]);
    expect(t.joints[4]!.offset).toEqual([0, -4, 12.5]);
    expect(t.joints[2]!.channels).toEqual([]);
    expect(t.joints[4]!.channels).toEqual([]);
    // An End Site's channelStart is the running count at its place (no channels of its own).
    expect(t.joints.map((j) => j.channelStart)).toEqual([0, 3, 6, 6, 9]);
    expect(t.channelCount).toBe(9);
    expect(Array.from(t.values)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    // Rest pose, hand-computed: Head_End sits on Head (zero offset), LeftFoot_End = (8,-80,0)+(0,-4,12.5).
    const zero: Take = { ...t, values: new Float64Array(9) };
    const fk = forwardKinematics(zero);
    expectNear(at(t, fk, 0, 2), [0, 30, 0]);
    expectNear(at(t, fk, 0, 4), [8, -84, 12.5]);
  });

  it('joint-effectors.bvh: leaf JOINTs with 0 and with 3 channels are ordinary joints, not End Sites', () => {
    const t = parseFixture('joint-effectors.bvh');
    expect(t.joints.map((j) => j.name)).toEqual(['Hips', 'LeftAnkle', 'LeftToe', 'RightAnkle', 'RightToe']);
    expect(t.joints.map((j) => j.parent)).toEqual([-1, 0, 1, 0, 3]);
    expect(t.joints.map((j) => j.endSite)).toEqual([false, false, false, false, false]);
    expect(t.joints[2]!.channels).toEqual([]);
    expect(t.joints[4]!.channels).toEqual(ZXY);
    expect(t.joints.map((j) => j.channelStart)).toEqual([0, 6, 9, 9, 12]);
    expect(t.joints[2]!.offset).toEqual([0, -6, 14]);
    expect(t.channelCount).toBe(15);
    expect(t.frameCount).toBe(2);
    expect(Array.from(t.values.subarray(15))).toEqual([0.5, 90.5, 1, 0, 0, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19]);
    // Frame 0: root at (0,90,0), no root rotation; LeftAnkle Z=1 X=2 Y=3 only turns what hangs below it.
    const fk = forwardKinematics(t);
    expectNear(at(t, fk, 0, 0), [0, 90, 0]);
    expectNear(at(t, fk, 0, 1), [9, 5, 0]);
    expectNear(at(t, fk, 0, 3), [-9, 5, 0]);
  });

  it('names.bvh: names are the rest of the line, so colons, dots and spaces survive', () => {
    const t = parseFixture('names.bvh');
    expect(t.joints.map((j) => j.name)).toEqual([
      'rig:Hips',
      'rig:hip.L',
      'rig:knee.L',
      'rig:knee.L_End',
      'Right Upper Leg',
      'body.v2:Right_Knee.001',
      'body.v2:Right_Knee.001_End',
    ]);
    expect(t.joints.map((j) => j.parent)).toEqual([-1, 0, 1, 2, 0, 4, 5]);
    expect(t.channelCount).toBe(15);
    expect(Array.from(t.values)).toEqual([0, 0, 0, 1, 1, 1, 2, 2, 2, 3, 3, 3, 4, 4, 4]);
    expect(t.warnings).toEqual([]);
  });

  it('multi-root.bvh: a second ROOT starts a second tree whose channels follow the first', () => {
    const t = parseFixture('multi-root.bvh');
    expect(t.joints.map((j) => j.name)).toEqual(['Walker', 'Torso', 'Torso_End', 'Cane', 'Cane_End']);
    expect(t.joints.map((j) => j.parent)).toEqual([-1, 0, 1, -1, 3]);
    expect(t.joints.map((j) => j.channelStart)).toEqual([0, 6, 9, 9, 15]);
    expect(t.joints[3]!.offset).toEqual([40, 0, 0]);
    expect(t.channelCount).toBe(15);
    expect(t.frameCount).toBe(2);
    // Frame 1: the cane at (41,0,5) yawed 10 degrees about Y: tip = (41,0,5) + Ry(10)·(0,90,0) = (41,90,5).
    const fk = forwardKinematics(t);
    expectNear(at(t, fk, 1, 3), [41, 0, 5]);
    expectNear(at(t, fk, 1, 4), [41, 90, 5]);
    // The walker's root is at (1,100,0) unrotated, so its torso sits at (1,120,0); the torso's own
    // Z=1 X=2 Y=3 only turns the end below it, which stays 30 away.
    expectNear(at(t, fk, 1, 1), [1, 120, 0]);
    const end = at(t, fk, 1, 2);
    expect(Math.hypot(end[0]! - 1, end[1]! - 120, end[2]!)).toBeCloseTo(30, 9);
  });
});

describe('channel orders and position channels (FK at hand-computed frames)', () => {
  it('mixed-orders.bvh: XYZ, ZXY, ZYX and YXZ in one file are kept per joint and composed in file order', () => {
    const t = parseFixture('mixed-orders.bvh');
    expect(t.joints.map((j) => j.name)).toEqual(['Pelvis', 'SpineA', 'SpineA_End', 'LegA', 'LegA_End', 'LegB', 'LegB_End']);
    expect(t.joints[0]!.channels).toEqual([...POS, 'Xrotation', 'Yrotation', 'Zrotation']);
    expect(t.joints[1]!.channels).toEqual(['Zrotation', 'Xrotation', 'Yrotation']);
    expect(t.joints[3]!.channels).toEqual(['Zrotation', 'Yrotation', 'Xrotation']);
    expect(t.joints[5]!.channels).toEqual(['Yrotation', 'Xrotation', 'Zrotation']);
    expect(t.joints.map((j) => j.channelStart)).toEqual([0, 6, 9, 9, 12, 12, 15]);
    const fk = forwardKinematics(t);
    // Frame 0, all zero: ends at their rest places.
    expectNear(at(t, fk, 0, 2), [0, 20, 0]);
    expectNear(at(t, fk, 0, 4), [5, -10, 0]);
    // Frame 1. Rx90:(x,y,z)->(x,-z,y); Ry90:(x,y,z)->(z,y,-x); Rz90:(x,y,z)->(-y,x,z).
    // SpineA ZXY Z=90 X=90: Rz90·Rx90·(0,10,0) = Rz90·(0,0,10) = (0,0,10) -> end (0,10,10).
    expectNear(at(t, fk, 1, 2), [0, 10, 10]);
    // LegA ZYX Z=0 Y=90 X=90: Ry90·Rx90·(0,-10,0) = Ry90·(0,0,-10) = (-10,0,0) -> end (-5,0,0).
    expectNear(at(t, fk, 1, 4), [-5, 0, 0]);
    // LegB YXZ Y=90 X=0 Z=90: Ry90·Rz90·(0,-10,0) = Ry90·(10,0,0) = (0,0,-10) -> end (-5,0,-10).
    expectNear(at(t, fk, 1, 6), [-5, 0, -10]);
    // Frame 2, root X=90 only: SpineA_End = Rx90·(0,20,0) = (0,0,20); LegA_End = (5,0,0) + Rx90·(0,-10,0) = (5,0,-10).
    expectNear(at(t, fk, 2, 2), [0, 0, 20]);
    expectNear(at(t, fk, 2, 4), [5, 0, -10]);
  });

  it('position-channels.bvh: 6-channel joints whose positions repeat the OFFSET come out at human size, not doubled', () => {
    const t = parseFixture('position-channels.bvh');
    expect(t.joints.map((j) => j.name)).toEqual(['Hips', 'Spine', 'Head', 'Head_End', 'LeftHip', 'LeftHip_End']);
    expect(t.joints.map((j) => j.parent)).toEqual([-1, 0, 1, 2, 0, 4]);
    expect(t.joints[1]!.channels).toEqual([...POS, ...ZXY]);
    expect(t.joints[4]!.channels).toEqual([...POS, ...ZXY]);
    expect(t.joints.map((j) => j.channelStart)).toEqual([0, 6, 12, 15, 15, 21]);
    expect(t.channelCount).toBe(21);
    expect(t.joints[1]!.offset).toEqual([0, 10, 0]);
    const fk = forwardKinematics(t);
    // Frame 0: replace rule gives Spine 10 above the hips (adding would give 20).
    expectNear(at(t, fk, 0, 0), [0, 90, 0]);
    expectNear(at(t, fk, 0, 1), [0, 100, 0]);
    expectNear(at(t, fk, 0, 2), [0, 120, 0]);
    expectNear(at(t, fk, 0, 3), [0, 135, 0]);
    expectNear(at(t, fk, 0, 4), [10, 90, 0]);
    expectNear(at(t, fk, 0, 5), [10, 50, 0]);
    // Frame 1: root at (5,90,0) with Z=90; Head Z=-90 undoes it.
    // Spine = (5,90,0)+Rz90·(0,10,0) = (-5,90,0); Head = Spine+Rz90·(0,20,0) = (-25,90,0);
    // Head_End = Head + I·(0,15,0); LeftHip = (5,90,0)+Rz90·(10,0,0) = (5,100,0); its end +Rz90·(0,-40,0) = (45,100,0).
    expectNear(at(t, fk, 1, 0), [5, 90, 0]);
    expectNear(at(t, fk, 1, 1), [-5, 90, 0]);
    expectNear(at(t, fk, 1, 2), [-25, 90, 0]);
    expectNear(at(t, fk, 1, 3), [-25, 105, 0]);
    expectNear(at(t, fk, 1, 4), [5, 100, 0]);
    expectNear(at(t, fk, 1, 5), [45, 100, 0]);
    // Frame 2: Spine's channel says 12, its OFFSET 10: the channel wins (Spine at 102, not 112).
    expectNear(at(t, fk, 2, 1), [0, 102, 0]);
    expectNear(at(t, fk, 2, 3), [0, 137, 0]);
  });

  it('standing-height.bvh: root OFFSET holding the standing height plus root position channels is not doubled', () => {
    const t = parseFixture('standing-height.bvh');
    expect(t.joints.map((j) => j.name)).toEqual(['Hips', 'LeftUpLeg', 'LeftLeg', 'LeftFoot', 'LeftFoot_End', 'RightUpLeg', 'RightUpLeg_End']);
    expect(t.joints.map((j) => j.parent)).toEqual([-1, 0, 1, 2, 3, 0, 5]);
    expect(t.joints[0]!.offset).toEqual([0, 95, 0]);
    expect(t.channelCount).toBe(18);
    expect(t.frameTime).toBe(0.008333);
    const fk = forwardKinematics(t);
    // Frame 0: hips 95 high (not 190), feet on the floor: 95 - 45 - 42 - 8 = 0.
    expectNear(at(t, fk, 0, 0), [0, 95, 0]);
    expectNear(at(t, fk, 0, 3), [9, 8, 0]);
    expectNear(at(t, fk, 0, 4), [9, 0, 0]);
    expectNear(at(t, fk, 0, 6), [-9, 0, 0]);
    // Frame 1: LeftUpLeg X=90 (Rx90·(0,-45,0) = (0,0,-45)), LeftLeg X=-90 undoes it.
    expectNear(at(t, fk, 1, 2), [9, 95, -45]);
    expectNear(at(t, fk, 1, 3), [9, 53, -45]);
    expectNear(at(t, fk, 1, 4), [9, 45, -45]);
  });
});

describe('frame header and frame time', () => {
  it('header-frames-one-more.bvh: header claims one frame more than the data: warning, data used', () => {
    const t = parseFixture('header-frames-one-more.bvh');
    expect(t.frameCount).toBe(3);
    expect(t.headerFrameCount).toBe(4);
    expect(Array.from(t.values)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect(t.warnings.length).toBe(1);
    expect(t.warnings[0]).toContain('header-frames-one-more.bvh');
    expect(t.warnings[0]).toMatch(/4 frames/);
    expect(t.warnings[0]).toMatch(/3 frame lines/);
  });

  it('header-frames-one-less.bvh: header claims one frame fewer than the data: warning, data used', () => {
    const t = parseFixture('header-frames-one-less.bvh');
    expect(t.frameCount).toBe(3);
    expect(t.headerFrameCount).toBe(2);
    expect(t.values.length).toBe(9);
    expect(t.warnings.length).toBe(1);
    expect(t.warnings[0]).toMatch(/2 frames/);
    expect(t.warnings[0]).toMatch(/3 frame lines/);
  });

  it('frame-time.bvh: frame time 0.008342 s is kept exactly (about 119.88 Hz)', () => {
    const t = parseFixture('frame-time.bvh');
    expect(t.frameTime).toBe(0.008342);
    // 1 / 0.008342 = 119.875329... Hz (hand-computed).
    expect(frameRate(t)).toBeCloseTo(119.8753, 4);
    expect(Array.from(t.values)).toEqual([0, 0, 0, 0.1, 0.2, 0.3]);
  });
});

describe('every fixture at a glance', () => {
  // Counted by hand on each file: [joints incl. End Sites, channels, frames, warnings].
  const SHAPES: Record<string, [number, number, number, number]> = {
    'tabs.bvh': [5, 12, 3, 0],
    'spaces.bvh': [5, 12, 3, 0],
    'crlf.bvh': [5, 12, 3, 0],
    'no-final-newline.bvh': [5, 12, 3, 0],
    'bom.bvh': [5, 12, 3, 0],
    'negative-zero.bvh': [3, 6, 2, 0],
    'scientific.bvh': [3, 9, 2, 0],
    'end-sites.bvh': [5, 9, 1, 0],
    'joint-effectors.bvh': [5, 15, 2, 0],
    'names.bvh': [7, 15, 1, 0],
    'mixed-orders.bvh': [7, 15, 3, 0],
    'position-channels.bvh': [6, 21, 3, 0],
    'standing-height.bvh': [7, 18, 2, 0],
    'header-frames-one-more.bvh': [2, 3, 3, 1],
    'header-frames-one-less.bvh': [2, 3, 3, 1],
    'frame-time.bvh': [2, 3, 2, 0],
    'multi-root.bvh': [5, 15, 2, 0],
  };
  for (const [name, [joints, channels, frames, warnings]] of Object.entries(SHAPES)) {
    it(`${name}: ${joints} joints, ${channels} channels, ${frames} frames, ${warnings} warnings`, () => {
      const t = parseFixture(name);
      expect([t.joints.length, t.channelCount, t.frameCount, t.warnings.length]).toEqual([joints, channels, frames, warnings]);
      expect(t.values.length).toBe(channels * frames);
      // Parents precede children (depth-first file order) and End Sites carry no channels.
      t.joints.forEach((j, i) => {
        expect(j.parent).toBeLessThan(i);
        if (j.endSite) expect(j.channels).toEqual([]);
      });
    });
  }
});
