// Joint angles read back from stick figures posed with three.js rotations by known angles (three.js as the
// independent reference for the rotations), and from a small BVH whose knees are bent backwards.
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { jointAngles, wrapDeg } from '../../src/gait/angles.js';
import { prepareGait } from '../../src/gait/input.js';
import { InputError } from '../../src/errors/index.js';
import { importTake } from '../../src/skeleton/import.js';
import { figureInput } from '../fixtures/gait/pose.js';

const D = Math.PI / 180;
const FIXTURE = fileURLToPath(new URL('../fixtures/gait/knee-hyperextension.bvh', import.meta.url));

describe('sagittal joint angles of a posed figure', () => {
  it('read back each angle alone, flexion positive', () => {
    const a = jointAngles(figureInput([
      { left: { hipFlexion: 30 }, right: { hipFlexion: -15 } },
      { left: { kneeFlexion: 60 }, right: { kneeFlexion: -10 } },
      { left: { ankleDorsiflexion: 15 }, right: { ankleDorsiflexion: -20 } },
    ]));
    expect(a.left.hip_flexion[0]).toBeCloseTo(30, 9);
    expect(a.right.hip_flexion[0]).toBeCloseTo(-15, 9); // hip extension reads negative
    expect(a.left.knee_flexion[1]).toBeCloseTo(60, 9);
    expect(a.right.knee_flexion[1]).toBeCloseTo(-10, 9); // knee hyperextension reads negative
    expect(a.left.ankle_dorsiflexion[2]).toBeCloseTo(15, 9);
    expect(a.right.ankle_dorsiflexion[2]).toBeCloseTo(-20, 9); // plantarflexion reads negative
    // The other angles stay zero when only one is set.
    expect(a.left.knee_flexion[0]).toBeCloseTo(0, 9);
    expect(a.left.hip_flexion[1]).toBeCloseTo(0, 9);
  });
  it('read back hip abduction on both sides, away from the midline positive', () => {
    const a = jointAngles(figureInput([{ left: { hipAbduction: 10 }, right: { hipAbduction: 10 } }, { left: { hipAbduction: -6 } }]));
    expect(a.left.hip_abduction[0]).toBeCloseTo(10, 9);
    expect(a.right.hip_abduction[0]).toBeCloseTo(10, 9);
    expect(a.left.hip_abduction[1]).toBeCloseTo(-6, 9); // adduction reads negative
  });
  it('separate flexion from abduction as the JCS does (flexion about the pelvis axis, then the floating axis)', () => {
    // Thigh = pelvis · Ry(−35°) · Rx(12°): flexion 35°, abduction 12° exactly; knee and ankle on top, pelvis tilted.
    const a = jointAngles(figureInput([{ tilt: 9, obliquity: 4, rotation: -7, left: { hipFlexion: 35, hipAbduction: 12, kneeFlexion: 48, ankleDorsiflexion: 9 } }]));
    expect(a.left.hip_flexion[0]).toBeCloseTo(35, 9);
    expect(a.left.hip_abduction[0]).toBeCloseTo(12, 9);
    expect(a.left.knee_flexion[0]).toBeCloseTo(48, 9);
    expect(a.left.ankle_dorsiflexion[0]).toBeCloseTo(9, 9);
  });
  it('keep knee flexion and the hip angles when the hip is rotated about the thigh', () => {
    // A 20° rotation of the thigh about its long axis turns the knee's plane; hip flexion and abduction come
    // from the long axes, knee flexion from the knee plane. The hinge blend (segments.ts) tilts the axis by δ
    // towards the pelvis's left, which reads a knee angle k as about atan(tan k · cos δ). By hand for the right
    // knee (k = 8°, rotation 20°): tan δ = 0.1 sin 20° / (sin 8° + 0.1 cos 20°) = 0.0342 / 0.2331, δ = 8.35°,
    // atan(tan 8° · cos 8.35°) = 7.9164°; for the left knee (k = 40°, sin 40° in the denominator) δ = 2.66° and
    // atan(tan 40° · cos 2.66°) = 39.9696°.
    const a = jointAngles(figureInput([{ left: { hipFlexion: 25, hipAbduction: 5, hipRotation: 20, kneeFlexion: 40 }, right: { hipRotation: -20, kneeFlexion: 8 } }]));
    expect(a.left.hip_flexion[0]).toBeCloseTo(25, 9);
    expect(a.left.hip_abduction[0]).toBeCloseTo(5, 9);
    expect(a.left.knee_flexion[0]!).toBeCloseTo(39.9696, 3);
    expect(a.right.knee_flexion[0]!).toBeCloseTo(7.9164, 3);
  });
  it('subtract the rest pose so that the neutral standing pose reads zero', () => {
    // The rig's rest pose has the knees bent 5° and the hips 3°: a frame 20° beyond reads 20°.
    const rest = { left: { kneeFlexion: 5, hipFlexion: 3 }, right: { kneeFlexion: 5, hipFlexion: 3 } };
    const a = jointAngles(figureInput([rest, { left: { kneeFlexion: 25, hipFlexion: 23 } }], rest));
    expect(a.left.knee_flexion[0]).toBeCloseTo(0, 9);
    expect(a.left.knee_flexion[1]).toBeCloseTo(20, 9);
    expect(a.left.hip_flexion[1]).toBeCloseTo(20, 9);
    expect(a.restOffsets.left.knee_flexion).toBeCloseTo(5, 9);
  });
});

describe('pelvis angles and foot progression against the walking direction', () => {
  it('read back tilt, obliquity and rotation (rotation-first order) at any heading', () => {
    const heading = 37;
    const input = figureInput([{ heading, tilt: 8, obliquity: 5, rotation: 10 }, { heading, tilt: -3, obliquity: -6, rotation: -12 }]);
    const dir = new Float64Array([Math.cos(heading * D), Math.sin(heading * D), 0, Math.cos(heading * D), Math.sin(heading * D), 0]);
    const a = jointAngles(input, dir);
    expect(a.directionSource).toBe('given');
    expect(a.pelvis_tilt[0]).toBeCloseTo(8, 9); // anterior tilt positive
    expect(a.pelvis_obliquity[0]).toBeCloseTo(5, 9); // left hip up positive
    expect(a.pelvis_rotation[0]).toBeCloseTo(10, 9); // turned to the left (right hip forward) positive
    expect(a.pelvis_tilt[1]).toBeCloseTo(-3, 9);
    expect(a.pelvis_obliquity[1]).toBeCloseTo(-6, 9);
    expect(a.pelvis_rotation[1]).toBeCloseTo(-12, 9);
  });
  it('fall back to the take-mean pelvis forward when no direction is given', () => {
    // Rotations of +10° and −10° about heading 20°: the mean forward is the heading, so ±10° read back.
    const a = jointAngles(figureInput([{ heading: 20, rotation: 10 }, { heading: 20, rotation: -10 }]));
    expect(a.directionSource).toBe('pelvis mean');
    expect(a.pelvis_rotation[0]).toBeCloseTo(10, 9);
    expect(a.pelvis_rotation[1]).toBeCloseTo(-10, 9);
  });
  it('read foot progression with toe-out positive on both sides', () => {
    const a = jointAngles(figureInput([{ heading: -50, left: { toeOut: 12 }, right: { toeOut: 7 } }, { heading: -50, left: { toeOut: -5 } }]));
    expect(a.left.foot_progression[0]).toBeCloseTo(12, 9);
    expect(a.right.foot_progression[0]).toBeCloseTo(7, 9);
    expect(a.left.foot_progression[1]).toBeCloseTo(-5, 9); // toe-in reads negative
  });
  it('leave rotation and foot progression NaN where the direction is zero (not walking)', () => {
    const a = jointAngles(figureInput([{ tilt: 5 }, { tilt: 5 }]), new Float64Array([1, 0, 0, 0, 0, 0]));
    expect(a.pelvis_rotation[0]).toBeCloseTo(0, 9);
    expect(a.pelvis_rotation[1]).toBeNaN();
    expect(a.left.foot_progression[1]).toBeNaN();
    expect(a.pelvis_tilt[1]).toBeCloseTo(5, 9); // tilt does not need the direction
    expect(a.warnings.join(' ')).toMatch(/1 frames have no walking direction/);
  });
  it('read no tilt, and say so, when the skeleton has no spine or thorax joint', () => {
    const a = jointAngles(figureInput([{ tilt: 12, obliquity: 4 }], {}, { noSpine: true }));
    expect(a.pelvisUpSource).toBe('up axis');
    expect(a.pelvis_tilt[0]).toBeCloseTo(0, 9);
    expect(a.pelvis_obliquity[0]).toBeCloseTo(4, 9); // the hips line still gives obliquity
    expect(a.warnings.join(' ')).toMatch(/tilt is not measured/);
  });
  it('refuses a direction array of the wrong length', () => {
    expect(() => jointAngles(figureInput([{}]), new Float64Array(6))).toThrow(InputError);
  });
});

describe('knee hyperextension fixture (test/fixtures/gait/knee-hyperextension.bvh)', () => {
  // The file bends the knees about their own X axis (the subject's left in its Y-up, Z-forward frame), where
  // a positive rotation swings the ankle backwards: frame 1 left −12°, right +30°; frame 2 left −12°, right −5°;
  // frame 3 left +45°, right −12°. Frame 0 is the rest pose.
  const a = jointAngles(prepareGait(importTake(FIXTURE), null));
  it('reads the knees bent backwards as negative knee flexion', () => {
    expect(a.left.knee_flexion[1]).toBeCloseTo(-12, 6);
    expect(a.left.knee_flexion[2]).toBeCloseTo(-12, 6);
    expect(a.right.knee_flexion[2]).toBeCloseTo(-5, 6);
    expect(a.right.knee_flexion[3]).toBeCloseTo(-12, 6);
  });
  it('reads the bent knees as positive flexion and the rest pose as zero', () => {
    expect(a.right.knee_flexion[1]).toBeCloseTo(30, 6);
    expect(a.left.knee_flexion[3]).toBeCloseTo(45, 6);
    expect(a.left.knee_flexion[0]).toBeCloseTo(0, 9);
    expect(a.left.hip_flexion[1]).toBeCloseTo(0, 6); // the thighs do not move
  });
});

describe('wrapDeg', () => {
  it('wraps to (−180, 180]', () => {
    expect(wrapDeg(190)).toBeCloseTo(-170, 12);
    expect(wrapDeg(-180)).toBe(180);
    expect(wrapDeg(540)).toBe(180);
    expect(wrapDeg(NaN)).toBeNaN();
  });
});
