// Left/right asymmetry of the classic measures on constructed pairs with known phase relations, and its two
// distances against hand-computed values.
import { describe, expect, it } from 'vitest';
import { circularRmsDifference, classicAsymmetry, shareDistance } from '../../src/analysis/classic-asymmetry.js';
import type { ClassicPairCycles } from '../../src/analysis/classic-couplings.js';
import { relativePhaseCycles } from '../../src/analysis/crp.js';
import { vectorCodingCycles } from '../../src/analysis/vector-coding.js';

const fps = 100, T = 1.07, F = 1100;
const wave = (lagDeg: number, amp = 1) => Float64Array.from({ length: F }, (_, f) => amp * Math.sin((2 * Math.PI * f) / (fps * T) + (lagDeg * Math.PI) / 180));
const cycles = Array.from({ length: 8 }, (_, k) => ({ start: 60 + k * T * fps, end: 60 + (k + 1) * T * fps }));
function pair(side: 'left' | 'right', lag: number, amp = 1): ClassicPairCycles {
  const x = wave(0), y = wave(lag, amp);
  return { name: 'hip-knee', side, cycleSide: side, proximal: `${side} hip_flexion`, distal: `${side} knee_flexion`,
    crp: relativePhaseCycles(x, y, cycles), vc: vectorCodingCycles(x, y, cycles) };
}

describe('asymmetry distances', () => {
  it('takes the RMS of wrapped differences (10 vs 350 and 350 vs 10 differ by 20°)', () => {
    expect(circularRmsDifference([10, 350], [350, 10])).toBeCloseTo(20, 10);
    expect(circularRmsDifference([10, NaN], [20, 5])).toBeCloseTo(10, 10);
  });
  it('takes half the summed share differences (hand-computed: (10 + 0 + 10 + 0) / 2 = 10)', () => {
    expect(shareDistance({ in_phase: 40, anti_phase: 30, proximal: 20, distal: 10 }, { in_phase: 30, anti_phase: 30, proximal: 30, distal: 10 })).toBe(10);
  });
});

describe('classicAsymmetry', () => {
  it('gives a 30° relative-phase difference when the left lags by 90° and the right by 60°', () => {
    const [a] = classicAsymmetry([pair('left', 90), pair('right', 60)], { replicates: 100, seed: 3 });
    expect(a!.pair).toBe('hip-knee');
    expect(a!.left_vs_right.crp_marp_diff!).toBeCloseTo(30, 0);
    expect(a!.left_vs_right.crp_curve_rms_diff!).toBeCloseTo(30, 0);
    // Identical cycles: every bootstrap draw gives the same figure, so the interval is the point.
    expect(a!.ci!.crp_curve_rms_diff![0]).toBeCloseTo(30, 0);
    expect(a!.ci!.crp_curve_rms_diff![1]).toBeCloseTo(30, 0);
    expect(a!.replicates).toBe(100);
  });
  it('gives zero for a mirror-identical pair', () => {
    const [a] = classicAsymmetry([pair('left', 45, 2), pair('right', 45, 2)], { replicates: 0 });
    const f = a!.left_vs_right;
    for (const v of [f.crp_marp_diff, f.crp_curve_rms_diff, f.vc_angle_rms_diff, f.vc_bin_diff]) expect(Math.abs(v!)).toBeLessThan(1e-9);
    expect(a!.ci).toBeNull();
  });
  it('leaves out a pair measured on one side only', () => {
    expect(classicAsymmetry([pair('left', 45)])).toEqual([]);
  });
});
