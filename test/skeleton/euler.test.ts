// Euler-angle rotation matrices checked against values computed by hand from the elementary rotations.
//
// Elementary active (vector-rotating), right-handed rotations by an angle t, c = cos t, s = sin t
// (Siciliano, Sciavicco, Villani, Oriolo, "Robotics: Modelling, Planning and Control", Springer 2009,
// §2.2, eqs. 2.6-2.8; the same matrices are in Craig, "Introduction to Robotics", 3rd ed. 2005, ch. 2;
// section and equation numbers recalled from memory, the matrices follow from the right-hand rule):
//
//   Rx(t) = | 1  0  0 |    Ry(t) = |  c  0  s |    Rz(t) = | c -s  0 |
//           | 0  c -s |            |  0  1  0 |            | s  c  0 |
//           | 0  s  c |            | -s  0  c |            | 0  0  1 |
//
// A text that uses passive (frame-rotating, "alias") matrices prints the transposes of these.
// BVH composes a joint's rotation channels in the order they are listed: channel order A B C gives
// R = R_A(a) · R_B(b) · R_C(c), applied to column vectors (common practice of BVH readers; three.js's
// BVHLoader multiplies its quaternions in the same order). With c1, s1 for the first listed angle,
// c2, s2 the second and c3, s3 the third, multiplying the elementary matrices out by hand gives the
// Tait-Bryan table (it matches the table of Wikipedia "Euler angles", section "Rotation matrix",
// recalled from memory):
//
//   XYZ: [ c2c3, -c2s3, s2 ;  c1s3+s1s2c3, c1c3-s1s2s3, -s1c2 ;  s1s3-c1s2c3, s1c3+c1s2s3, c1c2 ]
//   XZY: [ c2c3, -s2, c2s3 ;  c1s2c3+s1s3, c1c2, c1s2s3-s1c3 ;  s1s2c3-c1s3, s1c2, c1c3+s1s2s3 ]
//   YXZ: [ c1c3+s1s2s3, s1s2c3-c1s3, s1c2 ;  c2s3, c2c3, -s2 ;  c1s2s3-s1c3, c1s2c3+s1s3, c1c2 ]
//   YZX: [ c1c2, s1s3-c1s2c3, c1s2s3+s1c3 ;  s2, c2c3, -c2s3 ;  -s1c2, c1s3+s1s2c3, c1c3-s1s2s3 ]
//   ZXY: [ c1c3-s1s2s3, -s1c2, c1s3+s1s2c3 ;  s1c3+c1s2s3, c1c2, s1s3-c1s2c3 ;  -c2s3, s2, c2c3 ]
//   ZYX: [ c1c2, c1s2s3-s1c3, c1s2c3+s1s3 ;  s1c2, c1c3+s1s2s3, s1s2c3-c1s3 ;  -s2, c2s3, c2c3 ]
//
// Angles used below, in listed order: 30°, -45°, 60°. Then c1 = √3/2, s1 = 1/2, c2 = √2/2,
// s2 = -√2/2, c3 = 1/2, s3 = √3/2, and every entry is a closed form in √2, √3, √6 (worked beside it).
import { describe, expect, it } from 'vitest';
import { apply3, axisList, eulerToMatrix, identity3, mul3, postRotate, type EulerOrder } from '../../src/skeleton/euler.js';

const R2 = Math.SQRT2;
const R3 = Math.sqrt(3);
const R6 = Math.sqrt(6);

/** Hand-computed R = R_A(30°) · R_B(-45°) · R_C(60°) for channel order A B C, row-major. */
const EXPECTED: Record<EulerOrder, number[]> = {
  // XYZ
  // row 0: c2c3 = √2/4; -c2s3 = -√6/4; s2 = -√2/2
  // row 1: c1s3+s1s2c3 = 3/4-√2/8; c1c3-s1s2s3 = √3/4+√6/8; -s1c2 = -√2/4
  // row 2: s1s3-c1s2c3 = √3/4+√6/8; s1c3+c1s2s3 = 1/4-3√2/8; c1c2 = √6/4
  XYZ: [
    0.353553390593274, -0.612372435695794, -0.707106781186548,
    0.573223304703363, 0.739198919740117, -0.353553390593274,
    0.739198919740117, -0.280330085889911, 0.612372435695794,
  ],
  // XZY (first angle about X, second about Z, third about Y)
  // row 0: c2c3 = √2/4; -s2 = √2/2; c2s3 = √6/4
  // row 1: c1s2c3+s1s3 = √3/4-√6/8; c1c2 = √6/4; c1s2s3-s1c3 = -3√2/8-1/4
  // row 2: s1s2c3-c1s3 = -3/4-√2/8; s1c2 = √2/4; c1c3+s1s2s3 = √3/4-√6/8
  XZY: [
    0.353553390593274, 0.707106781186548, 0.612372435695794,
    0.126826484044322, 0.612372435695794, -0.780330085889911,
    -0.926776695296637, 0.353553390593274, 0.126826484044322,
  ],
  // YXZ
  // row 0: c1c3+s1s2s3 = √3/4-√6/8; s1s2c3-c1s3 = -3/4-√2/8; s1c2 = √2/4
  // row 1: c2s3 = √6/4; c2c3 = √2/4; -s2 = √2/2
  // row 2: c1s2s3-s1c3 = -3√2/8-1/4; c1s2c3+s1s3 = √3/4-√6/8; c1c2 = √6/4
  YXZ: [
    0.126826484044322, -0.926776695296637, 0.353553390593274,
    0.612372435695794, 0.353553390593274, 0.707106781186548,
    -0.780330085889911, 0.126826484044322, 0.612372435695794,
  ],
  // YZX
  // row 0: c1c2 = √6/4; s1s3-c1s2c3 = √3/4+√6/8; c1s2s3+s1c3 = 1/4-3√2/8
  // row 1: s2 = -√2/2; c2c3 = √2/4; -c2s3 = -√6/4
  // row 2: -s1c2 = -√2/4; c1s3+s1s2c3 = 3/4-√2/8; c1c3-s1s2s3 = √3/4+√6/8
  YZX: [
    0.612372435695794, 0.739198919740117, -0.280330085889911,
    -0.707106781186548, 0.353553390593274, -0.612372435695794,
    -0.353553390593274, 0.573223304703363, 0.739198919740117,
  ],
  // ZXY
  // row 0: c1c3-s1s2s3 = √3/4+√6/8; -s1c2 = -√2/4; c1s3+s1s2c3 = 3/4-√2/8
  // row 1: s1c3+c1s2s3 = 1/4-3√2/8; c1c2 = √6/4; s1s3-c1s2c3 = √3/4+√6/8
  // row 2: -c2s3 = -√6/4; s2 = -√2/2; c2c3 = √2/4
  ZXY: [
    0.739198919740117, -0.353553390593274, 0.573223304703363,
    -0.280330085889911, 0.612372435695794, 0.739198919740117,
    -0.612372435695794, -0.707106781186548, 0.353553390593274,
  ],
  // ZYX
  // row 0: c1c2 = √6/4; c1s2s3-s1c3 = -3√2/8-1/4; c1s2c3+s1s3 = √3/4-√6/8
  // row 1: s1c2 = √2/4; c1c3+s1s2s3 = √3/4-√6/8; s1s2c3-c1s3 = -3/4-√2/8
  // row 2: -s2 = √2/2; c2s3 = √6/4; c2c3 = √2/4
  ZYX: [
    0.612372435695794, -0.780330085889911, 0.126826484044322,
    0.353553390593274, 0.126826484044322, -0.926776695296637,
    0.707106781186548, 0.612372435695794, 0.353553390593274,
  ],
};

/** The closed forms of the comments, evaluated, to confirm the decimals above were copied right. */
const CLOSED_FORMS: Record<EulerOrder, number[]> = {
  XYZ: [R2 / 4, -R6 / 4, -R2 / 2, 3 / 4 - R2 / 8, R3 / 4 + R6 / 8, -R2 / 4, R3 / 4 + R6 / 8, 1 / 4 - (3 * R2) / 8, R6 / 4],
  XZY: [R2 / 4, R2 / 2, R6 / 4, R3 / 4 - R6 / 8, R6 / 4, -(3 * R2) / 8 - 1 / 4, -3 / 4 - R2 / 8, R2 / 4, R3 / 4 - R6 / 8],
  YXZ: [R3 / 4 - R6 / 8, -3 / 4 - R2 / 8, R2 / 4, R6 / 4, R2 / 4, R2 / 2, -(3 * R2) / 8 - 1 / 4, R3 / 4 - R6 / 8, R6 / 4],
  YZX: [R6 / 4, R3 / 4 + R6 / 8, 1 / 4 - (3 * R2) / 8, -R2 / 2, R2 / 4, -R6 / 4, -R2 / 4, 3 / 4 - R2 / 8, R3 / 4 + R6 / 8],
  ZXY: [R3 / 4 + R6 / 8, -R2 / 4, 3 / 4 - R2 / 8, 1 / 4 - (3 * R2) / 8, R6 / 4, R3 / 4 + R6 / 8, -R6 / 4, -R2 / 2, R2 / 4],
  ZYX: [R6 / 4, -(3 * R2) / 8 - 1 / 4, R3 / 4 - R6 / 8, R2 / 4, R3 / 4 - R6 / 8, -3 / 4 - R2 / 8, R2 / 2, R6 / 4, R2 / 4],
};

const ORDERS: EulerOrder[] = ['XYZ', 'XZY', 'YXZ', 'YZX', 'ZXY', 'ZYX'];
const ANGLES = [30, -45, 60];

function expectMatrix(actual: ArrayLike<number>, expected: readonly number[], tol: number): void {
  for (let k = 0; k < 9; k++) expect(Math.abs(actual[k]! - expected[k]!), `entry ${k}`).toBeLessThan(tol);
}

describe('eulerToMatrix against hand-computed Tait-Bryan products', () => {
  it('the decimals of the table agree with their closed forms', () => {
    for (const order of ORDERS) expectMatrix(EXPECTED[order], CLOSED_FORMS[order], 1e-14);
  });

  for (const order of ORDERS) {
    it(`${order} at 30°, -45°, 60° equals R_${order[0]}·R_${order[1]}·R_${order[2]} worked by hand`, () => {
      // Decimals above carry 15 places, so 1e-13 leaves room only for their rounding.
      expectMatrix(eulerToMatrix(order, ANGLES), EXPECTED[order], 1e-13);
    });
    it(`${order} given as axis indices gives the same matrix`, () => {
      expectMatrix(eulerToMatrix(axisList(order), ANGLES), EXPECTED[order], 1e-13);
    });
  }

  it('the orders differ from one another (the order is not ignored)', () => {
    // From the table: the (0,2) entries are -√2/2, √6/4, √2/4, 1/4-3√2/8, 3/4-√2/8, √3/4-√6/8: all distinct.
    const corners = ORDERS.map((o) => eulerToMatrix(o, ANGLES)[2]!);
    expect(new Set(corners.map((v) => v.toFixed(9))).size).toBe(6);
  });
});

describe('elementary rotations: the right-hand rule', () => {
  // Right-handed, active: a quarter turn about Z takes x to y, about X takes y to z, about Y takes z to x
  // (Siciliano et al. 2009, §2.2: the columns of R are the rotated basis vectors).
  it('Rz(90°)·x = y', () => {
    const v = apply3(eulerToMatrix('Z', [90]), [1, 0, 0]);
    expect(v[0]).toBeCloseTo(0, 15); expect(v[1]).toBeCloseTo(1, 15); expect(v[2]).toBeCloseTo(0, 15);
  });
  it('Rx(90°)·y = z', () => {
    const v = apply3(eulerToMatrix('X', [90]), [0, 1, 0]);
    expect(v[0]).toBeCloseTo(0, 15); expect(v[1]).toBeCloseTo(0, 15); expect(v[2]).toBeCloseTo(1, 15);
  });
  it('Ry(90°)·z = x', () => {
    const v = apply3(eulerToMatrix('Y', [90]), [0, 0, 1]);
    expect(v[0]).toBeCloseTo(1, 15); expect(v[1]).toBeCloseTo(0, 15); expect(v[2]).toBeCloseTo(0, 15);
  });
  it('single-axis matrices at 30° match Rx, Ry, Rz of the header entry by entry', () => {
    const c = R3 / 2, s = 0.5;
    expectMatrix(eulerToMatrix('X', [30]), [1, 0, 0, 0, c, -s, 0, s, c], 1e-15);
    expectMatrix(eulerToMatrix('Y', [30]), [c, 0, s, 0, 1, 0, -s, 0, c], 1e-15);
    expectMatrix(eulerToMatrix('Z', [30]), [c, -s, 0, s, c, 0, 0, 0, 1], 1e-15);
  });
  it('ZX at 90°, 90° applies the X turn first to a vector: Rz·Rx·y = Rz·z = z, Rz·Rx·z = Rz·(-y) = x', () => {
    const m = eulerToMatrix('ZX', [90, 90]);
    const a = apply3(m, [0, 1, 0]);
    const b = apply3(m, [0, 0, 1]);
    expectMatrix([...a, ...b, 0, 0, 0], [0, 0, 1, 1, 0, 0, 0, 0, 0], 1e-15);
  });
});

describe('rotation properties', () => {
  // A rotation matrix is orthonormal with determinant +1 (Siciliano et al. 2009, §2.2, the group SO(3)).
  const det = (m: ArrayLike<number>) =>
    m[0]! * (m[4]! * m[8]! - m[5]! * m[7]!) - m[1]! * (m[3]! * m[8]! - m[5]! * m[6]!) + m[2]! * (m[3]! * m[7]! - m[4]! * m[6]!);
  it('every order at many angles gives RᵀR = I and det R = +1', () => {
    let seed = 12345;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648) * 720 - 360;
    for (const order of ORDERS) {
      for (let n = 0; n < 50; n++) {
        const m = eulerToMatrix(order, [rand(), rand(), rand()]);
        for (let i = 0; i < 3; i++)
          for (let j = 0; j < 3; j++) {
            const dot = m[i]! * m[j]! + m[3 + i]! * m[3 + j]! + m[6 + i]! * m[6 + j]!;
            expect(Math.abs(dot - (i === j ? 1 : 0))).toBeLessThan(1e-14);
          }
        expect(Math.abs(det(m) - 1)).toBeLessThan(1e-14);
      }
    }
  });
  it('the hand-computed table is itself orthonormal with det +1', () => {
    for (const order of ORDERS) expect(Math.abs(det(CLOSED_FORMS[order]) - 1)).toBeLessThan(1e-14);
  });
});

describe('helpers', () => {
  it('mul3 multiplies row-major: Rx(30)·Ry(-45)·Rz(60) from single-axis factors equals the XYZ entry', () => {
    const m = mul3(mul3(eulerToMatrix('X', [30]), eulerToMatrix('Y', [-45])), eulerToMatrix('Z', [60]));
    expectMatrix(m, EXPECTED.XYZ, 1e-13);
  });
  it('mul3 may write into one of its inputs', () => {
    const a = new Float64Array(9);
    eulerToMatrix('Z', [90], a);
    mul3(a, eulerToMatrix('Z', [90]), a); // Rz(180) = diag(-1, -1, 1)
    expectMatrix(a, [-1, 0, 0, 0, -1, 0, 0, 0, 1], 1e-15);
  });
  it('postRotate works on a matrix stored at an offset and leaves the rest alone', () => {
    const buf = new Float64Array(18).fill(7);
    identity3(buf, 9);
    postRotate(buf, 9, 2, Math.PI / 6);
    expectMatrix(buf.subarray(9), [R3 / 2, -0.5, 0, 0.5, R3 / 2, 0, 0, 0, 1], 1e-15);
    for (let k = 0; k < 9; k++) expect(buf[k]).toBe(7);
  });
  it('axisList reads orders case-insensitively and refuses other letters', () => {
    expect(axisList('zxy')).toEqual([2, 0, 1]);
    expect(() => axisList('XQZ')).toThrow();
  });
});
