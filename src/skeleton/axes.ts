// The canonical frame every analysis shares: right-handed, Z up, reached from a take's detected up
// direction by the shortest turn.

/** Returns the rotation (row-major 3x3) taking unit vector `u` onto +Z by the shortest turn. */
export function rotationToZ(u: readonly number[]): Float64Array {
  const x = u[0]!, y = u[1]!, z = u[2]!;
  if (z < -0.999999) return new Float64Array([1, 0, 0, 0, -1, 0, 0, 0, -1]);
  // Rodrigues for the axis u × z = (y, −x, 0) and angle acos(z): R = I + [k]× + [k]×² / (1 + z).
  const kx = y, ky = -x, f = 1 / (1 + z);
  return new Float64Array([
    1 - ky * ky * f, kx * ky * f, ky,
    kx * ky * f, 1 - kx * kx * f, -kx,
    -ky, kx, 1 - (kx * kx + ky * ky) * f,
  ]);
}
