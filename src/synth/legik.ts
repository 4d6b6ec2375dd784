// Analytic two-link leg (thigh, shank) inverse kinematics in world space, allocation-free.

/**
 * Places the knee for hip H and ankle target A (both at `v[ho]`, `v[ao]`), bending toward `pole`, and writes
 * the thigh and shank world rotations (rest bones point down -Y, hinge about local X) into `thigh[to]`,
 * `shank[so]`, the reached ankle into `outAnkle[oo]`; returns the knee flexion in radians (0 = straight).
 */
export function solveLeg(
  H: Float64Array, ho: number, A: Float64Array, ao: number, pole: Float64Array, po: number,
  Lt: number, Ls: number, thigh: Float64Array, to: number, shank: Float64Array, so: number, outAnkle: Float64Array, oo: number,
): number {
  let dx = A[ao]! - H[ho]!, dy = A[ao + 1]! - H[ho + 1]!, dz = A[ao + 2]! - H[ho + 2]!;
  const d0 = Math.sqrt(dx * dx + dy * dy + dz * dz);
  dx /= d0; dy /= d0; dz /= d0;
  const dMax = (Lt + Ls) * (1 - 1e-12), dMin = Math.abs(Lt - Ls) + 1e-6;
  const d = d0 > dMax ? dMax : d0 < dMin ? dMin : d0;
  // In-plane bend direction: the pole without its component along the hip-ankle line.
  let nx = pole[po]!, ny = pole[po + 1]!, nz = pole[po + 2]!;
  const pd = nx * dx + ny * dy + nz * dz;
  nx -= pd * dx; ny -= pd * dy; nz -= pd * dz;
  const nl = Math.sqrt(nx * nx + ny * ny + nz * nz);
  nx /= nl; ny /= nl; nz /= nl;
  const cb = (Lt * Lt + d * d - Ls * Ls) / (2 * Lt * d);
  const sb = Math.sqrt(Math.max(0, 1 - cb * cb));
  const kx = H[ho]! + Lt * (cb * dx + sb * nx), ky = H[ho + 1]! + Lt * (cb * dy + sb * ny), kz = H[ho + 2]! + Lt * (cb * dz + sb * nz);
  const ax = H[ho]! + d * dx, ay = H[ho + 1]! + d * dy, az = H[ho + 2]! + d * dz;
  outAnkle[oo] = ax; outAnkle[oo + 1] = ay; outAnkle[oo + 2] = az;
  // Thigh frame: y from knee to hip, z the bend direction made perpendicular to y, x = y × z (the hinge).
  const yx = (H[ho]! - kx) / Lt, yy = (H[ho + 1]! - ky) / Lt, yz = (H[ho + 2]! - kz) / Lt;
  const ny2 = nx * yx + ny * yy + nz * yz;
  let zx = nx - ny2 * yx, zy = ny - ny2 * yy, zz = nz - ny2 * yz;
  const zl = Math.sqrt(zx * zx + zy * zy + zz * zz);
  zx /= zl; zy /= zl; zz /= zl;
  const xx = yy * zz - yz * zy, xy = yz * zx - yx * zz, xz = yx * zy - yy * zx;
  thigh[to] = xx; thigh[to + 1] = yx; thigh[to + 2] = zx;
  thigh[to + 3] = xy; thigh[to + 4] = yy; thigh[to + 5] = zy;
  thigh[to + 6] = xz; thigh[to + 7] = yz; thigh[to + 8] = zz;
  // Shank frame: y from ankle to knee, same hinge x, z = x × y.
  const sx = (kx - ax) / Ls, sy = (ky - ay) / Ls, sz = (kz - az) / Ls;
  const wx = xy * sz - xz * sy, wy = xz * sx - xx * sz, wz = xx * sy - xy * sx;
  shank[so] = xx; shank[so + 1] = sx; shank[so + 2] = wx;
  shank[so + 3] = xy; shank[so + 4] = sy; shank[so + 5] = wy;
  shank[so + 6] = xz; shank[so + 7] = sz; shank[so + 8] = wz;
  const cosInner = (Lt * Lt + Ls * Ls - d * d) / (2 * Lt * Ls);
  return Math.PI - Math.acos(Math.max(-1, Math.min(1, cosInner)));
}

/** Returns the hip-to-ankle distance of a leg whose knee is flexed by `knee` radians. */
export function legReach(Lt: number, Ls: number, knee: number): number {
  return Math.sqrt(Lt * Lt + Ls * Ls + 2 * Lt * Ls * Math.cos(knee));
}
