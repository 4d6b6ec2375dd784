// Forward kinematics checked against world positions worked out by hand on a small chain.
//
// Rules used for the hand computation (BVH common practice, as in three.js's BVHLoader and the
// Biovision format notes): a joint's world position is its parent's world position plus the parent's
// world rotation applied to the joint's local translation; the local translation is the OFFSET, except
// that position channels replace it axis by axis; a joint's world rotation is its parent's world
// rotation times its own channels composed in listed order (R = R_A·R_B·R_C).
// Elementary rotations (active, right-handed; Siciliano et al. 2009, §2.2):
//   Rx(90°): (x, y, z) → (x, -z, y);  Ry(90°): (x, y, z) → (z, y, -x);  Rz(90°): (x, y, z) → (-y, x, z)
//   Rx(t):   (x, y, z) → (x, c·y - s·z, s·y + c·z)
//   Ry(t):   (x, y, z) → (c·x + s·z, y, -s·x + c·z)
import { describe, expect, it } from 'vitest';
import type { ChannelName, Joint, Take } from '../../src/bvh/take.js';
import { forwardKinematics, planFk, poseFrame, restPose } from '../../src/skeleton/fk.js';
import { EULER_ORDERS, eulerToMatrix } from '../../src/skeleton/euler.js';

interface JointSpec {
  name: string;
  parent: number;
  offset: [number, number, number];
  channels: ChannelName[];
}

/** Builds a Take directly (no parser involved) from joint specs and frame rows. */
function makeTake(specs: JointSpec[], rows: number[][]): Take {
  let start = 0;
  const joints: Joint[] = specs.map((s, i) => {
    const j: Joint = { name: s.name, parent: s.parent, offset: s.offset, channels: s.channels, channelStart: start, endSite: s.channels.length === 0 && s.name.endsWith('_End'), line: i + 2 };
    start += s.channels.length;
    return j;
  });
  for (const r of rows) expect(r.length).toBe(start);
  return {
    joints,
    frameTime: 1 / 120,
    frameCount: rows.length,
    channelCount: start,
    values: Float64Array.from(rows.flat()),
    headerFrameCount: rows.length,
    warnings: [],
  };
}

const POS: ChannelName[] = ['Xposition', 'Yposition', 'Zposition'];
const ZXY: ChannelName[] = ['Zrotation', 'Xrotation', 'Yrotation'];
const XYZ: ChannelName[] = ['Xrotation', 'Yrotation', 'Zrotation'];

// hip (root, 6 channels ZXY) → knee (ZXY) → ankle (XYZ) → End Site.
const CHAIN: JointSpec[] = [
  { name: 'hip', parent: -1, offset: [0, 95, 0], channels: [...POS, ...ZXY] },
  { name: 'knee', parent: 0, offset: [0, -10, 0], channels: ZXY },
  { name: 'ankle', parent: 1, offset: [0, -8, 0], channels: XYZ },
  { name: 'ankle_End', parent: 2, offset: [0, 0, 5], channels: [] },
];

const R2 = Math.SQRT2, R3 = Math.sqrt(3), R6 = Math.sqrt(6);

// Frame 0, quarter turns. hip at (1, 2, 3) (position channels replace the OFFSET 0 95 0), R0 = Rz(90).
//   knee  = (1,2,3) + Rz90·(0,-10,0) = (1,2,3) + (10,0,0) = (11, 2, 3);     R1 = Rz90·Rx90
//   ankle = knee + Rz90·Rx90·(0,-8,0) = knee + Rz90·(0,0,-8) = (11, 2, -5); R2 = R1·Ry90
//   end   = ankle + Rz90·Rx90·Ry90·(0,0,5) = ankle + Rz90·Rx90·(5,0,0) = ankle + Rz90·(5,0,0)
//         = ankle + (0,5,0) = (11, 7, -5)
// Frame 1, hip at (0, 100, 0) unrotated, knee Xrotation -30°, ankle Yrotation 60°.
//   knee  = (0, 90, 0)
//   ankle = knee + Rx(-30)·(0,-8,0) = knee + (0, -8·√3/2, -8·(-1/2)) = (0, 90 - 4√3, 4)
//   end   = ankle + Rx(-30)·Ry(60)·(0,0,5) = ankle + Rx(-30)·(5√3/2, 0, 5/2)
//         = ankle + (5√3/2, 5/4, 5√3/4) = (5√3/2, 91.25 - 4√3, 4 + 5√3/4)
// Frame 2, hip at the origin with Z 30°, X -45°, Y 60°: R0 is the ZXY entry of the hand-computed
// table in euler.test.ts, columns col1 = (-√2/4, √6/4, -√2/2), col2 = (3/4-√2/8, √3/4+√6/8, √2/4);
// knee and ankle unrotated, so every bone is turned by R0 alone.
//   knee  = R0·(0,-10,0) = -10·col1 = (10√2/4, -10√6/4, 10√2/2)
//   ankle = knee - 8·col1 = (18√2/4, -18√6/4, 18√2/2)
//   end   = ankle + 5·col2 = (18√2/4 + 15/4 - 5√2/8, -18√6/4 + 5√3/4 + 5√6/8, 9√2 + 5√2/4)
const ROWS = [
  [1, 2, 3, 90, 0, 0, 0, 90, 0, 0, 90, 0],
  [0, 100, 0, 0, 0, 0, 0, -30, 0, 0, 60, 0],
  [0, 0, 0, 30, -45, 60, 0, 0, 0, 0, 0, 0],
];
const EXPECTED: number[][][] = [
  [[1, 2, 3], [11, 2, 3], [11, 2, -5], [11, 7, -5]],
  [[0, 100, 0], [0, 90, 0], [0, 90 - 4 * R3, 4], [(5 * R3) / 2, 91.25 - 4 * R3, 4 + (5 * R3) / 4]],
  [
    [0, 0, 0],
    [(10 * R2) / 4, (-10 * R6) / 4, (10 * R2) / 2],
    [(18 * R2) / 4, (-18 * R6) / 4, (18 * R2) / 2],
    [(18 * R2) / 4 + 15 / 4 - (5 * R2) / 8, (-18 * R6) / 4 + (5 * R3) / 4 + (5 * R6) / 8, 9 * R2 + (5 * R2) / 4],
  ],
];

function expectPositions(actual: Float64Array, base: number, expected: number[][], tol = 1e-12): void {
  expected.forEach((p, j) => {
    for (let a = 0; a < 3; a++) expect(Math.abs(actual[base + j * 3 + a]! - p[a]!), `joint ${j} axis ${a}`).toBeLessThan(tol);
  });
}

describe('forwardKinematics on a hand-computed 3-joint chain', () => {
  const take = makeTake(CHAIN, ROWS);
  const all = forwardKinematics(take);

  it('returns frames x joints x 3 values', () => {
    expect(all.length).toBe(3 * 4 * 3);
  });
  it('frame 0 (quarter turns about Z, X, Y in turn) matches the hand computation', () => {
    expectPositions(all, 0, EXPECTED[0]!);
  });
  it('frame 1 (knee -30° about X, ankle 60° about Y) matches the hand computation', () => {
    expectPositions(all, 12, EXPECTED[1]!);
  });
  it('frame 2 (root turned ZXY 30°, -45°, 60°) matches the hand computation', () => {
    expectPositions(all, 24, EXPECTED[2]!);
  });
  it('a frame range [1, 3) into a caller buffer gives frames 1 and 2', () => {
    const out = new Float64Array(2 * 12);
    const got = forwardKinematics(take, 1, 3, out);
    expect(got).toBe(out);
    expectPositions(out, 0, EXPECTED[1]!);
    expectPositions(out, 12, EXPECTED[2]!);
  });
  it('poseFrame reports world rotations: frame 0 ankle is Rz90·Rx90·Ry90', () => {
    // Rz90·Rx90·Ry90 by hand: x → Ry90 → -z → Rx90 → y → Rz90 → -x; y → y → z → z; z → x → x → y.
    // Columns are the images of x, y, z: col0 = (-1,0,0), col1 = (0,0,1), col2 = (0,1,0).
    const plan = planFk(take);
    const pos = new Float64Array(12);
    const rot = new Float64Array(36);
    poseFrame(plan, take.values, 0, pos, rot);
    const m = rot.subarray(18, 27);
    const expected = [-1, 0, 0, 0, 0, 1, 0, 1, 0];
    for (let k = 0; k < 9; k++) expect(Math.abs(m[k]! - expected[k]!)).toBeLessThan(1e-15);
  });
});

describe('position channels replace the OFFSET', () => {
  // Common practice of exporters that put position channels on every joint: the channel values are
  // the bone vector itself (DESIGN §3). knee OFFSET (0,-10,0) with channel values (0,-12,0): the knee
  // sits 12 below the hip, not 22.
  const specs: JointSpec[] = [
    { name: 'hip', parent: -1, offset: [0, 95, 0], channels: [...POS, ...ZXY] },
    { name: 'knee', parent: 0, offset: [0, -10, 0], channels: [...POS, ...ZXY] },
    { name: 'ankle', parent: 1, offset: [0, -8, 0], channels: ['Yposition', 'Xrotation'] },
    { name: 'ankle_End', parent: 2, offset: [0, 0, 5], channels: [] },
  ];
  // hip (0,100,0); knee = (0,100,0) + (0,-12,0) = (0,88,0), then Xrotation 90 at the knee.
  // ankle: only Y is replaced: local (0, -6, 0) (X, Z from the OFFSET are 0) → Rx90·(0,-6,0) = (0,0,-6)
  //   ankle = (0, 88, -6); ankle Xrotation 90 more: world Rx(180).
  // end = ankle + Rx180·(0,0,5) = ankle + (0,0,-5) = (0, 88, -11)
  const take = makeTake(specs, [[0, 100, 0, 0, 0, 0, 0, -12, 0, 0, 90, 0, -6, 90]]);
  it('on a non-root joint with all three position channels and on one with Yposition only', () => {
    expectPositions(forwardKinematics(take), 0, [[0, 100, 0], [0, 88, 0], [0, 88, -6], [0, 88, -11]]);
  });
  it('a root without position channels stays at its OFFSET', () => {
    const t = makeTake([{ name: 'hip', parent: -1, offset: [4, 5, 6], channels: ZXY }, { name: 'hip_End', parent: 0, offset: [0, 1, 0], channels: [] }], [[0, 0, 90]]);
    // end = (4,5,6) + Ry90·(0,1,0) = (4, 6, 6)
    expectPositions(forwardKinematics(t), 0, [[4, 5, 6], [4, 6, 6]]);
  });
  it('restPose puts the root at its OFFSET, zero rotations, non-root position channels of frame 0 as bone vectors', () => {
    // hip (0,95,0); knee (0,95-12,0) = (0,83,0); ankle Y replaced by -6 → (0,77,0); end (0,77,5)
    expectPositions(restPose(take), 0, [[0, 95, 0], [0, 83, 0], [0, 77, 0], [0, 77, 5]]);
  });
});

describe('FK composes a joint\'s rotation channels in listed order', () => {
  // eulerToMatrix is checked against the hand-computed Tait-Bryan table in euler.test.ts; here the
  // world rotation of a root listing its channels in each of the six orders must equal that matrix,
  // also when position channels sit between the rotation channels.
  for (const order of EULER_ORDERS) {
    it(`${order} at 30°, -45°, 60°`, () => {
      const rot = [...order].map((a) => `${a}rotation` as ChannelName);
      const channels: ChannelName[] = [rot[0]!, 'Xposition', rot[1]!, 'Yposition', 'Zposition', rot[2]!];
      const take = makeTake([{ name: 'r', parent: -1, offset: [0, 0, 0], channels }, { name: 'r_End', parent: 0, offset: [1, 2, 3], channels: [] }], [[30, 7, -45, 8, 9, 60]]);
      const plan = planFk(take);
      const pos = new Float64Array(6);
      const rotOut = new Float64Array(18);
      poseFrame(plan, take.values, 0, pos, rotOut);
      const expected = eulerToMatrix(order, [30, -45, 60]);
      for (let k = 0; k < 9; k++) expect(Math.abs(rotOut[k]! - expected[k]!)).toBeLessThan(1e-15);
      // The root sits at its position channels (7, 8, 9); the End Site at root + R·(1, 2, 3).
      const e = [0, 1, 2].map((r) => [7, 8, 9][r]! + expected[r * 3]! * 1 + expected[r * 3 + 1]! * 2 + expected[r * 3 + 2]! * 3);
      expectPositions(pos, 0, [[7, 8, 9], e]);
    });
  }
});
