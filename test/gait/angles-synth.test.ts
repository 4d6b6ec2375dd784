// Joint angles on synthesized walking takes against the walker's own truth: its knee channel (the knee's local
// rotation is a pure rotation about the knee's X axis, see src/synth/swing.ts and the truth's conventions) and
// the peak of its nominal knee curve (truth.sides.*.nominalPeakKneeDeg). Cycles come from the truth events.
import { describe, expect, it } from 'vitest';
import { jointAngles, type AngleSeries } from '../../src/gait/angles.js';
import { prepareGait } from '../../src/gait/input.js';
import { cyclesFromContacts, meanSd, normaliseCycles, peakInSwing, rangeOfMotion } from '../../src/gait/normalize.js';
import { curveSymmetry, symmetryAngle, symmetryIndex, symmetryRatio } from '../../src/gait/symmetry.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake, type SynthOptions, type SynthResult } from '../../src/synth/index.js';

const SIDES = ['left', 'right'] as const;

function analyse(options: Partial<SynthOptions> & { seed: number }): { r: SynthResult; a: AngleSeries } {
  const r = synthesizeTake(options);
  return { r, a: jointAngles(prepareGait(resolveImported(`synth-${options.seed}.bvh`, r.take))) };
}

/** Returns the knee flexion the walker wrote, per frame, from its knee's X rotation channel (sign by up axis). */
function kneeChannel(r: SynthResult, side: 'left' | 'right'): Float64Array {
  const name = r.truth.jointNames[side === 'left' ? 'l_knee' : 'r_knee'];
  const j = r.take.joints.find((x) => x.name === name)!;
  const c = j.channelStart + j.channels.indexOf('Xrotation');
  // Z-up files map the walker's left axis to −X, so flexion is −Xrotation there (truth.conventions).
  const sign = r.truth.upAxis === 'Y' ? 1 : -1;
  const out = new Float64Array(r.take.frameCount);
  for (let f = 0; f < out.length; f++) out[f] = sign * r.take.values[f * r.take.channelCount + c]!;
  return out;
}

function peakSwing(series: Float64Array, r: SynthResult, side: 'left' | 'right'): number {
  const ev = r.truth.events[side];
  return meanSd(peakInSwing(series, cyclesFromContacts(ev.initialContactFrames), ev.toeOffFrames)).mean;
}

describe('peak swing knee flexion on default synthesized takes', () => {
  for (const seed of [1, 2]) {
    it(`agrees with the walker's truth within 2° and lies in 55-65° (seed ${seed})`, () => {
      const { r, a } = analyse({ seed });
      for (const side of SIDES) {
        const measured = peakSwing(a[side].knee_flexion, r, side);
        expect(Math.abs(measured - peakSwing(kneeChannel(r, side), r, side))).toBeLessThan(2);
        expect(Math.abs(measured - r.truth.sides[side].nominalPeakKneeDeg)).toBeLessThan(2);
        // Peak swing knee flexion of healthy walking is about 60° (common practice; Perry and Burnfield 2010, recalled from memory).
        expect(measured).toBeGreaterThan(55);
        expect(measured).toBeLessThan(65);
      }
    });
  }
  it('holds for a Z-up, metre take with mixed rotation orders', () => {
    const { r, a } = analyse({ seed: 4, upAxis: 'Z', units: 'm', rotationOrder: 'mixed', duration: 12 });
    for (const side of SIDES)
      expect(Math.abs(peakSwing(a[side].knee_flexion, r, side) - peakSwing(kneeChannel(r, side), r, side))).toBeLessThan(2);
  });
  it('follows the walker knee frame by frame without the low-pass filter', () => {
    // Unfiltered, the angle from joint centres equals the channel up to the file's 2-decimal rounding.
    const r = synthesizeTake({ seed: 5, duration: 6 });
    const a = jointAngles(prepareGait(resolveImported('synth-5.bvh', r.take), null));
    const truth = kneeChannel(r, 'left');
    let worst = 0;
    for (let f = 0; f < truth.length; f++) worst = Math.max(worst, Math.abs(a.left.knee_flexion[f]! - truth[f]!));
    expect(worst).toBeLessThan(0.1);
  });
});

describe('a knee with reduced range on one side', () => {
  it('lowers that side\'s knee range of motion and moves the symmetry measures towards the other side', () => {
    // Right knee keeps 60 % of its range: the right's range is smaller, so SI = (R − L) / (0.5 (R + L)) < 0,
    // R / L < 1 and the symmetry angle < 0 (all: positive means the right is larger).
    const { r, a } = analyse({ seed: 3, impairments: { right: { kneeRange: 0.6 } } });
    const rom = SIDES.map((side) => meanSd(rangeOfMotion(a[side].knee_flexion, cyclesFromContacts(r.truth.events[side].initialContactFrames))).mean);
    const [l, rr] = rom as [number, number];
    expect(rr).toBeLessThan(l - 2);
    expect(symmetryIndex(l, rr).value!).toBeLessThan(-3);
    expect(symmetryRatio(l, rr).value!).toBeLessThan(1);
    expect(symmetryAngle(l, rr).value!).toBeLessThan(0);
    // The healthy take of the same seed is much closer to symmetric.
    const h = analyse({ seed: 3 });
    const romH = SIDES.map((side) => meanSd(rangeOfMotion(h.a[side].knee_flexion, cyclesFromContacts(h.r.truth.events[side].initialContactFrames))).mean);
    expect(Math.abs(symmetryIndex(romH[0]!, romH[1]!).value!)).toBeLessThan(Math.abs(symmetryIndex(l, rr).value!) / 2);
    // The impaired side's measured peak still follows what the walker wrote.
    expect(Math.abs(peakSwing(a.right.knee_flexion, r, 'right') - peakSwing(kneeChannel(r, 'right'), r, 'right'))).toBeLessThan(2);
  });
});

describe('normalised knee curves of a default take', () => {
  it('have the two sides in phase and closely correlated', () => {
    // Both sides of the walker follow one normative knee curve (src/synth/curves.ts), each from its own contact.
    const { r, a } = analyse({ seed: 1 });
    const mean = SIDES.map((side) => normaliseCycles(a[side].knee_flexion, cyclesFromContacts(r.truth.events[side].initialContactFrames)).mean);
    const c = curveSymmetry(mean[0]!, mean[1]!);
    if (c.correlation === null) throw new Error('no correlation');
    expect(c.correlation).toBeGreaterThan(0.99);
    expect('lagPct' in c && Math.abs(c.lagPct)).toBeLessThanOrEqual(2);
  });
});
