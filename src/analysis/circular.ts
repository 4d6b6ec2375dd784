// Circular statistics of angles in degrees (Batschelet 1981; Fisher 1993): the mean direction is the direction
// of the mean unit vector, its length R the mean resultant length (1 = all angles equal, 0 = spread evenly),
// the circular standard deviation √(−2 ln R) and the angular deviation √(2 (1 − R)) (both in radians, returned
// here in degrees). The coupling angle variability of vector coding is the angular deviation (Needham et al.
// 2014, recalled from memory).

const RAD = Math.PI / 180;
const DEG = 180 / Math.PI;

/** Returns an angle in degrees wrapped to (−180, 180]. */
export function wrap180(deg: number): number {
  let a = deg % 360;
  if (a > 180) a -= 360;
  else if (a <= -180) a += 360;
  return a;
}

/** Returns an angle in degrees wrapped to [0, 360). */
export function wrap360(deg: number): number {
  return ((deg % 360) + 360) % 360;
}

/** Mean direction and resultant length of a set of angles. */
export interface CircularSummary {
  /** Mean direction in degrees, (−180, 180]; NaN when there are no angles or R is 0. */
  mean: number;
  /** Mean resultant length, 0..1. */
  R: number;
  /** Number of finite angles used. */
  n: number;
}

/** Returns the mean direction and resultant length of the finite angles (degrees) at a stride through `a`. */
export function circularSummary(a: ArrayLike<number>, start = 0, count = a.length - start, stride = 1): CircularSummary {
  let c = 0, s = 0, n = 0;
  for (let k = 0; k < count; k++) {
    const v = a[start + k * stride]!;
    if (!Number.isFinite(v)) continue;
    c += Math.cos(v * RAD); s += Math.sin(v * RAD); n++;
  }
  if (n === 0) return { mean: NaN, R: NaN, n: 0 };
  c /= n; s /= n;
  const R = Math.min(1, Math.hypot(c, s));
  return { mean: R > 1e-12 ? wrap180(Math.atan2(s, c) * DEG) : NaN, R, n };
}

/** Returns the circular mean of the finite angles in degrees, (−180, 180] (NaN when undefined). */
export function circularMean(a: ArrayLike<number>): number {
  return circularSummary(a).mean;
}

/** Returns the mean resultant length of the finite angles (degrees), 0..1. */
export function resultantLength(a: ArrayLike<number>): number {
  return circularSummary(a).R;
}

/** Returns the circular standard deviation √(−2 ln R) in degrees for a resultant length R. */
export function circularSdFromR(R: number): number {
  if (!(R > 0)) return R === 0 ? Infinity : NaN;
  return Math.sqrt(-2 * Math.log(Math.min(1, R))) * DEG;
}

/** Returns the angular deviation √(2 (1 − R)) in degrees for a resultant length R. */
export function angularDeviationFromR(R: number): number {
  if (!Number.isFinite(R)) return NaN;
  return Math.sqrt(2 * (1 - Math.min(1, R))) * DEG;
}

/** Returns the circular standard deviation of the finite angles in degrees. */
export function circularSd(a: ArrayLike<number>): number {
  return circularSdFromR(resultantLength(a));
}

/**
 * Writes, for each column of a rows × cols matrix of angles (degrees), the circular mean (−180, 180] into
 * `outMean` and the resultant length into `outR`, over the rows listed in `rows` (all rows when omitted;
 * a row may repeat, as in a bootstrap draw); non-finite entries are skipped; `unit` (from unitVectors of the
 * same matrix) saves the trigonometry on repeated calls. Returns nothing.
 */
export function circularColumns(m: Float64Array, nRows: number, cols: number, outMean: Float64Array, outR: Float64Array, rows?: ArrayLike<number>, unit?: UnitVectors): void {
  const count = rows ? rows.length : nRows;
  for (let i = 0; i < cols; i++) {
    let c = 0, s = 0, n = 0;
    for (let k = 0; k < count; k++) {
      const r = rows ? rows[k]! : k;
      const o = r * cols + i, v = m[o]!;
      if (!Number.isFinite(v)) continue;
      if (unit) { c += unit.cos[o]!; s += unit.sin[o]!; } else { c += Math.cos(v * RAD); s += Math.sin(v * RAD); }
      n++;
    }
    if (n === 0) { outMean[i] = NaN; outR[i] = NaN; continue; }
    c /= n; s /= n;
    const R = Math.min(1, Math.hypot(c, s));
    outMean[i] = R > 1e-12 ? wrap180(Math.atan2(s, c) * DEG) : NaN;
    outR[i] = R;
  }
}

/** Cosines and sines of a matrix of angles, entry by entry. */
export interface UnitVectors {
  cos: Float64Array;
  sin: Float64Array;
}

/** Returns the cosine and sine of every angle (degrees) of a matrix (NaN stays NaN). */
export function unitVectors(m: Float64Array): UnitVectors {
  const cos = new Float64Array(m.length), sin = new Float64Array(m.length);
  for (let i = 0; i < m.length; i++) { cos[i] = Math.cos(m[i]! * RAD); sin[i] = Math.sin(m[i]! * RAD); }
  return { cos, sin };
}
