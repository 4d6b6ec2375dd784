// Capture jitter for the readout's augmentation (src/motion/jitter.ts): the node tree against the
// skeleton's anatomy (common practice: each limb hangs from its proximal joint), and the spread of a
// jittered position against the hand-computed variance of small rotations about its ancestors.
import { describe, expect, it } from 'vitest';
import { jitterPositions, NODE_PARENT } from '../../src/motion/jitter.js';
import { MOTION_NODES } from '../../src/motion/roles.js';
import { Pcg32 } from '../../src/nn/prng.js';

const idx = (n: string) => (MOTION_NODES as readonly string[]).indexOf(n);

describe('capture jitter', () => {
  it('hangs every node from its proximal joint, parents listed before children', () => {
    const parentName = (n: string) => (NODE_PARENT[idx(n)]! < 0 ? null : MOTION_NODES[NODE_PARENT[idx(n)]!]);
    expect(parentName('pelvis')).toBeNull();
    expect(parentName('thorax')).toBe('pelvis');
    expect(parentName('head')).toBe('thorax');
    for (const s of ['l_', 'r_']) {
      expect(parentName(`${s}hip`)).toBe('pelvis');
      expect(parentName(`${s}knee`)).toBe(`${s}hip`);
      expect(parentName(`${s}ankle`)).toBe(`${s}knee`);
      expect(parentName(`${s}toe`)).toBe(`${s}ankle`);
      expect(parentName(`${s}shoulder`)).toBe('thorax');
      expect(parentName(`${s}elbow`)).toBe(`${s}shoulder`);
      expect(parentName(`${s}wrist`)).toBe(`${s}elbow`);
    }
    NODE_PARENT.forEach((p, n) => expect(p).toBeLessThan(n));
  });

  it('leaves positions unchanged at level zero', () => {
    const N = MOTION_NODES.length, pos = Float64Array.from({ length: 4 * N * 3 }, (_, i) => Math.sin(i));
    const out = jitterPositions(pos, 4, NODE_PARENT, { rotation: 0, shift: 0 }, new Pcg32(3, 1), new Float64Array(pos.length));
    expect(Array.from(out)).toEqual(Array.from(pos));
  });

  it("moves a knee by the hand-computed spread of its ancestors' small rotations and the root shift", () => {
    // Pelvis at the origin, left hip 0.1 to the side, knee 0.45 below the hip; every other node at the pelvis.
    // Hand-computed: ω × r moves x by ω_y·r_z − ω_z·r_y, so var(Δx) = θ²(r_y² + r_z²) summed over the
    // pelvis (r = (0, 0.1, −0.45)) and the hip (r = (0, 0, −0.45)), plus σ²; var(Δz) = θ²(r_x² + r_y²) + σ² = θ²·0.01 + σ².
    const N = MOTION_NODES.length, steps = 20000, theta = 0.01, sigma = 0.002;
    const pos = new Float64Array(steps * N * 3);
    for (let t = 0; t < steps; t++) {
      pos[(t * N + idx('l_hip')) * 3 + 1] = 0.1;
      pos[(t * N + idx('l_knee')) * 3 + 1] = 0.1;
      pos[(t * N + idx('l_knee')) * 3 + 2] = -0.45;
    }
    const out = jitterPositions(pos, steps, NODE_PARENT, { rotation: theta, shift: sigma }, new Pcg32(11, 2), new Float64Array(pos.length));
    const sd = (node: string, a: number) => {
      let s = 0;
      for (let t = 0; t < steps; t++) { const o = (t * N + idx(node)) * 3 + a; s += (out[o]! - pos[o]!) ** 2; }
      return Math.sqrt(s / steps);
    };
    expect(sd('l_knee', 0) / Math.sqrt(theta ** 2 * (0.1 ** 2 + 0.45 ** 2 + 0.45 ** 2) + sigma ** 2)).toBeCloseTo(1, 1);
    expect(sd('l_knee', 2) / Math.sqrt(theta ** 2 * 0.01 + sigma ** 2)).toBeCloseTo(1, 1);
    // The pelvis only shifts; a node at a joint's own place is not turned by it.
    expect(sd('pelvis', 0) / sigma).toBeCloseTo(1, 1);
  });
});
