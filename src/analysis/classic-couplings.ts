// The classic coupling measures of a take: continuous relative phase (crp.ts) and vector coding
// (vector-coding.ts) for hip-knee and knee-ankle on each side and for the two arm-leg diagonals, over each
// side's steady gait cycles, with a left/right asymmetry of every pair (classic-asymmetry.ts).
//
// Signals (degrees per frame, flexion positive, see src/gait/angles.ts and limb-angles.ts):
//   hip-knee    proximal = hip flexion, distal = knee flexion, over that side's cycles
//   knee-ankle  proximal = knee flexion, distal = ankle dorsiflexion, over that side's cycles
//   arm-leg     side = the arm's side; proximal (x) = the opposite leg's hip flexion, distal (y) = the arm's
//               sagittal angle, over the opposite leg's cycles. Its mirror is the other diagonal. "Proximal"
//               and "distal" name the plot axes here (leg on x, arm on y), not a segment order.
import { jointAngles, type AngleSeries } from '../gait/angles.js';
import type { GaitAnalysis } from '../gait/analyze.js';
import type { CycleSpan } from '../gait/normalize.js';
import type { SideName } from '../gait/types.js';
import { classicAsymmetry, type ClassicAsymmetry } from './classic-asymmetry.js';
import { relativePhaseCycles, type CrpCycles } from './crp.js';
import { sagittalArmAngles } from './limb-angles.js';
import { vectorCodingCycles, type PatternShares, type VectorCodingCycles } from './vector-coding.js';

/** The pairs measured. */
export const CLASSIC_PAIR_NAMES = ['hip-knee', 'knee-ankle', 'arm-leg'] as const;
export type ClassicPairName = (typeof CLASSIC_PAIR_NAMES)[number];

/** One pair on one side with its per-cycle curves (typed arrays, before JSON). */
export interface ClassicPairCycles {
  name: ClassicPairName;
  side: SideName;
  /** Whose gait cycles the curves run over. */
  cycleSide: SideName;
  proximal: string;
  distal: string;
  crp: CrpCycles;
  vc: VectorCodingCycles;
}

/** Options of the classic measures. */
export interface ClassicOptions {
  /** The take's per-frame angles, when already computed (else recomputed from the analysis). */
  series?: AngleSeries;
  /** Bootstrap replicates over cycles for the asymmetry intervals (default 200; 0 for none). */
  bootstrap?: number;
  /** Seed of the bootstrap draws (default 1). */
  seed?: number;
}

/** One pair on one side, plain data (NaN written as null). */
export interface ClassicPairJson {
  name: ClassicPairName;
  side: SideName;
  cycle_side: SideName;
  proximal: string;
  distal: string;
  cycles: number;
  crp: { mean: (number | null)[]; sd: (number | null)[]; marp: number | null; dp: number | null };
  vectorCoding: { meanAngle: (number | null)[]; variability: (number | null)[]; circularSd: (number | null)[]; bins: Record<keyof PatternShares, number | null> };
}

/** The classic coupling measures of a take, plain data ready for JSON. */
export interface ClassicCouplings {
  pairs: ClassicPairJson[];
  asymmetry: ClassicAsymmetry[];
  method: Record<string, string>;
  warnings: string[];
}

const other = (s: SideName): SideName => (s === 'left' ? 'right' : 'left');
const num = (v: number): number | null => (Number.isFinite(v) ? v : null);
const list = (a: Float64Array) => Array.from(a, num);

/** Returns every pair's per-cycle curves (typed arrays) and the warnings met on the way. */
export function classicPairCycles(analysis: GaitAnalysis, options: ClassicOptions = {}): { pairs: ClassicPairCycles[]; warnings: string[] } {
  const series = options.series ?? jointAngles(analysis.input, analysis.detection.direction);
  const arms = sagittalArmAngles(analysis.input, analysis.detection.direction);
  const warnings = [...arms.warnings];
  const pairs: ClassicPairCycles[] = [];
  const add = (name: ClassicPairName, side: SideName, cycleSide: SideName, proximal: string, distal: string, x: Float64Array, y: Float64Array) => {
    const cycles: CycleSpan[] = analysis.cycles[cycleSide].cycles;
    if (cycles.length === 0) { warnings.push(`no ${cycleSide} gait cycles: the ${side} ${name} coupling is not measured.`); return; }
    pairs.push({ name, side, cycleSide, proximal, distal, crp: relativePhaseCycles(x, y, cycles), vc: vectorCodingCycles(x, y, cycles) });
  };
  for (const side of ['left', 'right'] as const) {
    const s = series[side];
    add('hip-knee', side, side, `${side} hip_flexion`, `${side} knee_flexion`, s.hip_flexion, s.knee_flexion);
    add('knee-ankle', side, side, `${side} knee_flexion`, `${side} ankle_dorsiflexion`, s.knee_flexion, s.ankle_dorsiflexion);
  }
  for (const side of ['left', 'right'] as const) {
    if (!arms.present[side]) continue;
    const leg = other(side);
    add('arm-leg', side, leg, `${leg} hip_flexion`, `${side} arm_flexion`, series[leg].hip_flexion, arms[side]);
  }
  return { pairs, warnings };
}

/** Returns one pair's plain-data form. */
export function classicPairJson(p: ClassicPairCycles): ClassicPairJson {
  const b = p.vc.shares;
  return {
    name: p.name, side: p.side, cycle_side: p.cycleSide, proximal: p.proximal, distal: p.distal, cycles: p.crp.cycles,
    crp: { mean: list(p.crp.mean), sd: list(p.crp.sd), marp: num(p.crp.marp), dp: num(p.crp.dp) },
    vectorCoding: {
      meanAngle: list(p.vc.meanAngle), variability: list(p.vc.variability), circularSd: list(p.vc.circularSd),
      bins: { in_phase: num(b.in_phase), anti_phase: num(b.anti_phase), proximal: num(b.proximal), distal: num(b.distal) },
    },
  };
}

/** Short statements of the methods, for reports. */
export const CLASSIC_METHODS: Record<string, string> = {
  crp: 'continuous relative phase by the Hilbert transform (Lamb and Stöckl 2014): signals centred on their range midpoint, phase atan2(H(x), x), CRP = distal − proximal phase in degrees; circular mean and SD across cycles; MARP and DP',
  vector_coding: 'vector coding (Needham et al. 2014, 2015): coupling angle atan2(Δdistal, Δproximal), 0-360°, circular mean and angular-deviation variability across cycles; 45° pattern bins',
  arm_angle: 'upper arm (shoulder to elbow) in the sagittal plane of the walking direction, forward positive',
  asymmetry: 'left pair minus its mirrored right pair; bootstrap over cycles, 2.5-97.5 percentiles',
};

/** Returns the classic coupling measures of a gait analysis (pairs and left/right asymmetry), plain data. */
export function classicCouplings(analysis: GaitAnalysis, options: ClassicOptions = {}): ClassicCouplings {
  const { pairs, warnings } = classicPairCycles(analysis, options);
  return {
    pairs: pairs.map(classicPairJson),
    asymmetry: classicAsymmetry(pairs, { replicates: options.bootstrap ?? 200, seed: options.seed ?? 1 }),
    method: CLASSIC_METHODS,
    warnings,
  };
}
