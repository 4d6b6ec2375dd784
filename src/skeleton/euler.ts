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
export function mul3(a: ArrayLike<number>, b: ArrayLike<number>, out = new Float64Array(9)): Float64Array {
  const r = new Float64Array(9);
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++) r[i * 3 + j] = a[i * 3]! * b[j]! + a[i * 3 + 1]! * b[3 + j]! + a[i * 3 + 2]! * b[6 + j]!;
  out.set(r);
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
