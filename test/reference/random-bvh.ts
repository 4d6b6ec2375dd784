// Seeded random BVH texts with varied trees, channel subsets and orders, and number spellings, written
// directly as text (not through jointloom's writer) for differential tests against three.js.
import { seededRandom } from './smooth-take.js';

export interface RandomBvh {
  text: string;
  joints: number;
  frames: number;
}

const AXES = ['X', 'Y', 'Z'];

/** Returns a random BVH text: 1 root, 2 to 14 joints, End Sites, 1 to 8 frames, one formatting style. */
export function randomBvh(seed: number): RandomBvh {
  const rand = seededRandom(seed);
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)]!;
  const eol = rand() < 0.3 ? '\r\n' : '\n';
  const ind = pick(['\t', '  ', '    ']);
  // Spellings BVHLoader's parseFloat and jointloom's scanner both read as the same value.
  const num = (v: number): string => {
    const r = rand();
    if (r < 0.1) return v.toExponential(6);
    if (r < 0.15) return v.toExponential(3).toUpperCase();
    if (r < 0.2 && Math.abs(v) < 1e-3) return '-0';
    if (r < 0.3) return String(v);
    return v.toFixed(pick([2, 4, 6]));
  };
  const lines: string[] = ['HIERARCHY'];
  const channelsPerJoint: string[][] = [];
  let count = 0;
  const target = 2 + Math.floor(rand() * 13);
  const emit = (depth: number, isRoot: boolean): void => {
    const pad = ind.repeat(depth);
    const name = `${pick(['j', 'rig:j', 'Bone.', 'x_'])}${count}`;
    count++;
    lines.push(`${pad}${isRoot ? 'ROOT' : 'JOINT'} ${name}`, `${pad}{`);
    const off = isRoot ? [rand() * 10 - 5, 80 + rand() * 20, rand() * 10 - 5] : [rand() * 30 - 15, rand() * 30 - 15, rand() * 30 - 15];
    lines.push(`${pad}${ind}OFFSET ${off.map((v) => num(v)).join(' ')}`);
    // Rotations: a random subset in random order; positions: all, some or none, before or after.
    const rot = AXES.filter(() => rand() < 0.85).map((a) => `${a}rotation`);
    for (let i = rot.length - 1; i > 0; i--) {
      const k = Math.floor(rand() * (i + 1));
      [rot[i], rot[k]] = [rot[k]!, rot[i]!];
    }
    const posP = isRoot ? 0.9 : 0.25;
    const pos = rand() < posP ? AXES.filter(() => rand() < 0.8).map((a) => `${a}position`) : [];
    const ch = rand() < 0.8 ? [...pos, ...rot] : [...rot, ...pos];
    channelsPerJoint.push(ch);
    lines.push(`${pad}${ind}CHANNELS ${ch.length}${ch.length ? ' ' + ch.join(' ') : ''}`);
    const kids = depth > 5 ? 0 : Math.floor(rand() * 3);
    for (let k = 0; k < kids && count < target; k++) emit(depth + 1, false);
    if (rand() < 0.7) {
      lines.push(`${pad}${ind}End Site`, `${pad}${ind}{`, `${pad}${ind}${ind}OFFSET ${[0, 1, 2].map(() => num(rand() * 10 - 5)).join(' ')}`, `${pad}${ind}}`);
    }
    lines.push(`${pad}}`);
  };
  emit(0, true);
  while (count < target) {
    // Grow the tree under the root until it has the target size: reopen the root's block.
    lines.pop();
    emit(1, false);
    lines.push('}');
  }
  const frames = 1 + Math.floor(rand() * 8);
  lines.push('MOTION', `Frames: ${frames}`, `Frame Time: ${num(1 / pick([30, 60, 100, 120, 119.88]))}`);
  for (let f = 0; f < frames; f++) {
    const row: string[] = [];
    channelsPerJoint.forEach((ch, j) =>
      ch.forEach((c) => row.push(num(c.endsWith('position') ? (j === 0 && c[0] === 'Y' ? 90 : 0) + rand() * 40 - 20 : rand() * 400 - 200))),
    );
    lines.push(row.join(pick([' ', '\t'])));
  }
  return { text: lines.join(eol) + (rand() < 0.8 ? eol : ''), joints: count, frames };
}
