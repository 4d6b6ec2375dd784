// The virtual heel: a hand-computed case, the construction's properties on the role fixtures, and an
// independent reference (three.js's scene graph carrying the heel as a child of the ankle).
import { describe, expect, it } from 'vitest';
import { Euler, Object3D, Vector3 } from 'three';
import { InputError } from '../../src/errors/index.js';
import { forwardKinematics } from '../../src/skeleton/fk.js';
import { heelOffsets, heelTrajectories, upVector } from '../../src/skeleton/heel.js';
import { emptyRoleMap, inferRoles, type RoleMap } from '../../src/skeleton/roles.js';
import { buildBody, style, takeFromTree } from '../fixtures/roles/bodies.js';

// Two feet hanging from a root at (0, 10, 0): ankles at (±5, 8, 0), toe End Sites 6 below and 12 ahead.
const feet = takeFromTree(
  { name: 'Root', offset: [0, 10, 0], children: [
    { name: 'LAnkle', offset: [5, -2, 0], end: [0, -6, 12] },
    { name: 'RAnkle', offset: [-5, -2, 0], end: [0, -6, 12] },
  ] },
  [
    {},
    { Root: [10, 10, 0, 0, 0, 0], LAnkle: [0, 90, 0] }, // root 10 along X; left ankle Xrotation 90°
    { Root: [0, 10, 0, 0, 0, 90] }, // root Yrotation 90°
  ],
);
const feetRoles: RoleMap = emptyRoleMap();
feetRoles.l_ankle = { joint: 1, name: 'LAnkle', confidence: 1, evidence: '' };
feetRoles.l_toe = { joint: 2, name: 'LAnkle_End', confidence: 1, evidence: '' };
feetRoles.r_ankle = { joint: 3, name: 'RAnkle', confidence: 1, evidence: '' };
feetRoles.r_toe = { joint: 4, name: 'RAnkle_End', confidence: 1, evidence: '' };

describe('virtual heel, hand-computed', () => {
  it('builds the rest offset on the toe height, 0.3 of the foot behind the ankle', () => {
    // f = (0, −6, 12), u = (0, 1, 0): f_h = (0, 0, 12), (ankle − toe)·u = 6,
    // heel_rest = ankle − 0.3·(0, 0, 12) − 6·(0, 1, 0), so d = (0, −6, −3.6) on both feet.
    const d = heelOffsets(feet, feetRoles, 'y');
    expect(d.length).toBe(6);
    [0, -6, -3.6, 0, -6, -3.6].forEach((v, i) => expect(d[i], `value ${i}`).toBeCloseTo(v, 12));
  });

  it('carries the offset with the ankle\'s world rotation', () => {
    const h = heelTrajectories(feet, feetRoles, 'y');
    const expected = [
      // Frame 0, at rest: ankles (±5, 8, 0) plus d.
      [5, 2, -3.6], [-5, 2, -3.6],
      // Frame 1: root moved to (10, 10, 0); left ankle R_x(90°) = [[1,0,0],[0,0,−1],[0,1,0]],
      // R·d = (0, 3.6, −6), ankle at (15, 8, 0) → (15, 11.6, −6); right unrotated at (5, 8, 0) → (5, 2, −3.6).
      [15, 11.6, -6], [5, 2, -3.6],
      // Frame 2: root R_y(90°) = [[0,0,1],[0,1,0],[−1,0,0]]; left ankle (0, 8, −5), R·d = (−3.6, −6, 0)
      // → (−3.6, 2, −5); right ankle (0, 8, 5) → (−3.6, 2, 5).
      [-3.6, 2, -5], [-3.6, 2, 5],
    ].flat();
    expect(h.length).toBe(18);
    expected.forEach((v, i) => expect(h[i], `value ${i}`).toBeCloseTo(v, 12));
  });

  it('returns frames [from, to) and fills a given buffer', () => {
    const all = heelTrajectories(feet, feetRoles, 'y');
    const part = heelTrajectories(feet, feetRoles, 'y', 1, 3);
    expect(Array.from(part)).toEqual(Array.from(all.subarray(6)));
    const buf = new Float64Array(6);
    expect(heelTrajectories(feet, feetRoles, 'y', 2, 3, buf)).toBe(buf);
    expect(Array.from(buf)).toEqual(Array.from(all.subarray(12)));
    expect(() => heelTrajectories(feet, feetRoles, 'y', 0, 3, buf)).toThrow(InputError);
  });

  it('refuses a role map without ankle or toe, naming the role', () => {
    const partial = { ...feetRoles, r_toe: null };
    expect(() => heelOffsets(feet, partial, 'y')).toThrow(InputError);
    expect(() => heelOffsets(feet, partial, 'y')).toThrow(/right ankle and toe, but the role map has no r_toe/);
  });

  it('reads up as a letter, a signed letter or a vector', () => {
    expect(upVector('z')).toEqual([0, 0, 1]);
    expect(upVector('-y')).toEqual([0, -1, 0]);
    expect(upVector([0, 0, 2])).toEqual([0, 0, 1]);
    expect(() => upVector([0, 0, 0])).toThrow(InputError);
  });
});

describe('virtual heel on the role fixtures', () => {
  it('gives the same foot geometry in every axis convention', () => {
    // Built foot: toe joint 6 cm below and 12 cm ahead of the ankle, so d = 6 cm down and 3.6 cm back,
    // mapped into each style's axes (bodies.ts): Y-up +Z facing (0, −6, −3.6); Z-up +Y facing (0, −3.6, −6).
    const y = buildBody(style('camel-prefix-cm-yup')).take;
    const dy = heelOffsets(y, inferRoles(y).roles, 'y');
    [0, -6, -3.6, 0, -6, -3.6].forEach((v, i) => expect(dy[i]).toBeCloseTo(v, 12));
    const z = buildBody(style('suffix-cm-zup')).take;
    const dz = heelOffsets(z, inferRoles(z).roles, 'z');
    [0, -3.6, -6, 0, -3.6, -6].forEach((v, i) => expect(dz[i]).toBeCloseTo(v, 12));
    // No toe joint: the End Site (7 cm down, 15 ahead of the ankle) stands for the toe: d = (0, −7, −4.5).
    const nt = buildBody(style('upper-no-toe')).take;
    const dn = heelOffsets(nt, inferRoles(nt).roles, 'y');
    [0, -7, -4.5].forEach((v, i) => expect(dn[i]).toBeCloseTo(v, 12));
  });

  it('stays rigid on the foot through the motion', () => {
    const b = buildBody(style('twist-clavicle-lft-rgt'));
    const roles = inferRoles(b.take).roles;
    const ankle = b.take.joints[roles.l_ankle!.joint]!;
    // Give the left ankle a three-axis rotation on every frame so the foot turns out of the sagittal plane.
    for (let f = 0; f < b.take.frameCount; f++) b.take.values.set([20 + f, -15, 35 - 3 * f], f * b.take.channelCount + ankle.channelStart);
    const h = heelTrajectories(b.take, roles, 'y');
    const pos = forwardKinematics(b.take);
    const J = b.take.joints.length;
    const a = roles.l_ankle!.joint, t = roles.l_toe!.joint;
    const len = (p: number[], q: number[]) => Math.hypot(p[0]! - q[0]!, p[1]! - q[1]!, p[2]! - q[2]!);
    const at = (f: number, j: number) => Array.from(pos.subarray(f * J * 3 + j * 3, f * J * 3 + j * 3 + 3));
    const heel = (f: number) => Array.from(h.subarray(f * 6, f * 6 + 3));
    // |d| = hypot(6, 3.6); heel-to-toe at rest = hypot(0, 0, 12 + 3.6) = 15.6 (both on the toe's height).
    for (let f = 0; f < b.take.frameCount; f++) {
      expect(len(heel(f), at(f, a))).toBeCloseTo(Math.hypot(6, 3.6), 10);
      expect(len(heel(f), at(f, t))).toBeCloseTo(15.6, 10);
    }
  });

  it('matches three.js carrying the heel as a child of the ankle', () => {
    const b = buildBody(style('camel-prefix-cm-yup'));
    const roles = inferRoles(b.take).roles;
    const take = b.take;
    for (let f = 0; f < take.frameCount; f++) take.values.set([10, -25 + 4 * f, 5], f * take.channelCount + take.joints[roles.r_ankle!.joint]!.channelStart);
    const d = heelOffsets(take, roles, 'y');
    const h = heelTrajectories(take, roles, 'y');
    for (let f = 0; f < take.frameCount; f++) {
      // Reference: an Object3D per joint; BVH channel order A B C is three's Euler order "ABC" (R = R_A·R_B·R_C).
      const objs = take.joints.map(() => new Object3D());
      take.joints.forEach((j, i) => {
        const o = objs[i]!;
        const base = f * take.channelCount + j.channelStart;
        const pos = [...j.offset];
        const rot: Record<string, number> = { X: 0, Y: 0, Z: 0 };
        let order = '';
        j.channels.forEach((c, k) => {
          const v = take.values[base + k]!;
          if (c.endsWith('position')) pos['XYZ'.indexOf(c[0]!)] = v;
          else { rot[c[0]!] = (v * Math.PI) / 180; order += c[0]; }
        });
        o.position.set(pos[0]!, pos[1]!, pos[2]!);
        if (order) o.setRotationFromEuler(new Euler(rot.X, rot.Y, rot.Z, order as 'XYZ'));
        if (j.parent >= 0) objs[j.parent]!.add(o);
      });
      (['l', 'r'] as const).forEach((s, k) => {
        const heelObj = new Object3D();
        heelObj.position.set(d[k * 3]!, d[k * 3 + 1]!, d[k * 3 + 2]!);
        objs[roles[`${s}_ankle`]!.joint]!.add(heelObj);
        objs[0]!.updateMatrixWorld(true);
        const w = heelObj.getWorldPosition(new Vector3());
        expect(h[f * 6 + k * 3]).toBeCloseTo(w.x, 9);
        expect(h[f * 6 + k * 3 + 1]).toBeCloseTo(w.y, 9);
        expect(h[f * 6 + k * 3 + 2]).toBeCloseTo(w.z, 9);
      });
    }
  });
});
