// A programmatic take of smooth, seeded random motion on a humanoid-shaped tree, for reference tests
// and the benchmark when no synthesized walker is available.
import type { ChannelName, Joint, Take } from '../../src/bvh/take.js';
import { EULER_ORDERS, type EulerOrder } from '../../src/skeleton/euler.js';

export interface SmoothTakeOptions {
  seed: number;
  /** Length in seconds. */
  seconds: number;
  /** Frames per second. */
  rate: number;
  /** Rotation order of every joint, or 'mixed' for a seeded choice per joint among the six. */
  order?: EulerOrder | 'mixed';
  /** Peak joint rotation in degrees (default 60). */
  amplitude?: number;
}

/** Returns a seeded uniform generator on [0, 1) (mulberry32). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

// name, parent name, offset (cm, Y up). 22 joints with channels and 5 End Sites: 27 in all.
const LAYOUT: [string, string | null, [number, number, number]][] = [
  ['Hips', null, [0, 95, 0]],
  ['Spine', 'Hips', [0, 10, 0]],
  ['Spine1', 'Spine', [0, 12, 0]],
  ['Spine2', 'Spine1', [0, 12, 0]],
  ['Neck', 'Spine2', [0, 14, 0]],
  ['Head', 'Neck', [0, 10, 0]],
  ['Head_End', 'Head', [0, 18, 0]],
  ['LeftShoulder', 'Spine2', [4, 12, 0]],
  ['LeftArm', 'LeftShoulder', [14, 0, 0]],
  ['LeftForeArm', 'LeftArm', [28, 0, 0]],
  ['LeftHand', 'LeftForeArm', [25, 0, 0]],
  ['LeftHand_End', 'LeftHand', [9, 0, 0]],
  ['RightShoulder', 'Spine2', [-4, 12, 0]],
  ['RightArm', 'RightShoulder', [-14, 0, 0]],
  ['RightForeArm', 'RightArm', [-28, 0, 0]],
  ['RightHand', 'RightForeArm', [-25, 0, 0]],
  ['RightHand_End', 'RightHand', [-9, 0, 0]],
  ['LeftUpLeg', 'Hips', [9, -4, 0]],
  ['LeftLeg', 'LeftUpLeg', [0, -42, 0]],
  ['LeftFoot', 'LeftLeg', [0, -41, 0]],
  ['LeftToe', 'LeftFoot', [0, -7, 13]],
  ['LeftToe_End', 'LeftToe', [0, 0, 6]],
  ['RightUpLeg', 'Hips', [-9, -4, 0]],
  ['RightLeg', 'RightUpLeg', [0, -42, 0]],
  ['RightFoot', 'RightLeg', [0, -41, 0]],
  ['RightToe', 'RightFoot', [0, -7, 13]],
  ['RightToe_End', 'RightToe', [0, 0, 6]],
];

const HARMONICS = 3;

/**
 * Returns a take whose root walks forward at 130 cm/s with a little sway and whose every rotation
 * channel is a sum of three seeded sinusoids (0.3 to 2.5 Hz): smooth, bounded, and different per seed.
 */
export function smoothTake(options: SmoothTakeOptions): Take {
  const rand = seededRandom(options.seed);
  const amp = options.amplitude ?? 60;
  const joints: Joint[] = [];
  let channelCount = 0;
  for (const [name, parentName, offset] of LAYOUT) {
    const parent = parentName === null ? -1 : joints.findIndex((j) => j.name === parentName);
    const endSite = name.endsWith('_End');
    let channels: ChannelName[] = [];
    if (!endSite) {
      const order = options.order === 'mixed' ? EULER_ORDERS[Math.floor(rand() * 6)]! : (options.order ?? 'ZXY');
      const rot = [...order].map((a) => `${a}rotation` as ChannelName);
      channels = parent < 0 ? ['Xposition', 'Yposition', 'Zposition', ...rot] : rot;
    }
    joints.push({ name, parent, offset: [...offset], channels, channelStart: channelCount, endSite, line: joints.length + 2 });
    channelCount += channels.length;
  }
  const F = Math.max(1, Math.round(options.seconds * options.rate));
  const C = channelCount;
  // Per channel: HARMONICS (amplitude, angular frequency, phase) triples.
  const params = new Float64Array(C * HARMONICS * 3);
  for (let c = 0; c < C; c++)
    for (let h = 0; h < HARMONICS; h++) {
      const k = (c * HARMONICS + h) * 3;
      params[k] = (amp / HARMONICS) * (0.3 + 0.7 * rand());
      params[k + 1] = 2 * Math.PI * (0.3 + 2.2 * rand());
      params[k + 2] = 2 * Math.PI * rand();
    }
  const values = new Float64Array(F * C);
  const dt = 1 / options.rate;
  for (let f = 0; f < F; f++) {
    const t = f * dt;
    for (let c = 0; c < C; c++) {
      let v = 0;
      for (let h = 0; h < HARMONICS; h++) {
        const k = (c * HARMONICS + h) * 3;
        v += params[k]! * Math.sin(params[k + 1]! * t + params[k + 2]!);
      }
      values[f * C + c] = v;
    }
    // Root translation: forward along Z at 130 cm/s, hip height 95 cm with a 2 cm bob, 3 cm sway.
    values[f * C] = 3 * Math.sin(2 * Math.PI * 0.9 * t);
    values[f * C + 1] = 95 + 2 * Math.sin(2 * Math.PI * 1.8 * t);
    values[f * C + 2] = 130 * t;
  }
  return { joints, frameTime: dt, frameCount: F, channelCount: C, values, headerFrameCount: F, warnings: [] };
}
