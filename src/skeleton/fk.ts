// Forward kinematics: channel values of a take to world joint positions, in file units and axes.
import type { Take } from '../bvh/take.js';
import { postRotate } from './euler.js';

const DEG = Math.PI / 180;

/** Precomputed, typed-array layout of a take's hierarchy for allocation-free FK. */
export interface FkPlan {
  jointCount: number;
  channelCount: number;
  parents: Int32Array;
  /** Rest offsets, joints x 3. */
  offsets: Float64Array;
  /** Channel index of the X/Y/Z position value per joint, -1 where the joint has none (offset used). */
  positionChannel: Int32Array;
  /** Per joint up to three rotation axes (-1 unused) in channel order. */
  rotationAxes: Int8Array;
  /** Channel index of each rotation axis entry, -1 unused. */
  rotationChannel: Int32Array;
}

/** Returns the FK layout of a take. */
export function planFk(take: Take): FkPlan {
  const J = take.joints.length;
  const plan: FkPlan = {
    jointCount: J,
    channelCount: take.channelCount,
    parents: new Int32Array(J),
    offsets: new Float64Array(J * 3),
    positionChannel: new Int32Array(J * 3).fill(-1),
    rotationAxes: new Int8Array(J * 3).fill(-1),
    rotationChannel: new Int32Array(J * 3).fill(-1),
  };
  take.joints.forEach((joint, j) => {
    plan.parents[j] = joint.parent;
    plan.offsets.set(joint.offset, j * 3);
    let r = 0;
    joint.channels.forEach((ch, k) => {
      const axis = ch.charCodeAt(0) - 88; // 'X' = 88
      const index = joint.channelStart + k;
      if (ch.endsWith('position')) plan.positionChannel[j * 3 + axis] = index;
      else if (r < 3) {
        plan.rotationAxes[j * 3 + r] = axis;
        plan.rotationChannel[j * 3 + r] = index;
        r++;
      }
    });
  });
  return plan;
}

/**
 * Writes world positions of every joint for one frame into `outPos` (joints x 3) and world rotations
 * into `outRot` (joints x 9, row-major). Translation is applied before the rotations; a joint's
 * position channels replace its OFFSET axis by axis.
 */
export function poseFrame(plan: FkPlan, values: ArrayLike<number>, frame: number, outPos: Float64Array, outRot: Float64Array, posBase = 0): void {
  const base = frame * plan.channelCount;
  const { parents, offsets, positionChannel, rotationAxes, rotationChannel } = plan;
  for (let j = 0; j < plan.jointCount; j++) {
    const j3 = j * 3;
    const j9 = j * 9;
    const pc0 = positionChannel[j3]!, pc1 = positionChannel[j3 + 1]!, pc2 = positionChannel[j3 + 2]!;
    const tx = pc0 >= 0 ? values[base + pc0]! : offsets[j3]!;
    const ty = pc1 >= 0 ? values[base + pc1]! : offsets[j3 + 1]!;
    const tz = pc2 >= 0 ? values[base + pc2]! : offsets[j3 + 2]!;
    const p = parents[j]!;
    const o = posBase + j3;
    if (p < 0) {
      outPos[o] = tx; outPos[o + 1] = ty; outPos[o + 2] = tz;
      outRot[j9] = 1; outRot[j9 + 1] = 0; outRot[j9 + 2] = 0;
      outRot[j9 + 3] = 0; outRot[j9 + 4] = 1; outRot[j9 + 5] = 0;
      outRot[j9 + 6] = 0; outRot[j9 + 7] = 0; outRot[j9 + 8] = 1;
    } else {
      const p9 = p * 9;
      const po = posBase + p * 3;
      outPos[o] = outPos[po]! + outRot[p9]! * tx + outRot[p9 + 1]! * ty + outRot[p9 + 2]! * tz;
      outPos[o + 1] = outPos[po + 1]! + outRot[p9 + 3]! * tx + outRot[p9 + 4]! * ty + outRot[p9 + 5]! * tz;
      outPos[o + 2] = outPos[po + 2]! + outRot[p9 + 6]! * tx + outRot[p9 + 7]! * ty + outRot[p9 + 8]! * tz;
      for (let k = 0; k < 9; k++) outRot[j9 + k] = outRot[p9 + k]!;
    }
    for (let r = 0; r < 3; r++) {
      const axis = rotationAxes[j3 + r]!;
      if (axis < 0) break;
      postRotate(outRot, j9, axis, values[base + rotationChannel[j3 + r]!]! * DEG);
    }
  }
}

/** Returns world positions `[frames x joints x 3]` (file units and axes) for frames [from, to). */
export function forwardKinematics(take: Take, from = 0, to = take.frameCount, out?: Float64Array): Float64Array {
  const plan = planFk(take);
  const J = plan.jointCount;
  const n = Math.max(0, to - from);
  const positions = out ?? new Float64Array(n * J * 3);
  const rot = new Float64Array(J * 9);
  for (let f = 0; f < n; f++) poseFrame(plan, take.values, from + f, positions, rot, f * J * 3);
  return positions;
}

/**
 * Returns world positions of the rest pose, joints x 3: every rotation zero, the root at its OFFSET,
 * other joints translated by their position channels of frame 0 where they have them (those values
 * are the bone vectors under the replace-the-OFFSET rule), else by their OFFSET.
 */
export function restPose(take: Take): Float64Array {
  const plan = planFk(take);
  const values = new Float64Array(plan.channelCount);
  if (take.frameCount > 0) {
    for (let j = 0; j < plan.jointCount; j++) {
      if (plan.parents[j]! < 0) continue;
      for (let a = 0; a < 3; a++) {
        const c = plan.positionChannel[j * 3 + a]!;
        if (c >= 0) values[c] = take.values[c]!;
      }
    }
  }
  for (let j = 0; j < plan.jointCount; j++) if (plan.parents[j]! < 0) plan.positionChannel.fill(-1, j * 3, j * 3 + 3);
  const pos = new Float64Array(plan.jointCount * 3);
  const rot = new Float64Array(plan.jointCount * 9);
  poseFrame(plan, values, 0, pos, rot);
  return pos;
}
