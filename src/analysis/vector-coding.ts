// Vector coding (Needham et al. 2014, 2015, modified vector coding): on the angle-angle plot with the proximal
// signal on x and the distal on y, the coupling angle of each step is γ_i = atan2(y_{i+1} − y_i, x_{i+1} − x_i)
// in degrees, [0, 360). Across cycles each point has a circular mean γ̄ and a coupling angle variability, the
// angular deviation √(2 (1 − R)) (Needham et al. 2014, recalled from memory); the circular SD √(−2 ln R) is
// given beside it. The mean coupling angle is classified into four coordination patterns of 45° bins
// (as listed in Needham et al. 2015, recalled from memory: the bins follow Chang et al. 2008; the 2015
// paper's finer split by rotation direction is not implemented), lower bound inclusive, upper exclusive:
//   in-phase     [22.5, 67.5) and [202.5, 247.5)    both signals change the same way
//   anti-phase   [112.5, 157.5) and [292.5, 337.5)  they change in opposite ways
//   proximal     [0, 22.5), [157.5, 202.5), [337.5, 360)  mostly the proximal signal moves
//   distal       [67.5, 112.5) and [247.5, 292.5)   mostly the distal signal moves
// Over a cycle, point i (i %) carries the step from i % to (i + 1) %, so the 101 points run one sample past
// 100 % (into the next cycle, clamped at the end of the take); bin shares count the points 0..99, 1 % each.
import { sampleAt, type CycleSpan } from '../gait/normalize.js';
import { angularDeviationFromR, circularColumns, circularSdFromR, wrap360, type UnitVectors } from './circular.js';
import { usedRows } from './crp.js';

const DEG = 180 / Math.PI;

/** The four coordination patterns. */
export const COUPLING_PATTERNS = ['in_phase', 'anti_phase', 'proximal', 'distal'] as const;
export type CouplingPattern = (typeof COUPLING_PATTERNS)[number];

/** Share of the cycle (percent) in each pattern. */
export type PatternShares = Record<CouplingPattern, number>;

/** Returns the coupling angle of a step (dx proximal, dy distal) in degrees, [0, 360); NaN when neither moves. */
export function couplingAngle(dx: number, dy: number): number {
  if (!(Math.abs(dx) > 1e-12 || Math.abs(dy) > 1e-12)) return NaN;
  return wrap360(Math.atan2(dy, dx) * DEG);
}

/** Returns the coordination pattern of a coupling angle in degrees (any real value; taken modulo 360). */
export function couplingPattern(angle: number): CouplingPattern {
  const a = wrap360(angle) % 180; // the pattern repeats every 180°
  if (a < 22.5 || a >= 157.5) return 'proximal';
  if (a < 67.5) return 'in_phase';
  if (a < 112.5) return 'distal';
  return 'anti_phase';
}

/** Returns the coupling angles of successive samples of two equal-length series: n − 1 angles, degrees. */
export function couplingAngles(x: ArrayLike<number>, y: ArrayLike<number>, out = new Float64Array(Math.max(0, x.length - 1))): Float64Array {
  for (let i = 0; i + 1 < x.length; i++) out[i] = couplingAngle(x[i + 1]! - x[i]!, y[i + 1]! - y[i]!);
  return out;
}

/** Returns the percentage of the finite angles in each pattern (angles[start .. start + count)). */
export function patternShares(angles: ArrayLike<number>, start = 0, count = angles.length - start): PatternShares {
  const tally: PatternShares = { in_phase: 0, anti_phase: 0, proximal: 0, distal: 0 };
  let n = 0;
  for (let i = 0; i < count; i++) {
    const a = angles[start + i]!;
    if (!Number.isFinite(a)) continue;
    tally[couplingPattern(a)]++; n++;
  }
  for (const p of COUPLING_PATTERNS) tally[p] = n ? (100 * tally[p]) / n : NaN;
  return tally;
}

/** Coupling-angle curves of several cycles and their summaries. */
export interface VectorCodingCycles {
  cycles: number;
  samples: number;
  /** cycles × samples, degrees [0, 360) (NaN where a signal is missing or neither moves). */
  curves: Float64Array;
  /** Circular mean coupling angle per point, degrees [0, 360). */
  meanAngle: Float64Array;
  /** Coupling angle variability (angular deviation) per point, degrees. */
  variability: Float64Array;
  /** Circular SD per point, degrees. */
  circularSd: Float64Array;
  /** Share of the cycle (points 0 .. samples − 2) in each pattern of the mean coupling angle, percent. */
  shares: PatternShares;
}

/** Returns the coupling-angle curves over the cycles (per-frame signals in) with mean, variability and pattern shares. */
export function vectorCodingCycles(proximal: ArrayLike<number>, distal: ArrayLike<number>, cycles: readonly CycleSpan[], samples = 101): VectorCodingCycles {
  const C = cycles.length;
  const curves = new Float64Array(C * samples);
  for (let k = 0; k < C; k++) {
    const c = cycles[k]!, step = (c.end - c.start) / (samples - 1);
    let px = sampleAt(proximal, c.start), py = sampleAt(distal, c.start);
    for (let i = 0; i < samples; i++) {
      const at = i === samples - 2 ? c.end : c.start + (i + 1) * step;
      const qx = sampleAt(proximal, at), qy = sampleAt(distal, at);
      curves[k * samples + i] = couplingAngle(qx - px, qy - py);
      px = qx; py = qy;
    }
  }
  return { cycles: C, samples, curves, ...summariseVectorCoding(curves, C, samples) };
}

/** Returns the mean angle, variability, circular SD and pattern shares of coupling-angle curves (rows as drawn when given). */
export function summariseVectorCoding(curves: Float64Array, C: number, samples: number, rows?: ArrayLike<number>, unit?: UnitVectors): Omit<VectorCodingCycles, 'cycles' | 'samples' | 'curves'> {
  const meanAngle = new Float64Array(samples), R = new Float64Array(samples);
  const variability = new Float64Array(samples), circularSd = new Float64Array(samples);
  circularColumns(curves, C, samples, meanAngle, R, rows, unit);
  const many = usedRows(curves, C, samples, rows) > 1;
  for (let i = 0; i < samples; i++) {
    meanAngle[i] = Number.isFinite(meanAngle[i]!) ? wrap360(meanAngle[i]!) : NaN;
    variability[i] = many ? angularDeviationFromR(R[i]!) : NaN;
    circularSd[i] = many ? circularSdFromR(R[i]!) : NaN;
  }
  return { meanAngle, variability, circularSd, shares: patternShares(meanAngle, 0, samples - 1) };
}
