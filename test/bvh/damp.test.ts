// The after-the-fact range edit: one joint's rotation channels pulled toward their mean, nothing else
// touched. Expected values are hand-computed from the three-frame take below.
import { describe, expect, it } from 'vitest';
import { dampJointRotations } from '../../src/bvh/damp.js';
import { parseBvh } from '../../src/bvh/parse.js';

const TEXT = `HIERARCHY
ROOT Hips
{
  OFFSET 0 0 0
  CHANNELS 6 Xposition Yposition Zposition Zrotation Xrotation Yrotation
  JOINT Knee
  {
    OFFSET 0 -40 0
    CHANNELS 3 Zrotation Xrotation Yrotation
    End Site
    {
      OFFSET 0 -40 0
    }
  }
}
MOTION
Frames: 3
Frame Time: 0.01
1 90 2 0 10 0 0 0 0
2 91 3 0 20 0 30 60 -6
3 92 4 0 30 0 60 0 6
`;

describe('dampJointRotations', () => {
  const take = parseBvh(TEXT);
  const knee = take.joints.findIndex((j) => j.name === 'Knee');

  it('scales each rotation channel of the joint toward its mean (hand-computed: Z mean 30, X mean 20, Y mean 0)', () => {
    const d = dampJointRotations(take, knee, 0.5);
    const C = take.channelCount;
    const kneeValues = (f: number) => Array.from(d.values.subarray(f * C + 6, f * C + 9));
    expect(kneeValues(0)).toEqual([15, 10, 0]); // 30 + 0.5·(0 − 30), 20 + 0.5·(0 − 20), 0
    expect(kneeValues(1)).toEqual([30, 40, -3]);
    expect(kneeValues(2)).toEqual([45, 10, 3]);
  });

  it('leaves every other channel, the source take and the hierarchy as they were', () => {
    const before = Float64Array.from(take.values);
    const d = dampJointRotations(take, knee, 0.2);
    const C = take.channelCount;
    for (let f = 0; f < 3; f++) for (let c = 0; c < 6; c++) expect(d.values[f * C + c]).toBe(take.values[f * C + c]);
    expect(take.values).toEqual(before);
    expect(d.joints.map((j) => j.name)).toEqual(take.joints.map((j) => j.name));
  });

  it('keep 1 is the identity and keep 0 holds the joint at its mean', () => {
    expect(dampJointRotations(take, knee, 1).values).toEqual(take.values);
    const z = dampJointRotations(take, knee, 0), C = take.channelCount;
    for (let f = 0; f < 3; f++) expect(Array.from(z.values.subarray(f * C + 6, f * C + 9))).toEqual([30, 20, 0]);
  });

  it('refuses a joint outside the take and a factor outside 0..1', () => {
    expect(() => dampJointRotations(take, 99, 0.5)).toThrow(/joint 99/);
    expect(() => dampJointRotations(take, knee, 1.5)).toThrow(/0\.\.1/);
  });
});
