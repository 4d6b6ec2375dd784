// The foot-velocity cross-check of the coordinate events, after O'Connor et al. 2007 ("Automatic detection
// of gait events using kinematic data", Gait & Posture 25): the foot centre is the midpoint of heel and toe;
// initial contact is at a minimum of its vertical velocity, toe-off at its maximum.
import { parabolicOffset } from './events-peaks.js';

/** Writes the vertical velocity (m/s) of the foot centre of one side into `out` (length frames); returns `out`. */
export function footCentreVerticalVelocity(
  heels: Float64Array, positions: Float64Array, jointCount: number, toeJoint: number, side: 0 | 1, fps: number, out: Float64Array,
): Float64Array {
  const F = out.length;
  const z = (f: number) => 0.5 * (heels[f * 6 + side * 3 + 2]! + positions[(f * jointCount + toeJoint) * 3 + 2]!);
  for (let f = 0; f < F; f++) {
    const a = Math.max(0, f - 1), b = Math.min(F - 1, f + 1);
    out[f] = b > a ? ((z(b) - z(a)) * fps) / (b - a) : 0;
  }
  return out;
}

/**
 * Returns the sub-frame initial contact the velocity method finds near the coordinate contact `c`
 * (frames), or NaN: the first minimum of the foot-centre vertical velocity after it turns from rising to
 * falling in terminal swing, searched within `reach` frames of `c`.
 */
export function velocityContact(vz: Float64Array, c: number, reach: number): number {
  const n = vz.length;
  const lo = Math.max(1, Math.floor(c - reach)), hi = Math.min(n - 2, Math.ceil(c + reach));
  // Downward zero crossing nearest to c.
  let cross = -1, bd = Infinity;
  for (let f = lo; f <= hi; f++)
    if (vz[f - 1]! > 0 && vz[f]! <= 0 && Math.abs(f - c) < bd) { bd = Math.abs(f - c); cross = f; }
  const from = cross >= 0 ? cross : Math.max(1, Math.floor(c - 0.3 * reach));
  const to = Math.min(n - 2, from + Math.ceil(reach));
  for (let f = from; f <= to; f++)
    if (vz[f]! < 0 && vz[f]! <= vz[f - 1]! && vz[f]! < vz[f + 1]!) return f + parabolicOffset(vz[f - 1]!, vz[f]!, vz[f + 1]!);
  return NaN;
}

/** Returns the sub-frame toe-off the velocity method finds near the coordinate toe-off `c`: the largest upward foot-centre velocity within `reach` frames, or NaN. */
export function velocityToeOff(vz: Float64Array, c: number, reach: number): number {
  const n = vz.length;
  const lo = Math.max(1, Math.floor(c - reach)), hi = Math.min(n - 2, Math.ceil(c + reach));
  let best = -1, bv = 0;
  for (let f = lo; f <= hi; f++) if (vz[f]! > bv && vz[f]! >= vz[f - 1]! && vz[f]! >= vz[f + 1]!) { bv = vz[f]!; best = f; }
  return best < 0 ? NaN : best + parabolicOffset(vz[best - 1]!, vz[best]!, vz[best + 1]!);
}
