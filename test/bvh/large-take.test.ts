// A 10-minute 120 Hz take with 25 joints, written by writeBvh (4 decimals), read back through the
// chunked file reader and in memory. Structure and values only: speed is measured in the bench.
import { readFileSync, statSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { parseBvh, readBvhFile } from '../../src/bvh/parse.js';
import { writeBvh } from '../../src/bvh/write.js';
import type { ChannelName, Joint, Take } from '../../src/bvh/take.js';
import { expectSameTake, tempDir } from './support.js';

const RATE = 120;
const SECONDS = 600;
const FRAMES = RATE * SECONDS; // 72,000
const ROT: ChannelName[] = ['Zrotation', 'Xrotation', 'Yrotation'];

/** Returns a 25-joint biped (plus End Sites) in depth-first order, sizes in centimetres. */
function biped(): Joint[] {
  const joints: Joint[] = [];
  let cs = 0;
  const add = (name: string, parent: number, offset: [number, number, number], channels: ChannelName[]) => {
    joints.push({ name, parent, offset, channels, channelStart: cs, endSite: false, line: 0 });
    cs += channels.length;
    return joints.length - 1;
  };
  const end = (parent: number, offset: [number, number, number]) => {
    joints.push({ name: `${joints[parent]!.name}_End`, parent, offset, channels: [], channelStart: cs, endSite: true, line: 0 });
  };
  const chain = (names: string[], parent: number, step: (k: number) => [number, number, number]) => {
    let p = parent;
    names.forEach((n, k) => (p = add(n, p, step(k), ROT)));
    return p;
  };
  const hips = add('Hips', -1, [0, 95, 0], ['Xposition', 'Yposition', 'Zposition', ...ROT]);
  const spine2 = chain(['Spine', 'Spine1', 'Spine2'], hips, () => [0, 12, 0]);
  end(chain(['Neck', 'Neck1', 'Head'], spine2, () => [0, 6, 0]), [0, 18, 0]);
  for (const [side, sx] of [['Left', 1], ['Right', -1]] as const) {
    const hand = chain([`${side}Shoulder`, `${side}Arm`, `${side}ForeArm`, `${side}Hand`], spine2, (k) => [sx * (k === 0 ? 4 : 26), k === 0 ? 8 : 0, 0]);
    end(chain([`${side}Thumb`], hand, () => [sx * 3, 0, 3]), [sx * 3, 0, 0]);
  }
  for (const [side, sx] of [['Left', 1], ['Right', -1]] as const) {
    end(chain([`${side}UpLeg`, `${side}Leg`, `${side}Foot`, `${side}Toe`], hips, (k) => (k === 0 ? [sx * 9, 0, 0] : k === 3 ? [0, -6, 12] : [0, -42, 0])), [0, 0, 5]);
  }
  return joints;
}

const tmp = tempDir();
afterAll(() => tmp.cleanup());

describe('a 10-minute 120 Hz take', () => {
  it('written with 4 decimals, reads back through readBvhFile with its structure and values', () => {
    const joints = biped();
    const real = joints.filter((j) => !j.endSite);
    expect(real.length).toBe(25);
    const C = real.reduce((n, j) => n + j.channels.length, 0);
    expect(C).toBe(6 + 24 * 3);
    const values = new Float64Array(FRAMES * C);
    // Smooth sinusoids: a walk at about 1 stride per second, each channel its own amplitude and phase.
    for (let f = 0; f < FRAMES; f++) {
      const t = f / RATE;
      for (let c = 0; c < C; c++) {
        const amp = c < 3 ? [4, 2, 6][c]! : 5 + (c % 7) * 5;
        const base = c === 1 ? 95 : c === 2 ? 130 * t : 0; // forward travel at 1.3 m/s
        values[f * C + c] = base + amp * Math.sin(2 * Math.PI * (0.9 + 0.01 * c) * t + c);
      }
    }
    const take: Take = { joints, frameTime: 1 / RATE, frameCount: FRAMES, channelCount: C, values, headerFrameCount: FRAMES, warnings: [] };
    const path = tmp.file('ten-minutes.bvh', writeBvh(take, { decimals: 4 }));
    expect(statSync(path).size).toBeGreaterThan(30 * 2 ** 20);

    const t = readBvhFile(path, { file: 'ten-minutes.bvh' });
    expect(t.joints.map((j) => j.name)).toEqual(joints.map((j) => j.name));
    expect(t.joints.map((j) => j.parent)).toEqual(joints.map((j) => j.parent));
    expect(t.joints.map((j) => j.channels)).toEqual(joints.map((j) => j.channels));
    expect(t.joints.map((j) => j.offset)).toEqual(joints.map((j) => j.offset));
    expect(t.joints.filter((j) => j.endSite).map((j) => j.name)).toEqual(['Head_End', 'LeftThumb_End', 'RightThumb_End', 'LeftToe_End', 'RightToe_End']);
    expect(t.frameCount).toBe(FRAMES);
    expect(t.headerFrameCount).toBe(FRAMES);
    expect(t.channelCount).toBe(C);
    expect(t.values.length).toBe(FRAMES * C);
    expect(t.frameTime).toBe(1 / RATE);
    expect(t.warnings).toEqual([]);
    // Values are the 4-decimal text the writer produced: Number(v.toFixed(4)) (ECMAScript toFixed),
    // with -0.0000 written as 0.0000; checked on every 997th value and the whole last frame.
    const same = (i: number) => t.values[i] === Number(values[i]!.toFixed(4));
    let bad = -1;
    for (let i = 0; i < values.length && bad < 0; i += 997) if (!same(i)) bad = i;
    for (let i = (FRAMES - 1) * C; i < FRAMES * C && bad < 0; i++) if (!same(i)) bad = i;
    expect(bad).toBe(-1);
    // The last frame's forward travel: 130 cm/s over 599.99 s, give or take the 6 cm sway.
    expect(Math.abs(t.values[(FRAMES - 1) * C + 2]! - 130 * ((FRAMES - 1) / RATE))).toBeLessThanOrEqual(6.0001);

    // In memory the same bytes give the same take, bit for bit.
    expectSameTake(parseBvh(readFileSync(path), { file: 'ten-minutes.bvh' }), t, true);
  });
});
