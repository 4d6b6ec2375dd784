// The classic coupling measures on synthesized takes (src/synth): a one-sided impairment must show as a larger
// left/right difference of the affected pair than on the same subject walking normally, on the impaired side.
import { describe, expect, it } from 'vitest';
import { circularRmsDifference } from '../../src/analysis/classic-asymmetry.js';
import { classicCouplings, type ClassicCouplings, type ClassicPairJson } from '../../src/analysis/classic-couplings.js';
import { analyzeGait } from '../../src/gait/analyze.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake, type SynthOptions } from '../../src/synth/index.js';

function couplings(seed: number, impairments: SynthOptions['impairments'] = {}): ClassicCouplings {
  const r = synthesizeTake({ seed, duration: 15, impairments });
  return classicCouplings(analyzeGait(resolveImported(`synth-${seed}.bvh`, r.take)));
}
const pair = (c: ClassicCouplings, name: string, side: string): ClassicPairJson => c.pairs.find((p) => p.name === name && p.side === side)!;
const asym = (c: ClassicCouplings, name: string) => c.asymmetry.find((a) => a.pair === name)!;
const nums = (a: (number | null)[]) => a.map((v) => (v === null ? NaN : v));

describe('classic couplings on synthesized takes', () => {
  const healthy = couplings(11);
  const stiffRightKnee = couplings(11, { right: { kneeRange: 0.5 } });
  const weakLeftArm = couplings(11, { left: { armSwing: 0.3 } });

  it('gives every pair on both sides with 101-point curves and bins summing to 100 %', () => {
    expect(healthy.pairs.map((p) => `${p.name} ${p.side}`).sort()).toEqual(
      ['arm-leg left', 'arm-leg right', 'hip-knee left', 'hip-knee right', 'knee-ankle left', 'knee-ankle right']);
    for (const p of healthy.pairs) {
      expect(p.cycles).toBeGreaterThan(5);
      expect(p.crp.mean.length).toBe(101);
      expect(p.vectorCoding.meanAngle.length).toBe(101);
      const b = p.vectorCoding.bins;
      expect(b.in_phase! + b.anti_phase! + b.proximal! + b.distal!).toBeCloseTo(100, 9);
    }
    expect(pair(healthy, 'arm-leg', 'left').cycle_side).toBe('right');
    expect(pair(healthy, 'arm-leg', 'left').proximal).toBe('right hip_flexion');
    expect(JSON.parse(JSON.stringify(healthy))).toEqual(healthy);
  });

  it('finds each arm nearer in phase with the opposite leg than anti-phase (common practice: arms swing with the opposite leg)', () => {
    for (const side of ['left', 'right']) expect(pair(healthy, 'arm-leg', side).crp.marp!).toBeLessThan(45);
  });

  it('shows a reduced right knee range as a larger hip-knee left/right difference than in normal walking', () => {
    const h = asym(healthy, 'hip-knee').left_vs_right, s = asym(stiffRightKnee, 'hip-knee');
    expect(s.left_vs_right.vc_angle_rms_diff!).toBeGreaterThan(2 * h.vc_angle_rms_diff!);
    expect(s.left_vs_right.crp_curve_rms_diff!).toBeGreaterThan(h.crp_curve_rms_diff!);
    expect(s.left_vs_right.vc_bin_diff!).toBeGreaterThan(h.vc_bin_diff!);
    // The bootstrap interval of the impaired take lies above the healthy take's figure.
    expect(s.ci!.vc_angle_rms_diff![0]).toBeGreaterThan(h.vc_angle_rms_diff!);
  });

  it('changes the right hip-knee coupling, not the left', () => {
    const moved = (side: string) => circularRmsDifference(nums(pair(healthy, 'hip-knee', side).vectorCoding.meanAngle), nums(pair(stiffRightKnee, 'hip-knee', side).vectorCoding.meanAngle));
    expect(moved('right')).toBeGreaterThan(3 * moved('left'));
  });

  it('shows a reduced left arm swing on the left arm-leg diagonal: the leg dominates (proximal share rises)', () => {
    const L = pair(weakLeftArm, 'arm-leg', 'left').vectorCoding.bins, R = pair(weakLeftArm, 'arm-leg', 'right').vectorCoding.bins;
    expect(L.proximal!).toBeGreaterThan(R.proximal! + 20);
    expect(L.proximal!).toBeGreaterThan(pair(healthy, 'arm-leg', 'left').vectorCoding.bins.proximal! + 20);
    expect(asym(weakLeftArm, 'arm-leg').left_vs_right.vc_bin_diff!).toBeGreaterThan(asym(healthy, 'arm-leg').left_vs_right.vc_bin_diff!);
  });

  it('draws the same bootstrap for the same seed', () => {
    const r = synthesizeTake({ seed: 11, duration: 15 });
    const a = analyzeGait(resolveImported('synth-11.bvh', r.take));
    expect(classicCouplings(a, { seed: 5 }).asymmetry).toEqual(classicCouplings(a, { seed: 5 }).asymmetry);
    expect(classicCouplings(a, { bootstrap: 0 }).asymmetry.every((x) => x.ci === null)).toBe(true);
  });
});
