// Euler angles to rotation matrices as BVH composes them: channel order A B C gives R = R_A · R_B · R_C.
// Matrices are active (they rotate vectors), right-handed, row-major 3x3 in a Float64Array.

/** Axis index of a rotation channel: 0 = X, 1 = Y, 2 = Z. */
export type Axis = 0 | 1 | 2;

/** The six three-axis Euler orders BVH files use. */
export type EulerOrder = 'XYZ' | 'XZY' | 'YXZ' | 'YZX' | 'ZXY' | 'ZYX';

export const EULER_ORDERS: readonly EulerOrder[] = ['XYZ', 'XZY', 'YXZ', 'YZX', 'ZXY', 'ZYX'];

const DEG = Math.PI / 180;

/** Writes the identity into `out` at `o` and returns `out`. */
export function identity3(out: Float64Array, o = 0): Float64Array {
  out[o] = 1; out[o + 1] = 0; out[o + 2] = 0;
  out[o + 3] = 0; out[o + 4] = 1; out[o + 5] = 0;
  out[o + 6] = 0; out[o + 7] = 0; out[o + 8] = 1;
  return out;
}

/** Right-multiplies the 3x3 matrix at `m[o..o+9]` in place by the rotation of `radians` about `axis`. */
export function postRotate(m: Float64Array, o: number, axis: number, radians: number): void {
  const c = Math.cos(radians);
  const s = Math.sin(radians);
  // Only two columns change; (i, k) are the columns mixed by a rotation about `axis`.
  const i = axis === 0 ? 1 : axis === 1 ? 2 : 0;
  const k = axis === 0 ? 2 : axis === 1 ? 0 : 1;
  for (let r = 0; r < 3; r++) {
    const a = m[o + r * 3 + i]!;
    const b = m[o + r * 3 + k]!;
    m[o + r * 3 + i] = c * a + s * b;
    m[o + r * 3 + k] = -s * a + c * b;
  }
}

/** Returns the rotation matrix for `degrees` applied about `axes` in order (R = R_axes[0] · R_axes[1] · ...). */
export function eulerToMatrix(axes: readonly number[] | string, degrees: readonly number[], out = new Float64Array(9)): Float64Array {
  identity3(out, 0);
  const list = typeof axes === 'string' ? axisList(axes) : axes;
  for (let n = 0; n < list.length; n++) postRotate(out, 0, list[n]!, degrees[n]! * DEG);
  return out;
}

/** Returns the axis indices of an order string such as "ZXY". */
export function axisList(order: string): Axis[] {
  return [...order.toUpperCase()].map((ch) => {
    if (ch === 'X') return 0;
    if (ch === 'Y') return 1;
    if (ch === 'Z') return 2;
    throw new Error(`not an axis letter: ${ch}`);
  });
}

/** Returns the 3x3 product a · b (row-major) into `out`. */
export function mul3<T extends Float64Array>(a: ArrayLike<number>, b: ArrayLike<number>, out: T = new Float64Array(9) as T): T {
  const a0 = a[0]!, a1 = a[1]!, a2 = a[2]!, a3 = a[3]!, a4 = a[4]!, a5 = a[5]!, a6 = a[6]!, a7 = a[7]!, a8 = a[8]!;
  const b0 = b[0]!, b1 = b[1]!, b2 = b[2]!, b3 = b[3]!, b4 = b[4]!, b5 = b[5]!, b6 = b[6]!, b7 = b[7]!, b8 = b[8]!;
  out[0] = a0 * b0 + a1 * b3 + a2 * b6; out[1] = a0 * b1 + a1 * b4 + a2 * b7; out[2] = a0 * b2 + a1 * b5 + a2 * b8;
  out[3] = a3 * b0 + a4 * b3 + a5 * b6; out[4] = a3 * b1 + a4 * b4 + a5 * b7; out[5] = a3 * b2 + a4 * b5 + a5 * b8;
  out[6] = a6 * b0 + a7 * b3 + a8 * b6; out[7] = a6 * b1 + a7 * b4 + a8 * b7; out[8] = a6 * b2 + a7 * b5 + a8 * b8;
  return out;
}

/** Returns m · v for a row-major 3x3 `m`. */
export function apply3(m: ArrayLike<number>, v: readonly number[]): [number, number, number] {
  return [
    m[0]! * v[0]! + m[1]! * v[1]! + m[2]! * v[2]!,
    m[3]! * v[0]! + m[4]! * v[1]! + m[5]! * v[2]!,
    m[6]! * v[0]! + m[7]! * v[1]! + m[8]! * v[2]!,
  ];
}
