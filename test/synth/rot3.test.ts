// Matrix-to-Euler decomposition checked against three.js (an independent reference library).
import { Euler, Matrix4 } from 'three';
import { describe, expect, it } from 'vitest';
import { matrixToEuler, setEuler } from '../../src/synth/rot3.js';
import { Mulberry32 } from '../../src/synth/prng.js';

const ORDERS = ['XYZ', 'XZY', 'YXZ', 'YZX', 'ZXY', 'ZYX'] as const;
const ax = (c: string) => c.charCodeAt(0) - 88;

describe('synth rotation helpers', () => {
  it('builds R = R_A · R_B · R_C as three.js does for the same order', () => {
    // three.js Euler orders are intrinsic: 'XYZ' is Rx · Ry · Rz, the BVH composition for channels X Y Z.
    const rng = new Mulberry32(3);
    for (const order of ORDERS) {
      for (let n = 0; n < 20; n++) {
        const a = [0, 1, 2].map(() => (rng.next() - 0.5) * 3);
        const mine = new Float64Array(9);
        setEuler(mine, 0, ax(order[0]!), a[0]!, ax(order[1]!), a[1]!, ax(order[2]!), a[2]!);
        // three's Euler takes angles per axis (x, y, z), not per position in the order.
        const byAxis = [0, 0, 0];
        for (let k = 0; k < 3; k++) byAxis[ax(order[k]!)] = a[k]!;
        const m = new Matrix4().makeRotationFromEuler(new Euler(byAxis[0], byAxis[1], byAxis[2], order));
        const e = m.elements; // column-major
        for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) expect(mine[r * 3 + c]!).toBeCloseTo(e[c * 4 + r]!, 12);
      }
    }
  });

  it('decomposes back to angles that rebuild the matrix, middle angle within ±90°', () => {
    const rng = new Mulberry32(4);
    const m = new Float64Array(9), back = new Float64Array(9), ang = new Float64Array(3);
    for (const order of ORDERS) {
      const [i, j, k] = [ax(order[0]!), ax(order[1]!), ax(order[2]!)];
      for (let n = 0; n < 50; n++) {
        setEuler(m, 0, i, (rng.next() - 0.5) * 6, j, (rng.next() - 0.5) * 3, k, (rng.next() - 0.5) * 6);
        matrixToEuler(m, 0, i, j, k, ang, 0);
        expect(Math.abs(ang[1]!)).toBeLessThanOrEqual(Math.PI / 2 + 1e-12);
        setEuler(back, 0, i, ang[0]!, j, ang[1]!, k, ang[2]!);
        for (let q = 0; q < 9; q++) expect(back[q]!).toBeCloseTo(m[q]!, 10);
        // The second solution (a + π, π − b, c + π) is the same rotation.
        setEuler(back, 0, i, ang[0]! + Math.PI, j, Math.PI - ang[1]!, k, ang[2]! + Math.PI);
        for (let q = 0; q < 9; q++) expect(back[q]!).toBeCloseTo(m[q]!, 10);
      }
      // Gimbal lock: middle angle exactly 90°.
      setEuler(m, 0, i, 0.3, j, Math.PI / 2, k, -0.2);
      matrixToEuler(m, 0, i, j, k, ang, 0);
      setEuler(back, 0, i, ang[0]!, j, ang[1]!, k, ang[2]!);
      for (let q = 0; q < 9; q++) expect(back[q]!).toBeCloseTo(m[q]!, 6);
    }
  });

  it('matches three.js decomposition away from gimbal lock', () => {
    const rng = new Mulberry32(5);
    const ang = new Float64Array(3);
    for (const order of ORDERS) {
      const [i, j, k] = [ax(order[0]!), ax(order[1]!), ax(order[2]!)];
      const m = new Float64Array(9);
      setEuler(m, 0, i, (rng.next() - 0.5) * 4, j, (rng.next() - 0.5) * 2, k, (rng.next() - 0.5) * 4);
      matrixToEuler(m, 0, i, j, k, ang, 0);
      const m4 = new Matrix4().set(m[0]!, m[1]!, m[2]!, 0, m[3]!, m[4]!, m[5]!, 0, m[6]!, m[7]!, m[8]!, 0, 0, 0, 0, 1);
      const e = new Euler().setFromRotationMatrix(m4, order);
      const byAxis = [e.x, e.y, e.z];
      for (let q = 0; q < 3; q++) expect(ang[q]!).toBeCloseTo(byAxis[ax(order[q]!)]!, 9);
    }
  });
});
