// Periodic gait-cycle curves: smooth cubic Hermite interpolation through (percent of cycle, degrees) points.

/** A periodic curve over one gait cycle (phase 0..1), with knots, values and tangents. */
export interface CycleCurve {
  t: Float64Array;
  v: Float64Array;
  m: Float64Array;
}

/** Returns a periodic curve through points given as [percent of cycle, value], percents ascending in [0, 100). */
export function cycleCurve(points: readonly (readonly [number, number])[]): CycleCurve {
  const n = points.length;
  const t = new Float64Array(n), v = new Float64Array(n), m = new Float64Array(n);
  points.forEach(([p, val], i) => { t[i] = p / 100; v[i] = val; });
  for (let i = 0; i < n; i++) {
    const ip = (i + n - 1) % n, inx = (i + 1) % n;
    const tp = t[ip]! - (ip > i ? 1 : 0);
    const tn = t[inx]! + (inx < i ? 1 : 0);
    m[i] = (v[inx]! - v[ip]!) / (tn - tp);
  }
  return { t, v, m };
}

/** Returns the curve's value at a phase (any real; taken modulo 1). */
export function evalCycle(c: CycleCurve, phase: number): number {
  const x = phase - Math.floor(phase);
  const n = c.t.length;
  let i = n - 1;
  if (x >= c.t[0]!) for (let k = 0; k < n - 1; k++) if (x < c.t[k + 1]!) { i = k; break; }
  const t0 = c.t[i]!;
  const t1 = i + 1 < n ? c.t[i + 1]! : c.t[0]! + 1;
  const xx = x < t0 ? x + 1 : x; // before the first knot: on the wrap segment
  const h = t1 - t0;
  const s = (xx - t0) / h;
  const v0 = c.v[i]!, v1 = c.v[(i + 1) % n]!, m0 = c.m[i]! * h, m1 = c.m[(i + 1) % n]! * h;
  const s2 = s * s, s3 = s2 * s;
  return (2 * s3 - 3 * s2 + 1) * v0 + (s3 - 2 * s2 + s) * m0 + (-2 * s3 + 3 * s2) * v1 + (s3 - s2) * m1;
}

/** Returns 3x² - 2x³ of x clamped to [0, 1]: a smooth 0→1 ramp. */
export function smoothstep(x: number): number {
  const c = x < 0 ? 0 : x > 1 ? 1 : x;
  return c * c * (3 - 2 * c);
}

// Normative sagittal curves of healthy adult walking at a self-selected speed, toe-off at 62 % of the cycle.
// Shapes after the gait handbooks (Winter 2009, "Biomechanics and Motor Control of Human Movement";
// Perry and Burnfield 2010, "Gait Analysis: Normal and Pathological Function") — recalled from memory.

/** Hip flexion (+) / extension (-) of the thigh relative to the pelvis: ~30° at contact, ~-10° in terminal stance. */
export const HIP_FLEXION = cycleCurve([
  [0, 30], [10, 26], [20, 16], [30, 6], [40, -3], [50, -9], [56, -7], [62, 0], [70, 14], [78, 26], [86, 33], [93, 32],
]);

/** Knee flexion: ~18° loading response, near extension in mid/terminal stance, ~60° peak in swing. */
export const KNEE_FLEXION = cycleCurve([
  [0, 4], [6, 11], [14, 18], [22, 14], [32, 7], [41, 4], [48, 7], [55, 18], [62, 38], [67, 52], [72, 60], [78, 55],
  [85, 38], [92, 16], [97, 5],
]);

/** Ankle dorsiflexion (+) / plantarflexion (-): used for the swing foot; the stance ankle follows from the foot rocker. */
export const ANKLE_DORSIFLEXION = cycleCurve([
  [0, 0], [6, -5], [12, -2], [25, 5], [40, 9], [48, 10], [55, 3], [62, -14], [65, -17], [72, -9], [80, -2], [88, 1], [95, 1],
]);

/** Toe (MTP) extension: rises through heel-off and pre-swing, gone by mid-swing. */
export const TOE_EXTENSION = cycleCurve([
  [0, 0], [30, 0], [45, 8], [55, 25], [62, 35], [70, 18], [80, 4], [88, 0],
]);

/** Toe-off of the normative curves, as a fraction of the cycle. */
export const NORMATIVE_TOE_OFF = 0.62;

/** Returns the normative-curve phase for a cycle phase `p` of a stride whose stance ends at `stance` (0..1). */
export function warpPhase(p: number, stance: number): number {
  return p < stance ? (NORMATIVE_TOE_OFF * p) / stance : NORMATIVE_TOE_OFF + ((1 - NORMATIVE_TOE_OFF) * (p - stance)) / (1 - stance);
}
