// Random but valid takes for round-trip and fuzz tests: random trees, channel sets and orders, values.
import type { ChannelName, Joint, Take } from '../../src/bvh/take.js';
import { CHANNEL_NAMES } from '../../src/bvh/take.js';
import type { Prng } from './prng.js';

export interface RandomTakeOptions {
  /** Most joints before End Sites are added (at least 1). */
  maxJoints?: number;
  /** Most frames (at least 1). */
  maxFrames?: number;
  /** Whether values and offsets may be -0. */
  negativeZero?: boolean;
  /** Most ROOTs. */
  maxRoots?: number;
  /** Kinds of values drawn: "any" mixes all, "angles" keeps to plain degrees and centimetres. */
  values?: 'any' | 'angles';
}

const NAME_CHARS = 'abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_:.-|';

/** Returns a random joint name: letters, digits and `_ : . - |`, sometimes with inner spaces. */
export function randomName(rng: Prng): string {
  const words = rng.int(1, rng.chance(0.2) ? 3 : 1);
  const parts: string[] = [];
  for (let w = 0; w < words; w++) {
    let s = '';
    const n = rng.int(1, 12);
    for (let k = 0; k < n; k++) s += NAME_CHARS[rng.int(0, NAME_CHARS.length - 1)];
    parts.push(s);
  }
  return parts.join(rng.chance(0.5) ? ' ' : '  ');
}

/** Returns a random finite double of a mixed kind: plain, many-digit, tiny, huge, subnormal, integer, zero. */
export function randomValue(rng: Prng, negativeZero: boolean, kind: 'any' | 'angles' = 'any'): number {
  const sign = rng.chance(0.5) ? -1 : 1;
  if (kind === 'angles') {
    const r = rng.next();
    if (r < 0.05) return negativeZero && rng.chance(0.5) ? -0 : 0;
    if (r < 0.5) return sign * Math.round(rng.next() * 18000) / 100;
    return sign * rng.next() * 180;
  }
  switch (rng.int(0, 11)) {
    case 0:
      return negativeZero && rng.chance(0.5) ? -0 : 0;
    case 1:
      return sign * rng.next() * 360; // 15-17 significant digits
    case 2:
      return sign * Math.round(rng.next() * 1e6) / 1e3; // few decimals
    case 3:
      return sign * rng.next() * 10 ** rng.int(-320, -300); // tiny, some subnormal
    case 4:
      return sign * rng.next() * 10 ** rng.int(290, 307); // huge
    case 5:
      return sign * Number.MIN_VALUE * rng.int(1, 1000); // subnormal
    case 6:
      return sign * Number.MAX_VALUE * (1 - rng.next() * 1e-3);
    case 7:
      return sign * rng.int(0, 2 ** 31); // integers
    case 8:
      return sign * (rng.int(1, 2 ** 26) * 2 ** 27 + rng.int(0, 2 ** 27 - 1)) * 2 ** rng.int(-80, 80); // full 53-bit mantissa
    case 9:
      return sign * 10 ** rng.int(-22, 22); // exact fast-path edge
    case 10:
      return negativeZero && rng.chance(0.3) ? -0 : sign * rng.next() * 1e-5;
    default:
      return sign * (rng.int(0, 999) + rng.int(0, 999_999_999) / 1e9);
  }
}

/** Returns a random distinct subset of the six channels in random order (0 to 6 of them). */
export function randomChannels(rng: Prng): ChannelName[] {
  const r = rng.next();
  if (r < 0.15) return [];
  if (r < 0.5) {
    // The common 3-rotation layouts in one of the six orders.
    return rng.shuffle(['Xrotation', 'Yrotation', 'Zrotation'] as ChannelName[]);
  }
  if (r < 0.7) {
    return [...rng.shuffle(['Xposition', 'Yposition', 'Zposition'] as ChannelName[]), ...rng.shuffle(['Xrotation', 'Yrotation', 'Zrotation'] as ChannelName[])];
  }
  return rng.shuffle([...CHANNEL_NAMES]).slice(0, rng.int(1, 6));
}

/** Returns a random valid take: DFS joint order, unique names, End Sites named `<parent>_End`, at least one channel. */
export function randomTake(rng: Prng, options: RandomTakeOptions = {}): Take {
  const maxJoints = Math.max(1, options.maxJoints ?? 12);
  const maxFrames = Math.max(1, options.maxFrames ?? 6);
  const negZero = options.negativeZero ?? false;
  const kind = options.values ?? 'any';
  const target = rng.int(1, maxJoints);
  const rootCount = Math.min(target, rng.int(1, Math.max(1, options.maxRoots ?? 1)));
  const joints: Joint[] = [];
  const names = new Set<string>();
  let channelCount = 0;
  const uniqueName = () => {
    for (;;) {
      const n = randomName(rng);
      if (!names.has(n) && !names.has(n.replace(/_End$/, ''))) {
        names.add(n);
        names.add(`${n}_End`);
        return n;
      }
    }
  };
  const offset = (): [number, number, number] => [randomValue(rng, negZero, kind), randomValue(rng, negZero, kind), randomValue(rng, negZero, kind)];
  const grow = (parent: number, budget: number) => {
    const index = joints.length;
    const channels = randomChannels(rng);
    joints.push({ name: uniqueName(), parent, offset: offset(), channels, channelStart: channelCount, endSite: false, line: 0 });
    channelCount += channels.length;
    let left = budget - 1;
    while (left > 0 && rng.chance(0.7)) {
      const share = rng.int(1, left);
      grow(index, share);
      left -= share;
    }
    const isLeaf = joints.length === index + 1;
    if (isLeaf && rng.chance(0.7)) {
      joints.push({ name: `${joints[index]!.name}_End`, parent: index, offset: offset(), channels: [], channelStart: channelCount, endSite: true, line: 0 });
    }
    return budget - left;
  };
  let left = target;
  for (let r = 0; r < rootCount; r++) {
    const share = r === rootCount - 1 ? left : rng.int(1, left - (rootCount - 1 - r));
    grow(-1, share);
    left -= share;
  }
  if (channelCount === 0) {
    // A take with no channels has empty frame lines; give the first root three rotations.
    joints[0]!.channels = ['Zrotation', 'Xrotation', 'Yrotation'];
    for (let j = 1; j < joints.length; j++) joints[j]!.channelStart += 3;
    channelCount = 3;
  }
  const frameCount = rng.int(1, maxFrames);
  const values = new Float64Array(frameCount * channelCount);
  for (let i = 0; i < values.length; i++) values[i] = randomValue(rng, negZero, kind);
  const frameTime = rng.pick([1 / 120, 1 / 30, 0.008342, 0.0166667, 1e-6 + rng.next() * 0.5, 60]);
  return { joints, frameTime, frameCount, channelCount, values, headerFrameCount: frameCount, warnings: [] };
}
