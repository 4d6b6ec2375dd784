// Capture jitter for augmentation: the frame-to-frame noise of a real capture, put on node positions the
// way rotation-channel noise shows up after forward kinematics. Each node joint turns its subtree by a
// small random rotation ω (every axis N(0, θ²), drawn anew each step), which moves every descendant d by
// ω × (x_d − x_joint); the root also shifts by N(0, σ²) per axis. Neighbouring nodes thus jitter
// together, as they do when a hip channel's noise carries the knee, ankle and toe along.
import type { Pcg32 } from '../nn/prng.js';
import { MOTION_NODES } from './roles.js';

/** The parent of each node in the nodes' kinematic tree (−1 for the pelvis, the root). */
export const NODE_PARENT: Int32Array = (() => {
  const parentOf: Record<string, string | null> = {
    pelvis: null, thorax: 'pelvis', head: 'thorax', hip: 'pelvis', knee: 'hip', ankle: 'knee', toe: 'ankle', shoulder: 'thorax', elbow: 'shoulder', wrist: 'elbow',
  };
  const nodes = MOTION_NODES as readonly string[];
  return Int32Array.from(nodes, (n) => {
    const side = n.startsWith('l_') || n.startsWith('r_') ? n.slice(0, 2) : '';
    const p = parentOf[n.slice(side.length)];
    if (p === undefined) throw new Error(`node ${n} has no place in the jitter tree`);
    // Hips and shoulders hang off midline nodes; the rest of a limb stays on its own side.
    return p === null ? -1 : nodes.indexOf(p === 'pelvis' || p === 'thorax' ? p : side + p);
  });
})();

/** Jitter levels: θ, the rotation SD per axis at every node joint (radians), and σ, the root shift SD per axis (position units). */
export interface JitterLevel { rotation: number; shift: number }

/**
 * Writes into `out` the positions of `steps` steps × N nodes (3 per node, row-major, any length units)
 * of `positions` with capture jitter of the given level added (out may be positions itself; the
 * displacements are computed from the clean input first). `parents` must list every parent before its
 * children (NODE_PARENT does).
 */
export function jitterPositions(positions: Float64Array, steps: number, parents: Int32Array, level: JitterLevel, rng: Pcg32, out: Float64Array): Float64Array {
  const N = parents.length, d = new Float64Array(N * 3);
  for (let t = 0; t < steps; t++) {
    const o = t * N * 3;
    d.fill(0);
    for (let j = 0; j < N; j++) {
      const wx = level.rotation * rng.gauss(), wy = level.rotation * rng.gauss(), wz = level.rotation * rng.gauss();
      const jx = positions[o + j * 3]!, jy = positions[o + j * 3 + 1]!, jz = positions[o + j * 3 + 2]!;
      // ω × (x_d − x_j) on every strict descendant d of j.
      for (let n = 0; n < N; n++) {
        if (!isDescendant(parents, n, j)) continue;
        const rx = positions[o + n * 3]! - jx, ry = positions[o + n * 3 + 1]! - jy, rz = positions[o + n * 3 + 2]! - jz;
        d[n * 3] = d[n * 3]! + wy * rz - wz * ry;
        d[n * 3 + 1] = d[n * 3 + 1]! + wz * rx - wx * rz;
        d[n * 3 + 2] = d[n * 3 + 2]! + wx * ry - wy * rx;
      }
    }
    const sx = level.shift * rng.gauss(), sy = level.shift * rng.gauss(), sz = level.shift * rng.gauss();
    for (let n = 0; n < N; n++) {
      out[o + n * 3] = positions[o + n * 3]! + d[n * 3]! + sx;
      out[o + n * 3 + 1] = positions[o + n * 3 + 1]! + d[n * 3 + 1]! + sy;
      out[o + n * 3 + 2] = positions[o + n * 3 + 2]! + d[n * 3 + 2]! + sz;
    }
  }
  return out;
}

/** Returns whether node n lies strictly below node j in the tree. */
function isDescendant(parents: Int32Array, n: number, j: number): boolean {
  for (let p = parents[n]!; p >= 0; p = parents[p]!) if (p === j) return true;
  return false;
}
