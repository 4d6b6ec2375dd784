// The gait analysis against the walker's own truth on seeds not used while developing (7001+):
// cadence, stance share and step length within 3 % of truth, handbook ranges for normal walking, the
// symmetry index moving the documented way for one-sided impairments, and no numbers for no walking.
import { describe, expect, it } from 'vitest';
import { analyzeGait, gaitResultJson } from '../../src/gait/analyze.js';
import { prepareGait } from '../../src/gait/input.js';
import { InputError } from '../../src/errors/index.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake, type SynthOptions } from '../../src/synth/index.js';
import type { Take } from '../../src/bvh/take.js';

type Result = ReturnType<typeof gaitResultJson> & Record<string, any>;

function analyse(options: Partial<SynthOptions> & { seed: number }) {
  const { take, truth } = synthesizeTake({ duration: 24, frameRate: 120, ...options });
  const imported = resolveImported(`seed-${options.seed}.bvh`, take);
  const a = analyzeGait(imported);
  return { take, truth, a, json: gaitResultJson(a, { tool: 'jointloom', version: 'test', file: 'x' }) as Result, imported };
}

/** Truth step length: heel-to-heel distance along the walking axis at each truth initial contact, unfiltered. */
function truthStepLength(imported: ReturnType<typeof resolveImported>, truth: any, side: 'left' | 'right'): number {
  const input = prepareGait(imported, null);
  // The walker's forward axis (truth, file axes) turned into the canonical Z-up frame.
  const R = input.toCanonical, fa = truth.forwardAxis as number[];
  const forward = [R[0]! * fa[0]! + R[1]! * fa[1]! + R[2]! * fa[2]!, R[3]! * fa[0]! + R[4]! * fa[1]! + R[5]! * fa[2]!];
  const s = side === 'left' ? 0 : 1;
  const frames: number[] = truth.events[side].initialContactFrames;
  const vals = frames.slice(1, -1).map((f) => {
    const o = f * 6;
    const dx = input.heels[o + s * 3]! - input.heels[o + (1 - s) * 3]!;
    const dy = input.heels[o + s * 3 + 1]! - input.heels[o + (1 - s) * 3 + 1]!;
    return dx * forward[0]! + dy * forward[1]!;
  });
  return vals.reduce((a, b) => a + b, 0) / vals.length;
}

describe('gait figures against the walker truth (straight walking, 120 Hz)', () => {
  for (const seed of [7001, 7002, 7003]) {
    it(`seed ${seed}: cadence, stance % and step length within 3 %; normal-walking handbook ranges`, () => {
      const { truth, json, imported } = analyse({ seed });
      const t = truth as any;
      const within3 = (measured: number, expected: number) => expect(Math.abs(measured / expected - 1)).toBeLessThan(0.03);
      within3(json.cadence_steps_per_min as number, t.summary.cadenceStepsPerMin);
      for (const side of ['left', 'right'] as const) {
        within3(json.stance_pct[side], 100 * t.summary.stanceFraction[side]);
        within3(json.step_length_m[side], truthStepLength(imported, t, side));
        // Handbook ranges for normal adult walking (common practice; e.g. Perry and Burnfield, "Gait
        // Analysis", recalled from memory): stance 58-64 % of the cycle, peak swing knee flexion 55-65°.
        expect(json.stance_pct[side]).toBeGreaterThan(58);
        expect(json.stance_pct[side]).toBeLessThan(64);
        expect(json.knee_flexion_peak_swing_deg[side]).toBeGreaterThan(55);
        expect(json.knee_flexion_peak_swing_deg[side]).toBeLessThan(65);
        expect(json.strides[side]).toBeGreaterThanOrEqual(10);
      }
      // Cadence 100-120 steps/min and speed 1.1-1.5 m/s for adults at a self-selected pace (common practice).
      expect(json.cadence_steps_per_min).toBeGreaterThan(100);
      expect(json.cadence_steps_per_min).toBeLessThan(120);
      expect(json.speed_m_per_s).toBeGreaterThan(1.1);
      expect(json.speed_m_per_s).toBeLessThan(1.5);
      expect(Math.abs(json.speed_m_per_s / t.summary.meanSpeed - 1)).toBeLessThan(0.03);
    });
  }
});

describe('one-sided impairments move the symmetry index the documented way and name the side', () => {
  // Documented sign: SI = (R - L) / (0.5 (R + L)) x 100 (Robinson et al. 1987), positive when right is larger.
  it('reduced right knee range: knee range and peak swing SI negative, right named as the smaller side', () => {
    const { json } = analyse({ seed: 7011, impairments: { right: { kneeRange: 0.6 } } });
    expect(json.symmetry.knee_flexion_rom_deg.symmetry_index_pct).toBeLessThan(-10);
    expect(json.symmetry.knee_flexion_peak_swing_deg.symmetry_index_pct).toBeLessThan(-10);
    const knee = json.asymmetry_flags.find((f: any) => f.measure === 'knee_flexion_rom_deg');
    expect(knee.smaller_side).toBe('right');
  });

  it('reduced left knee range: the sign flips and left is named', () => {
    const { json } = analyse({ seed: 7012, impairments: { left: { kneeRange: 0.6 } } });
    expect(json.symmetry.knee_flexion_rom_deg.symmetry_index_pct).toBeGreaterThan(10);
    expect(json.asymmetry_flags.find((f: any) => f.measure === 'knee_flexion_rom_deg').smaller_side).toBe('left');
  });

  it('shortened left stance: stance SI positive (left smaller), left named', () => {
    const { json } = analyse({ seed: 7013, impairments: { left: { stanceShortening: 0.5 } } });
    expect(json.symmetry.stance_pct.symmetry_index_pct).toBeGreaterThan(0);
    expect(json.stance_pct.left).toBeLessThan(json.stance_pct.right);
    const first = json.asymmetry_flags.find((f: any) => f.measure === 'stance_pct');
    if (first) expect(first.smaller_side).toBe('left');
  });

  it('shortened right stance: stance SI negative (right smaller)', () => {
    const { json } = analyse({ seed: 7014, impairments: { right: { stanceShortening: 0.5 } } });
    expect(json.symmetry.stance_pct.symmetry_index_pct).toBeLessThan(0);
  });

  it('a healthy take flags no knee asymmetry', () => {
    const { json } = analyse({ seed: 7015 });
    expect(Math.abs(json.symmetry.knee_flexion_rom_deg.symmetry_index_pct)).toBeLessThan(10);
  });
});

describe('no walking, no numbers', () => {
  /** Returns a take holding frame `f` of `take` still for `n` frames (standing, or a held crouch). */
  function still(take: Take, f: number, n: number): Take {
    const C = take.channelCount;
    const values = new Float64Array(n * C);
    for (let k = 0; k < n; k++) values.set(take.values.subarray(f * C, f * C + C), k * C);
    return { ...take, values, frameCount: n, headerFrameCount: n, warnings: [] };
  }
  it('a standing take raises one InputError naming the file', () => {
    const { take } = synthesizeTake({ seed: 7021, duration: 4 });
    const imported = resolveImported('standing.bvh', still(take, 200, 600));
    expect(() => analyzeGait(imported)).toThrow(InputError);
    expect(() => analyzeGait(imported)).toThrow(/^standing\.bvh: no walking found/);
  });
  it('crouching up and down on the spot raises the same InputError', () => {
    const { take } = synthesizeTake({ seed: 7022, duration: 4 });
    const held = still(take, 200, 900);
    // The root's vertical position channel (Y up in the walker's default take) goes down and up by
    // 30 cm every 2 s: knee bends without travel, which is not walking.
    const root = held.joints[0]!;
    const y = root.channelStart + root.channels.indexOf('Yposition');
    const fps = 1 / held.frameTime;
    for (let f = 0; f < held.frameCount; f++) held.values[f * held.channelCount + y] -= 15 * (1 - Math.cos((2 * Math.PI * f) / (2 * fps)));
    expect(() => analyzeGait(resolveImported('crouch.bvh', held))).toThrow(/^crouch\.bvh: no walking found/);
  });
});
