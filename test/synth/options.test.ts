// Options of the walker: determinism, units, up axis, naming, channel orders, paths, stumbles, noise, flags.
import { describe, expect, it } from 'vitest';
import { UsageError } from '../../src/errors/index.js';
import { parseBvh } from '../../src/bvh/parse.js';
import { restPose } from '../../src/skeleton/fk.js';
import { JOINT_KEYS, jointName, synthesizeTake, synthOptionsFromFlags } from '../../src/synth/index.js';
import { detectEvents, maxStanceSlide, measure } from './support.js';

const short = { duration: 8, frameRate: 100 };

describe('synth determinism', () => {
  it('gives the same bytes for the same seed and options, different bytes for another seed', () => {
    const a = synthesizeTake({ seed: 5, ...short });
    const b = synthesizeTake({ seed: 5, ...short });
    const c = synthesizeTake({ seed: 6, ...short });
    expect(a.bvhText).toBe(b.bvhText);
    expect(JSON.stringify(a.truth)).toBe(JSON.stringify(b.truth));
    expect(c.bvhText).not.toBe(a.bvhText);
  });

  it('returns the take as its text reads back', () => {
    const r = synthesizeTake({ seed: 8, ...short, units: 'mm', rotationOrder: 'mixed' });
    const p = parseBvh(r.bvhText);
    expect(Array.from(r.take.values)).toEqual(Array.from(p.values));
    expect(r.take.frameCount).toBe(800);
    expect(r.take.frameTime).toBeCloseTo(0.01, 12);
  });
});

/** Returns hip-to-ankle length of the left leg in the rest pose, in file units. */
function restLegLength(text: string, hip: string, ankle: string): number {
  const take = parseBvh(text);
  const rest = restPose(take);
  const h = take.joints.findIndex((j) => j.name === hip), a = take.joints.findIndex((j) => j.name === ankle);
  return Math.hypot(rest[h * 3]! - rest[a * 3]!, rest[h * 3 + 1]! - rest[a * 3 + 1]!, rest[h * 3 + 2]! - rest[a * 3 + 2]!);
}

describe('synth units and up axis', () => {
  it('scales lengths by the unit: metres = cm / 100 = mm / 1000 = in × 0.0254', () => {
    const len = (units: 'm' | 'cm' | 'mm' | 'in') => restLegLength(synthesizeTake({ seed: 3, duration: 2, units }).bvhText, 'LeftHip', 'LeftAnkle');
    const m = len('m');
    // Drillis and Contini via Winter 2009 (recalled from memory): thigh 0.245 H + shank 0.246 H = 0.491 × 1.75 m.
    expect(m).toBeCloseTo(0.491 * 1.75, 6);
    expect(len('cm') / 100).toBeCloseTo(m, 6);
    expect(len('mm') / 1000).toBeCloseTo(m, 6);
    expect(len('in') * 0.0254).toBeCloseTo(m, 6);
  });

  it('puts gravity along Z in a Z-up take: feet low and head high on Z, root height on the Z channel', () => {
    const r = synthesizeTake({ seed: 3, duration: 4, upAxis: 'Z', units: 'm' });
    const take = parseBvh(r.bvhText);
    const rest = restPose(take);
    const head = take.joints.findIndex((j) => j.name === 'Head'), toe = take.joints.findIndex((j) => j.name === 'LeftToe');
    expect(rest[head * 3 + 2]! - rest[toe * 3 + 2]!).toBeGreaterThan(1.2);
    expect(Math.abs(rest[head * 3 + 1]! - rest[toe * 3 + 1]!)).toBeLessThan(0.2);
    const C = take.channelCount;
    let zMin = Infinity;
    for (let f = 0; f < take.frameCount; f++) zMin = Math.min(zMin, take.values[f * C + 2]!);
    expect(zMin).toBeGreaterThan(0.8); // the root never drops below 0.8 m along Z
    const ms = measure(r.bvhText, r.truth);
    let low = Infinity;
    for (const h of ms.heights) for (let n = 0; n < h.length; n++) low = Math.min(low, h[n]!);
    expect(low).toBeGreaterThan(-0.01);
    expect(r.truth.upAxis).toBe('Z');
  });
});

describe('synth naming and channels', () => {
  it('spells the documented names in every style', () => {
    // The documented spellings (src/synth/naming.ts): LeftKnee, l_knee, knee.L, loom:Knee_Lt, L_KNEE.
    const expected = { camel: 'LeftKnee', snake: 'l_knee', dotted: 'knee.L', prefixed: 'loom:Knee_Lt', caps: 'L_KNEE' } as const;
    for (const [style, name] of Object.entries(expected)) {
      const r = synthesizeTake({ seed: 1, duration: 1, naming: style as keyof typeof expected });
      expect(r.bvhText).toContain(`JOINT ${name}\n`);
      expect(r.truth.jointNames.l_knee).toBe(name);
      const names = r.take.joints.filter((j) => !j.endSite).map((j) => j.name);
      expect(names).toEqual(JOINT_KEYS.map((k) => jointName(k, style as keyof typeof expected)));
      expect(new Set(names).size).toBe(21);
    }
  });

  it('writes the asked channel order, mixed orders, and positions on all joints', () => {
    const zyx = synthesizeTake({ seed: 1, duration: 1, rotationOrder: 'ZYX' });
    expect(zyx.bvhText).toContain('CHANNELS 6 Xposition Yposition Zposition Zrotation Yrotation Xrotation');
    expect(zyx.bvhText).toContain('CHANNELS 3 Zrotation Yrotation Xrotation');
    const mixed = synthesizeTake({ seed: 1, duration: 1, rotationOrder: 'mixed', jointOrders: { l_knee: 'XZY' } });
    const orders = new Set(Object.values(mixed.truth.channelOrder));
    expect(orders.size).toBeGreaterThanOrEqual(4);
    expect(mixed.truth.channelOrder.LeftKnee).toBe('XZY');
    const all = synthesizeTake({ seed: 1, duration: 1, positionsOnAllJoints: true });
    const take = parseBvh(all.bvhText);
    expect(take.joints.filter((j) => !j.endSite).every((j) => j.channels.length === 6)).toBe(true);
  });

  it('moves the same way whatever the channel order (FK positions agree)', () => {
    const a = measure(synthesizeTake({ seed: 2, ...short }).bvhText, synthesizeTake({ seed: 2, ...short }).truth);
    const rb = synthesizeTake({ seed: 2, ...short, rotationOrder: 'YXZ' });
    const b = measure(rb.bvhText, rb.truth);
    let worst = 0;
    for (let n = 0; n < a.heights[0].length; n++) worst = Math.max(worst, Math.abs(a.heights[0][n]! - b.heights[0][n]!));
    expect(worst).toBeLessThan(0.001); // values rounded to 0.01°: sub-millimetre agreement
  });
});

describe('synth paths, stumbles and noise', () => {
  it('turns 180° on a walkway and keeps the feet planted through the turns', () => {
    const r = synthesizeTake({ seed: 4, duration: 25, path: { kind: 'walkway', length: 6, radius: 1 } });
    const ms = measure(r.bvhText, r.truth);
    // Heading from root travel over the first and the second straight.
    const dir = (f0: number, f1: number) => Math.atan2(ms.root[f1 * 2]! - ms.root[f0 * 2]!, ms.root[f1 * 2 + 1]! - ms.root[f0 * 2 + 1]!);
    const first = dir(0, 300);
    const fps = 1 / ms.dt;
    // 6 m straight + π m turn at ~1.2 m/s: the way back runs ~9-13 s in.
    const back = dir(Math.round(9.5 * fps), Math.round(12.5 * fps));
    let turn = Math.abs(back - first);
    if (turn > Math.PI) turn = 2 * Math.PI - turn;
    expect(turn * (180 / Math.PI)).toBeGreaterThan(160);
    for (const s of [0, 1] as const) {
      const e = detectEvents(ms.heights[s], ms.frames);
      expect(maxStanceSlide(ms, s, e.ic, e.to)).toBeLessThanOrEqual(0.01);
    }
  });

  it('changes heading on a circle at the rate of its curvature', () => {
    const r = synthesizeTake({ seed: 4, duration: 10, path: { kind: 'circle', radius: 3, turn: 'right' } });
    const ms = measure(r.bvhText, r.truth);
    const F = ms.frames;
    // Arc length s on radius R turns the heading by s / R (hand-computed geometry); root path length ~ s.
    let len = 0;
    for (let f = 1; f < F; f++) len += Math.hypot(ms.root[f * 2]! - ms.root[f * 2 - 2]!, ms.root[f * 2 + 1]! - ms.root[f * 2 - 1]!);
    const chord = Math.hypot(ms.root[(F - 1) * 2]! - ms.root[0]!, ms.root[(F - 1) * 2 + 1]! - ms.root[1]!);
    const angle = len / 3;
    expect(chord).toBeCloseTo(2 * 3 * Math.sin(angle / 2), 0);
  });

  it('records a stumble at the asked time on the asked side', () => {
    const r = synthesizeTake({ seed: 9, duration: 12, stumbles: [{ time: 6, side: 'right' }] });
    expect(r.truth.stumbles).toHaveLength(1);
    const s = r.truth.stumbles[0]!;
    expect(s.side).toBe('right');
    expect(s.swingEndTime).toBeGreaterThan(6);
    expect(s.swingStartTime).toBeLessThan(s.swingEndTime);
    expect(r.truth.events.right.toeOffFrames).toContain(s.swingStartFrame);
    expect(r.truth.events.right.initialContactFrames).toContain(s.swingEndFrame);
    // The perturbed swing brings the toe within a few millimetres of the floor.
    const ms = measure(r.bvhText, r.truth);
    let lowest = Infinity;
    for (let f = s.swingStartFrame + 5; f < s.swingEndFrame - 5; f++) lowest = Math.min(lowest, ms.heights[1][f * 3 + 2]!);
    expect(lowest).toBeLessThan(0.004);
  });

  it('adds sensor jitter without moving the truth events', () => {
    const clean = synthesizeTake({ seed: 12, ...short });
    const noisy = synthesizeTake({ seed: 12, ...short, noise: { rotationDeg: 0.5, positionMm: 2 } });
    expect(noisy.truth.events).toEqual(clean.truth.events);
    let sum = 0, n = 0;
    const C = clean.take.channelCount;
    for (let f = 0; f < clean.take.frameCount; f++)
      for (let c = 3; c < C; c++) { const d = noisy.take.values[f * C + c]! - clean.take.values[f * C + c]!; sum += d * d; n++; }
    // Added Gaussian noise of SD 0.5°: the RMS difference is ~0.5° (0.01° rounding is negligible).
    expect(Math.sqrt(sum / n)).toBeGreaterThan(0.45);
    expect(Math.sqrt(sum / n)).toBeLessThan(0.55);
  });
});

describe('synth option checks and flags', () => {
  it('rejects bad values with a UsageError naming the option', () => {
    expect(() => synthesizeTake({ seed: 1, frameRate: -5 })).toThrow(UsageError);
    expect(() => synthesizeTake({ seed: 1, frameRate: -5 })).toThrow(/frameRate/);
    expect(() => synthesizeTake({ seed: 1.5 })).toThrow(/seed/);
    expect(() => synthesizeTake({ seed: 1, units: 'ft' as 'm' })).toThrow(/units/);
  });

  it('maps command-line flags to options', () => {
    const o = synthOptionsFromFlags({
      seed: '7', fps: '100', units: 'mm', up: 'z', order: 'mixed', naming: 'snake', path: 'walkway', length: '8', radius: '1.2',
      'impair-right': 'knee=0.5,compensate', stumble: '12.5:left,20:right:0.5', 'noise-deg': '0.3',
    });
    expect(o).toMatchObject({
      seed: 7, frameRate: 100, units: 'mm', upAxis: 'Z', rotationOrder: 'mixed', naming: 'snake',
      path: { kind: 'walkway', length: 8, radius: 1.2 },
      impairments: { right: { kneeRange: 0.5, compensate: true } },
      stumbles: [{ time: 12.5, side: 'left' }, { time: 20, side: 'right', severity: 0.5 }],
      noise: { rotationDeg: 0.3, positionMm: 0 },
    });
    expect(() => synthOptionsFromFlags({})).toThrow(UsageError);
    expect(() => synthOptionsFromFlags({ seed: 'x' })).toThrow(/--seed/);
    expect(() => synthOptionsFromFlags({ seed: '1', 'impair-left': 'elbow=3' })).toThrow(/impair-left/);
  });
});
