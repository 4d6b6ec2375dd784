// The sagittal arm angle on a hand-built input: an upper arm of length 0.3 m swung forward by a known angle in
// the vertical plane of the walking direction must read that angle (hand-derived: the elbow sits at
// shoulder + 0.3 (sin θ · d − cos θ · z)), whatever the walking direction is.
import { describe, expect, it } from 'vitest';
import { sagittalArmAngles } from '../../src/analysis/limb-angles.js';
import type { GaitInput } from '../../src/gait/input.js';
import { ROLE_NAMES, type RoleName } from '../../src/skeleton/roles.js';

const RAD = Math.PI / 180;
// Joints: 0 l_hip, 1 r_hip, 2 l_shoulder, 3 l_elbow, 4 r_shoulder, 5 r_elbow (Z up, subject's left +Y at rest).
const REST = [0, 0.1, 1, 0, -0.1, 1, 0, 0.2, 1.5, 0, 0.2, 1.2, 0, -0.2, 1.5, 0, -0.2, 1.2];

function input(anglesDeg: [number, number][], heading: number, rest = REST): { inp: GaitInput; dir: Float64Array } {
  const F = anglesDeg.length, J = 6;
  const role = Object.fromEntries(ROLE_NAMES.map((r) => [r, -1])) as Record<RoleName, number>;
  Object.assign(role, { l_hip: 0, r_hip: 1, l_shoulder: 2, l_elbow: 3, r_shoulder: 4, r_elbow: 5 });
  const dx = Math.cos(heading * RAD), dy = Math.sin(heading * RAD);
  const positions = new Float64Array(F * J * 3), dir = new Float64Array(F * 3);
  anglesDeg.forEach(([l, r], f) => {
    dir[f * 3] = dx; dir[f * 3 + 1] = dy;
    const b = f * J * 3;
    // Shoulders 0.2 m either side of the midline, across the walking direction (left = up × forward).
    const put = (j: number, x: number, y: number, z: number) => { positions[b + j * 3] = x; positions[b + j * 3 + 1] = y; positions[b + j * 3 + 2] = z; };
    for (const [sh, el, side, th] of [[2, 3, 1, l], [4, 5, -1, r]] as const) {
      const sx = -dy * 0.2 * side, sy = dx * 0.2 * side;
      put(sh, sx, sy, 1.5);
      put(el, sx + 0.3 * Math.sin(th * RAD) * dx, sy + 0.3 * Math.sin(th * RAD) * dy, 1.5 - 0.3 * Math.cos(th * RAD));
    }
  });
  dir[0] = 0; dir[1] = 0; // frame 0 has no walking direction
  const inp = { path: 'hand.bvh', fps: 100, frames: F, jointCount: J, positions, heels: new Float64Array(F * 6), role, rest: Float64Array.from(rest),
    restHeels: new Float64Array(6), legLengthM: 0.9, lowpassHz: null, toCanonical: Float64Array.from([1, 0, 0, 0, 1, 0, 0, 0, 1]) } as GaitInput;
  return { inp, dir };
}

describe('sagittalArmAngles', () => {
  for (const heading of [0, 90, 217]) {
    it(`reads the swing angle forward positive, backward negative (heading ${heading}°)`, () => {
      const frames: [number, number][] = [[0, 0], [20, -15], [-30, 25], [5, 0]];
      const { inp, dir } = input(frames, heading);
      const a = sagittalArmAngles(inp, dir);
      expect(a.restZeroed).toEqual({ left: true, right: true });
      expect(a.left[0]).toBeNaN();
      for (let f = 1; f < frames.length; f++) {
        expect(a.left[f]).toBeCloseTo(frames[f]![0], 9);
        expect(a.right[f]).toBeCloseTo(frames[f]![1], 9);
      }
    });
  }
  it('subtracts a hanging rest pose that leans forward', () => {
    const rest = REST.slice();
    rest[9] = 0.3 * Math.sin(10 * RAD); rest[11] = 1.5 - 0.3 * Math.cos(10 * RAD); // left elbow 10° forward at rest (+X forward)
    const { inp, dir } = input([[0, 0], [25, 0]], 0, rest);
    expect(sagittalArmAngles(inp, dir).left[1]).toBeCloseTo(15, 9);
  });
  it('measures from the vertical and warns when the rest pose holds the arms out (T-pose)', () => {
    const rest = REST.slice();
    rest[10] = 0.5; rest[11] = 1.5; rest[16] = -0.5; rest[17] = 1.5;
    const { inp, dir } = input([[0, 0], [25, -10]], 0, rest);
    const a = sagittalArmAngles(inp, dir);
    expect(a.restZeroed).toEqual({ left: false, right: false });
    expect(a.warnings.length).toBe(2);
    expect(a.left[1]).toBeCloseTo(25, 9);
  });
  it('reports a missing arm and leaves it NaN', () => {
    const { inp, dir } = input([[0, 0], [10, 10]], 0);
    inp.role.r_elbow = -1;
    const a = sagittalArmAngles(inp, dir);
    expect(a.present.right).toBe(false);
    expect(a.right[1]).toBeNaN();
    expect(a.left[1]).toBeCloseTo(10, 9);
  });
});
