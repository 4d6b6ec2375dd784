// Impairments change the intended side; healthy defaults carry only small natural left/right differences.
import { describe, expect, it } from 'vitest';
import { parseBvh } from '../../src/bvh/parse.js';
import { planFk, poseFrame } from '../../src/skeleton/fk.js';
import { type SynthOptions, synthesizeTake } from '../../src/synth/index.js';
import { detectEvents, maxStanceSlide, measure, median, swingKneePeaks } from './support.js';

const base = { seed: 31, subjectSeed: 31, duration: 20, frameRate: 100 };

/** Returns the median swing knee peak of each side (degrees), and the worst stance slide (m). */
function kneePeaks(opts: Partial<SynthOptions>): { left: number; right: number; slide: number } {
  const r = synthesizeTake({ ...base, ...opts });
  const ms = measure(r.bvhText, r.truth);
  const e = [detectEvents(ms.heights[0], ms.frames), detectEvents(ms.heights[1], ms.frames)];
  return {
    left: median(swingKneePeaks(ms, 0, e[0]!.ic, e[0]!.to)),
    right: median(swingKneePeaks(ms, 1, e[1]!.ic, e[1]!.to)),
    slide: Math.max(maxStanceSlide(ms, 0, e[0]!.ic, e[0]!.to), maxStanceSlide(ms, 1, e[1]!.ic, e[1]!.to)),
  };
}

/** Returns the sagittal swing range (degrees) of each upper arm: angle of the elbow about the shoulder, forward vs back. */
function armRange(opts: Partial<SynthOptions>): { left: number; right: number } {
  const r = synthesizeTake({ ...base, ...opts });
  const take = parseBvh(r.bvhText);
  const plan = planFk(take);
  const J = take.joints.length;
  const pos = new Float64Array(J * 3), rot = new Float64Array(J * 9);
  const ids = (['l', 'r'] as const).map((p) => [r.truth.jointNames[`${p}_shoulder`], r.truth.jointNames[`${p}_elbow`]].map((n) => take.joints.findIndex((j) => j.name === n)));
  const pelvis = take.joints.findIndex((j) => j.parent < 0);
  const lo = [Infinity, Infinity], hi = [-Infinity, -Infinity];
  for (let f = 0; f < take.frameCount; f++) {
    poseFrame(plan, take.values, f, pos, rot, 0);
    // Forward = the pelvis frame's local Z (internal forward at rest), up = Y: straight walk, Y up.
    const fw = [rot[pelvis * 9 + 2]!, rot[pelvis * 9 + 5]!, rot[pelvis * 9 + 8]!];
    ids.forEach(([s, e], k) => {
      const v = [0, 1, 2].map((a) => pos[e! * 3 + a]! - pos[s! * 3 + a]!);
      const ang = Math.atan2(v[0]! * fw[0]! + v[2]! * fw[2]!, -v[1]!) * (180 / Math.PI);
      lo[k] = Math.min(lo[k]!, ang);
      hi[k] = Math.max(hi[k]!, ang);
    });
  }
  return { left: hi[0]! - lo[0]!, right: hi[1]! - lo[1]! };
}

describe('synth impairments', () => {
  it('lowers the right swing knee peak for a reduced right knee range, the left nearly unchanged', () => {
    const healthy = kneePeaks({});
    const stiff = kneePeaks({ impairments: { right: { kneeRange: 0.5 } } });
    // Half the range: the right peak falls by well over 10°; the left moves by under 3°.
    expect(healthy.right - stiff.right).toBeGreaterThan(10);
    expect(Math.abs(healthy.left - stiff.left)).toBeLessThan(3);
    expect(stiff.slide).toBeLessThanOrEqual(0.01);
  });

  it('with compensation hikes the hip and keeps the stiff knee stiff', () => {
    const r = synthesizeTake({ ...base, impairments: { right: { kneeRange: 0.4, compensate: true } } });
    expect(r.truth.sides.right.hipHikeDeg).toBeGreaterThan(0);
    expect(r.truth.sides.right.circumductionDeg).toBeGreaterThan(0);
    expect(r.truth.sides.left.hipHikeDeg).toBe(0);
    const k = kneePeaks({ impairments: { right: { kneeRange: 0.4, compensate: true } } });
    expect(k.right).toBeLessThan(k.left - 15);
    expect(k.slide).toBeLessThanOrEqual(0.01);
  });

  it('reduces arm swing on the intended side only', () => {
    const healthy = armRange({});
    const reduced = armRange({ impairments: { left: { armSwing: 0.3 } } });
    expect(reduced.left).toBeLessThan(0.5 * healthy.left);
    expect(Math.abs(reduced.right - healthy.right)).toBeLessThan(1);
  });

  it('shortens stance on the painful side and lengthens it on the other', () => {
    const r = synthesizeTake({ ...base, impairments: { left: { stanceShortening: 1 } } });
    const h = synthesizeTake(base);
    expect(r.truth.summary.stanceFraction.left).toBeLessThan(h.truth.summary.stanceFraction.left - 0.05);
    expect(r.truth.summary.stanceFraction.right).toBeGreaterThan(h.truth.summary.stanceFraction.right + 0.01);
  });

  it('gives healthy defaults small natural left/right differences, arm swing above all', () => {
    // Healthy gait is near-symmetric in the legs, less so in the arms (common practice).
    const k = kneePeaks({});
    expect(Math.abs(k.left - k.right)).toBeLessThan(4);
    // Across subjects, arm-swing amplitude differs between sides more (relatively) than knee range does.
    let arm = 0, knee = 0;
    for (let subject = 1; subject <= 8; subject++) {
      const a = synthesizeTake({ seed: subject, duration: 1 }).truth.sides;
      arm += Math.abs(a.left.armAmplitude - a.right.armAmplitude) / (a.left.armAmplitude + a.right.armAmplitude);
      knee += Math.abs(a.left.kneeScale - a.right.kneeScale) / (a.left.kneeScale + a.right.kneeScale);
    }
    expect(knee).toBeGreaterThan(0);
    expect(arm).toBeGreaterThan(3 * knee);
    const r = synthesizeTake(base);
    // Same subject seed, other trial seed: the same person's differences.
    const again = synthesizeTake({ ...base, seed: 77 });
    expect(again.truth.sides).toEqual(r.truth.sides);
  });
});
