// The walking path by arc length: position and heading in the floor plane, and distance walked over time.
import type { PathSpec } from './options.js';

const PIECE = 0.05; // metres per constant-curvature piece

/** A path sampled as short constant-curvature pieces; heading 0 faces +Z, positive headings turn toward +X (left). */
export interface WalkPath {
  sStart: number;
  count: number;
  x: Float64Array;
  z: Float64Array;
  psi: Float64Array;
  kappa: Float64Array;
}

/** Returns the signed curvature (1/m, + turns left) of a path spec at arc length s ≥ 0. */
export function curvatureAt(spec: PathSpec, s: number): number {
  if (s < 0) return 0;
  const sign = spec.turn === 'right' ? -1 : 1;
  switch (spec.kind) {
    case 'straight':
      return 0;
    case 'circle':
      return sign / (spec.radius ?? 3);
    case 'walkway': {
      const L = spec.length ?? 8;
      const r = spec.radius ?? 1;
      const period = 2 * L + 2 * Math.PI * r;
      const u = s % period;
      return (u >= L && u < L + Math.PI * r) || u >= 2 * L + Math.PI * r ? sign / r : 0;
    }
    case 'serpentine': {
      // heading = A sin(2π s / λ) → curvature = A (2π/λ) cos(2π s / λ)
      const A = ((spec.amplitudeDeg ?? 20) * Math.PI) / 180;
      const lam = spec.wavelength ?? 8;
      return A * ((2 * Math.PI) / lam) * Math.cos((2 * Math.PI * s) / lam);
    }
  }
}

/** Returns the path for arc lengths [sStart, sEnd], through the origin at s = 0 with heading `psi0` (radians). */
export function buildPath(spec: PathSpec, sStart: number, sEnd: number, psi0: number): WalkPath {
  const count = Math.ceil((sEnd - sStart) / PIECE) + 1;
  const x = new Float64Array(count + 1), z = new Float64Array(count + 1), psi = new Float64Array(count + 1), kappa = new Float64Array(count + 1);
  // Straight before s = 0, so start behind the origin along the initial heading.
  const s0 = Math.min(0, sStart);
  x[0] = s0 * Math.sin(psi0);
  z[0] = s0 * Math.cos(psi0);
  psi[0] = psi0;
  for (let i = 0; i < count; i++) {
    const k = curvatureAt(spec, s0 + (i + 0.5) * PIECE);
    kappa[i] = k;
    pieceEnd(x[i]!, z[i]!, psi[i]!, k, PIECE, x, z, psi, i + 1);
  }
  return { sStart: s0, count, x, z, psi, kappa };
}

function pieceEnd(x0: number, z0: number, p0: number, k: number, u: number, ox: Float64Array, oz: Float64Array, op: Float64Array, o: number): void {
  if (Math.abs(k) < 1e-12) {
    ox[o] = x0 + u * Math.sin(p0);
    oz[o] = z0 + u * Math.cos(p0);
    op[o] = p0;
  } else {
    const p = p0 + k * u;
    ox[o] = x0 + (Math.cos(p0) - Math.cos(p)) / k;
    oz[o] = z0 + (Math.sin(p) - Math.sin(p0)) / k;
    op[o] = p;
  }
}

/** Writes [x, z, heading] of the path at arc length s into `out` at `o`. */
export function pathAt(path: WalkPath, s: number, out: Float64Array, o: number): void {
  let i = Math.floor((s - path.sStart) / PIECE);
  if (i < 0) i = 0;
  if (i >= path.count) i = path.count - 1;
  const u = s - (path.sStart + i * PIECE);
  const k = path.kappa[i]!, x0 = path.x[i]!, z0 = path.z[i]!, p0 = path.psi[i]!;
  if (Math.abs(k) < 1e-12) {
    out[o] = x0 + u * Math.sin(p0);
    out[o + 1] = z0 + u * Math.cos(p0);
    out[o + 2] = p0;
  } else {
    const p = p0 + k * u;
    out[o] = x0 + (Math.cos(p0) - Math.cos(p)) / k;
    out[o + 1] = z0 + (Math.sin(p) - Math.sin(p0)) / k;
    out[o + 2] = p;
  }
}

/** Distance walked as a function of time, tabulated. */
export interface DistanceTable {
  t0: number;
  dt: number;
  s: Float64Array;
}

/** Returns the speed factor (≤ 1) for walking along a curve: people slow in tight turns (own model). */
export function turnSpeedFactor(spec: PathSpec, s: number, legLength: number): number {
  let sum = 0;
  for (let k = -4; k <= 4; k++) sum += Math.abs(curvatureAt(spec, s + k * 0.15));
  return 1 / (1 + 0.4 * (sum / 9) * legLength);
}

/** Returns s(t) for t in [t0, t1], integrating ds/dt = speed × turn factor from s(0) = 0. */
export function distanceTable(spec: PathSpec, speed: number, legLength: number, t0: number, t1: number): DistanceTable {
  const dt = 0.002;
  const n0 = Math.ceil(-t0 / dt);
  const n1 = Math.ceil(t1 / dt);
  const s = new Float64Array(n0 + n1 + 1);
  const v = (x: number) => speed * turnSpeedFactor(spec, x, legLength);
  for (let i = n0 + 1; i <= n0 + n1; i++) {
    const a = s[i - 1]!;
    const k1 = v(a);
    s[i] = a + dt * v(a + 0.5 * dt * k1);
  }
  for (let i = n0 - 1; i >= 0; i--) {
    const a = s[i + 1]!;
    const k1 = v(a);
    s[i] = a - dt * v(a - 0.5 * dt * k1);
  }
  return { t0: -n0 * dt, dt, s };
}

/** Returns the distance walked at time t, by linear interpolation of the table. */
export function distanceAt(table: DistanceTable, t: number): number {
  const x = (t - table.t0) / table.dt;
  let i = Math.floor(x);
  const n = table.s.length;
  if (i < 0) i = 0;
  if (i > n - 2) i = n - 2;
  const f = x - i;
  return table.s[i]! + f * (table.s[i + 1]! - table.s[i]!);
}
