// A take as the motion model sees it, built once per take: the node positions at the model rate, in
// metres, in the canonical frame (right-handed, Z up: the same axes as the gait input), plus the leg
// length that scales every window.
//
// Causal by construction: each step is forward kinematics of at most two source frames (the ones the
// resampler blends, see resample.ts), unit scaling and one fixed rotation; nothing is filtered. The
// gait input (src/gait/input.ts) is not used because its default low-pass runs forward and backward
// over the whole take, which would let later frames into earlier positions. What the track takes from
// the whole take is only the take-level frame of reference the importer resolved: units, up axis
// (detected from sampled frames of the motion; fix it with --up when a stream must not depend on
// later frames) and the rest pose (leg length).
import type { ImportedTake } from '../skeleton/import.js';
import { planFk, poseFrame, restPose } from '../skeleton/fk.js';
import { InputError } from '../errors/index.js';
import { MOTION_NODES, NODE_MIRROR, mirrorMapOf, nodeSources, type MotionNode } from './roles.js';
import { resamplePlan } from './resample.js';
import { rotationToZ } from '../skeleton/axes.js';

/** Default model rate, steps per second. */
export const DEFAULT_MODEL_RATE = 30;

/** One take's node positions at the model rate and what is needed to place windows in it. */
export interface Track {
  /** The take's file (for messages). */
  path: string;
  /** Model rate, steps per second. */
  rate: number;
  steps: number;
  nodes: readonly MotionNode[];
  nodeCount: number;
  /** Mirror of each node (l_ ↔ r_). */
  nodeMirror: Int32Array;
  /** Node positions, steps × nodes × 3, metres, canonical frame (Z up, right-handed). */
  positions: Float64Array;
  /** Mean of the left and right hip-knee plus knee-ankle lengths in the rest pose, metres. */
  legLength: number;
  /** The take's frame rate and frame count. */
  sourceFps: number;
  sourceFrameTime: number;
  sourceFrames: number;
  /** Rotation from file axes to the canonical frame, row-major 3 × 3 (applied after scaling to metres). */
  toCanonical: Float64Array;
  metresPerUnit: number;
  /** Roles filled by a fallback, one sentence each (empty when every role was found). */
  fallbacks: string[];
}

/** Options of trackFromImported. */
export interface TrackOptions {
  /** Model rate, steps per second (default 30). */
  rate?: number;
  /** Node list (default MOTION_NODES). */
  nodes?: readonly MotionNode[];
}

/** Returns the track of an imported take: node positions resampled to the model rate, metres, Z up. */
export function trackFromImported(imported: ImportedTake, options: TrackOptions = {}): Track {
  const { take, frame, path } = imported;
  const rate = options.rate ?? DEFAULT_MODEL_RATE;
  const nodes = options.nodes ?? MOTION_NODES;
  const src = nodeSources(imported, nodes);
  const N = nodes.length;
  const s = frame.units.metresPerUnit;
  const R = rotationToZ(frame.up.vector);
  const J = take.joints.length;
  const F = take.frameCount;
  if (F < 2) throw new InputError(`${path}: the motion model needs at least two frames (the take has ${F}).`);
  const plan = resamplePlan(F, take.frameTime, rate);
  const fk = planFk(take);
  const pos = new Float64Array(J * 3);
  const rot = new Float64Array(J * 9);
  // Two node frames in a ring keyed by frame parity: frames i and i + 1 never share a slot.
  const ring = new Float64Array(2 * N * 3);
  const held = new Int32Array([-1, -1]);
  const { a, b } = src;
  const R0 = R[0]!, R1 = R[1]!, R2 = R[2]!, R3 = R[3]!, R4 = R[4]!, R5 = R[5]!, R6 = R[6]!, R7 = R[7]!, R8 = R[8]!;
  const load = (f: number): number => {
    const slot = f & 1;
    const o = slot * N * 3;
    if (held[slot] === f) return o;
    poseFrame(fk, take.values, f, pos, rot);
    for (let n = 0; n < N; n++) {
      const ja = a[n]! * 3, jb = b[n]! * 3;
      let x = pos[ja]!, y = pos[ja + 1]!, z = pos[ja + 2]!;
      if (ja !== jb) { x = 0.5 * (x + pos[jb]!); y = 0.5 * (y + pos[jb + 1]!); z = 0.5 * (z + pos[jb + 2]!); }
      const q = o + n * 3;
      ring[q] = s * (R0 * x + R1 * y + R2 * z);
      ring[q + 1] = s * (R3 * x + R4 * y + R5 * z);
      ring[q + 2] = s * (R6 * x + R7 * y + R8 * z);
    }
    held[slot] = f;
    return o;
  };
  const W = N * 3;
  const positions = new Float64Array(plan.steps * W);
  for (let k = 0; k < plan.steps; k++) {
    const i = plan.index[k]!, w = plan.weight[k]!;
    const oa = load(i);
    const d = k * W;
    if (w === 0) {
      for (let c = 0; c < W; c++) positions[d + c] = ring[oa + c]!;
      continue;
    }
    const ob = load(i + 1);
    for (let c = 0; c < W; c++) {
      const x = ring[oa + c]!;
      positions[d + c] = x + (ring[ob + c]! - x) * w;
    }
  }
  const legLength = restLegLength(imported);
  return {
    path, rate, steps: plan.steps, nodes, nodeCount: N,
    nodeMirror: nodes === MOTION_NODES ? NODE_MIRROR : mirrorMapOf(nodes),
    positions, legLength,
    sourceFps: 1 / take.frameTime, sourceFrameTime: take.frameTime, sourceFrames: F,
    toCanonical: R, metresPerUnit: s,
    fallbacks: src.fallback.filter((x): x is string => x !== null),
  };
}

/** Returns the mean left/right leg length (hip-knee plus knee-ankle) of the rest pose in metres. */
export function restLegLength(imported: ImportedTake): number {
  const roles = imported.frame.roles.roles;
  const need = ['l_hip', 'l_knee', 'l_ankle', 'r_hip', 'r_knee', 'r_ankle'] as const;
  for (const r of need) if (!roles[r]) throw new InputError(`${imported.path}: the motion model needs the ${r} role for the leg length, which was not found; give it in a role-map file (--roles).`);
  const rest = restPose(imported.take);
  const seg = (p: number, q: number) => Math.hypot(rest[p * 3]! - rest[q * 3]!, rest[p * 3 + 1]! - rest[q * 3 + 1]!, rest[p * 3 + 2]! - rest[q * 3 + 2]!);
  const j = (r: (typeof need)[number]) => roles[r]!.joint;
  const fileUnits = 0.5 * (seg(j('l_hip'), j('l_knee')) + seg(j('l_knee'), j('l_ankle')) + seg(j('r_hip'), j('r_knee')) + seg(j('r_knee'), j('r_ankle')));
  const legLength = fileUnits * imported.frame.units.metresPerUnit;
  if (!(legLength > 0)) throw new InputError(`${imported.path}: the rest pose gives a zero leg length, so windows cannot be scaled.`);
  return legLength;
}
