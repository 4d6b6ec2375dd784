// Row-major 3x3 rotation helpers on Float64Array slices (offset `o`), allocation-free, for the walker's hot loop.

/** Writes the rotation about X by `rad` into `out` at `o`. */
export function setRx(out: Float64Array, o: number, rad: number): void {
  const c = Math.cos(rad), s = Math.sin(rad);
  out[o] = 1; out[o + 1] = 0; out[o + 2] = 0;
  out[o + 3] = 0; out[o + 4] = c; out[o + 5] = -s;
  out[o + 6] = 0; out[o + 7] = s; out[o + 8] = c;
}

/** Writes the rotation about Y by `rad` into `out` at `o`. */
export function setRy(out: Float64Array, o: number, rad: number): void {
  const c = Math.cos(rad), s = Math.sin(rad);
  out[o] = c; out[o + 1] = 0; out[o + 2] = s;
  out[o + 3] = 0; out[o + 4] = 1; out[o + 5] = 0;
  out[o + 6] = -s; out[o + 7] = 0; out[o + 8] = c;
}

/** Writes the rotation about Z by `rad` into `out` at `o`. */
export function setRz(out: Float64Array, o: number, rad: number): void {
  const c = Math.cos(rad), s = Math.sin(rad);
  out[o] = c; out[o + 1] = -s; out[o + 2] = 0;
  out[o + 3] = s; out[o + 4] = c; out[o + 5] = 0;
  out[o + 6] = 0; out[o + 7] = 0; out[o + 8] = 1;
}

/** Writes the identity into `out` at `o`. */
export function setIdentity(out: Float64Array, o: number): void {
  out[o] = 1; out[o + 1] = 0; out[o + 2] = 0;
  out[o + 3] = 0; out[o + 4] = 1; out[o + 5] = 0;
  out[o + 6] = 0; out[o + 7] = 0; out[o + 8] = 1;
}

/** Copies the matrix at `a[ao]` to `out[o]`. */
export function copy3(a: Float64Array, ao: number, out: Float64Array, o: number): void {
  for (let k = 0; k < 9; k++) out[o + k] = a[ao + k]!;
}

/** Writes a · b into `out` (may alias either input). */
export function mul3o(a: Float64Array, ao: number, b: Float64Array, bo: number, out: Float64Array, o: number): void {
  const a0 = a[ao]!, a1 = a[ao + 1]!, a2 = a[ao + 2]!, a3 = a[ao + 3]!, a4 = a[ao + 4]!, a5 = a[ao + 5]!, a6 = a[ao + 6]!, a7 = a[ao + 7]!, a8 = a[ao + 8]!;
  const b0 = b[bo]!, b1 = b[bo + 1]!, b2 = b[bo + 2]!, b3 = b[bo + 3]!, b4 = b[bo + 4]!, b5 = b[bo + 5]!, b6 = b[bo + 6]!, b7 = b[bo + 7]!, b8 = b[bo + 8]!;
  out[o] = a0 * b0 + a1 * b3 + a2 * b6;
  out[o + 1] = a0 * b1 + a1 * b4 + a2 * b7;
  out[o + 2] = a0 * b2 + a1 * b5 + a2 * b8;
  out[o + 3] = a3 * b0 + a4 * b3 + a5 * b6;
  out[o + 4] = a3 * b1 + a4 * b4 + a5 * b7;
  out[o + 5] = a3 * b2 + a4 * b5 + a5 * b8;
  out[o + 6] = a6 * b0 + a7 * b3 + a8 * b6;
  out[o + 7] = a6 * b1 + a7 * b4 + a8 * b7;
  out[o + 8] = a6 * b2 + a7 * b5 + a8 * b8;
}

/** Writes aᵀ · b into `out` (may alias either input): the rotation of b seen from a's frame. */
export function mulT3o(a: Float64Array, ao: number, b: Float64Array, bo: number, out: Float64Array, o: number): void {
  const a0 = a[ao]!, a1 = a[ao + 1]!, a2 = a[ao + 2]!, a3 = a[ao + 3]!, a4 = a[ao + 4]!, a5 = a[ao + 5]!, a6 = a[ao + 6]!, a7 = a[ao + 7]!, a8 = a[ao + 8]!;
  const b0 = b[bo]!, b1 = b[bo + 1]!, b2 = b[bo + 2]!, b3 = b[bo + 3]!, b4 = b[bo + 4]!, b5 = b[bo + 5]!, b6 = b[bo + 6]!, b7 = b[bo + 7]!, b8 = b[bo + 8]!;
  out[o] = a0 * b0 + a3 * b3 + a6 * b6;
  out[o + 1] = a0 * b1 + a3 * b4 + a6 * b7;
  out[o + 2] = a0 * b2 + a3 * b5 + a6 * b8;
  out[o + 3] = a1 * b0 + a4 * b3 + a7 * b6;
  out[o + 4] = a1 * b1 + a4 * b4 + a7 * b7;
  out[o + 5] = a1 * b2 + a4 * b5 + a7 * b8;
  out[o + 6] = a2 * b0 + a5 * b3 + a8 * b6;
  out[o + 7] = a2 * b1 + a5 * b4 + a8 * b7;
  out[o + 8] = a2 * b2 + a5 * b5 + a8 * b8;
}

/** Right-multiplies the matrix at `m[o]` in place by the rotation of `rad` about axis 0/1/2. */
export function postRot(m: Float64Array, o: number, axis: number, rad: number): void {
  const c = Math.cos(rad), s = Math.sin(rad);
  const i = axis === 0 ? 1 : axis === 1 ? 2 : 0;
  const k = axis === 0 ? 2 : axis === 1 ? 0 : 1;
  for (let r = 0; r < 3; r++) {
    const a = m[o + r * 3 + i]!, b = m[o + r * 3 + k]!;
    m[o + r * 3 + i] = c * a + s * b;
    m[o + r * 3 + k] = -s * a + c * b;
  }
}

/** Writes R = R_ax0(a0) · R_ax1(a1) · R_ax2(a2) (radians) into `out` at `o`. */
export function setEuler(out: Float64Array, o: number, ax0: number, a0: number, ax1: number, a1: number, ax2: number, a2: number): void {
  setIdentity(out, o);
  postRot(out, o, ax0, a0);
  postRot(out, o, ax1, a1);
  postRot(out, o, ax2, a2);
}

/** Writes m · v (v at `v[vo]`) into `out[oo]`. */
export function apply3o(m: Float64Array, mo: number, v: ArrayLike<number>, vo: number, out: Float64Array, oo: number): void {
  const x = v[vo]!, y = v[vo + 1]!, z = v[vo + 2]!;
  out[oo] = m[mo]! * x + m[mo + 1]! * y + m[mo + 2]! * z;
  out[oo + 1] = m[mo + 3]! * x + m[mo + 4]! * y + m[mo + 5]! * z;
  out[oo + 2] = m[mo + 6]! * x + m[mo + 7]! * y + m[mo + 8]! * z;
}

/**
 * Writes the Euler angles (radians) of the rotation at `m[mo]` for the composition R = R_i · R_j · R_k
 * (axes i, j, k distinct) into `out[oo..oo+3]`: the solution with the middle angle in [-π/2, π/2].
 */
export function matrixToEuler(m: Float64Array, mo: number, i: number, j: number, k: number, out: Float64Array, oo: number): void {
  // sign = +1 for the cyclic orders (XYZ, YZX, ZXY), -1 for the others.
  const sign = (j - i + 3) % 3 === 1 ? 1 : -1;
  let sb = sign * m[mo + i * 3 + k]!;
  if (sb > 1) sb = 1;
  else if (sb < -1) sb = -1;
  const b = Math.asin(sb);
  if (Math.abs(sb) < 0.9999999) {
    out[oo] = Math.atan2(-sign * m[mo + j * 3 + k]!, m[mo + k * 3 + k]!);
    out[oo + 1] = b;
    out[oo + 2] = Math.atan2(-sign * m[mo + i * 3 + j]!, m[mo + i * 3 + i]!);
  } else {
    // Gimbal lock: the first and last angles share one axis; put it all in the first.
    out[oo] = Math.atan2(sign * m[mo + k * 3 + j]!, m[mo + j * 3 + j]!);
    out[oo + 1] = b;
    out[oo + 2] = 0;
  }
}
