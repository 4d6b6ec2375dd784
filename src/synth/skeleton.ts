// The walker's skeleton as BVH joints: 21 joints plus 5 End Sites, in any naming style, unit, up axis and channel order.
import type { ChannelName, Joint } from '../bvh/take.js';
import type { EulerOrder } from '../skeleton/euler.js';
import { type SegmentLengths, restRootHeight } from './anthropometry.js';
import { JOINT_KEYS, type JointKey, type NamingStyle, jointName } from './naming.js';

/** Length units a take may be written in, with metres per unit. */
export const UNIT_METRES = { m: 1, cm: 0.01, mm: 0.001, in: 0.0254 } as const;
export type LengthUnit = keyof typeof UNIT_METRES;

export type UpAxis = 'Y' | 'Z';

/** Parent of each joint key (-1 for the root). */
const PARENT: Record<JointKey, JointKey | null> = {
  pelvis: null,
  l_hip: 'pelvis', l_knee: 'l_hip', l_ankle: 'l_knee', l_toe: 'l_ankle',
  r_hip: 'pelvis', r_knee: 'r_hip', r_ankle: 'r_knee', r_toe: 'r_ankle',
  spine: 'pelvis', chest: 'spine', neck: 'chest', head: 'neck',
  l_clavicle: 'chest', l_shoulder: 'l_clavicle', l_elbow: 'l_shoulder', l_wrist: 'l_elbow',
  r_clavicle: 'chest', r_shoulder: 'r_clavicle', r_elbow: 'r_shoulder', r_wrist: 'r_elbow',
};

/** Joints that end a chain and carry an End Site. */
const CHAIN_ENDS: readonly JointKey[] = ['l_toe', 'r_toe', 'head', 'l_wrist', 'r_wrist'];

/** The per-joint channel orders used by the `mixed` setting (an arbitrary but fixed pattern). */
export const MIXED_ORDERS: Record<JointKey, EulerOrder> = {
  pelvis: 'ZXY',
  l_hip: 'YXZ', l_knee: 'YXZ', l_ankle: 'YXZ', l_toe: 'XZY',
  r_hip: 'YXZ', r_knee: 'YXZ', r_ankle: 'YXZ', r_toe: 'XZY',
  spine: 'ZYX', chest: 'ZYX', neck: 'ZYX', head: 'ZYX',
  l_clavicle: 'XYZ', l_shoulder: 'XYZ', l_elbow: 'XYZ', l_wrist: 'XYZ',
  r_clavicle: 'XYZ', r_shoulder: 'XYZ', r_elbow: 'XYZ', r_wrist: 'XYZ',
};

/** Returns the rest offsets of every joint key in metres, internal frame (Y up, Z forward, X left). */
export function restOffsets(seg: SegmentLengths): Record<JointKey | `${JointKey}_end`, [number, number, number]> {
  const o: Record<string, [number, number, number]> = {};
  o.pelvis = [0, restRootHeight(seg), 0];
  for (const [p, sx] of [['l', 1], ['r', -1]] as const) {
    o[`${p}_hip`] = [sx * seg.hipHalfWidth, -seg.hipBelowRoot, 0];
    o[`${p}_knee`] = [0, -seg.thigh, 0];
    o[`${p}_ankle`] = [0, -seg.shank, 0];
    o[`${p}_toe`] = [0, -seg.ankleHeight, seg.ankleToToeJoint];
    o[`${p}_toe_end`] = [0, 0, seg.toe];
    o[`${p}_clavicle`] = [sx * seg.clavicleOut, seg.clavicleUp, 0];
    o[`${p}_shoulder`] = [sx * seg.shoulderOut, seg.shoulderUp, 0];
    o[`${p}_elbow`] = [0, -seg.upperArm, 0];
    o[`${p}_wrist`] = [0, -seg.forearm, 0];
    o[`${p}_wrist_end`] = [0, -seg.hand, 0];
  }
  o.spine = [0, seg.rootToSpine, 0];
  o.chest = [0, seg.spineToChest, 0];
  o.neck = [0, seg.chestToNeck, 0];
  o.head = [0, seg.neckToHead, 0];
  o.head_end = [0, seg.headToCrown, 0];
  return o as Record<JointKey | `${JointKey}_end`, [number, number, number]>;
}

/** Returns the 3x3 map (row-major) from the internal frame to the output frame for an up axis. */
export function axisMap(up: UpAxis): Float64Array {
  // Z up: the subject's right becomes +X, forward +Y, up +Z (a proper rotation of the internal frame).
  return up === 'Y' ? new Float64Array([1, 0, 0, 0, 1, 0, 0, 0, 1]) : new Float64Array([-1, 0, 0, 0, 0, 1, 0, 1, 0]);
}

export interface SkeletonSpec {
  seg: SegmentLengths;
  naming: NamingStyle;
  units: LengthUnit;
  up: UpAxis;
  orders: Record<JointKey, EulerOrder>;
  positionsOnAllJoints: boolean;
}

/** The built skeleton: BVH joints plus the indices the encoder needs. */
export interface BuiltSkeleton {
  joints: Joint[];
  channelCount: number;
  /** Take joint index of each joint key, in JOINT_KEYS order. */
  jointIndex: Int32Array;
  /** Take joint index of the End Site after each chain end key (toe, head, wrist); -1 elsewhere. */
  endIndex: Int32Array;
  /** Per joint key: channel index of its first rotation channel, and its three axes in channel order. */
  rotationChannel: Int32Array;
  rotationAxes: Int8Array;
  /** Channel index of the root's Xposition. */
  rootPositionChannel: number;
}

/** Returns the BVH joints of the walker for a skeleton spec (offsets in output units and axes). */
export function buildSkeleton(spec: SkeletonSpec): BuiltSkeleton {
  const off = restOffsets(spec.seg);
  const M = axisMap(spec.up);
  const scale = 1 / UNIT_METRES[spec.units];
  const toOut = (v: readonly number[]): [number, number, number] => {
    const r: [number, number, number] = [0, 0, 0];
    for (let a = 0; a < 3; a++) r[a] = cleanZero((M[a * 3]! * v[0]! + M[a * 3 + 1]! * v[1]! + M[a * 3 + 2]! * v[2]!) * scale);
    return r;
  };
  const joints: Joint[] = [];
  const K = JOINT_KEYS.length;
  const jointIndex = new Int32Array(K).fill(-1);
  const endIndex = new Int32Array(K).fill(-1);
  const rotationChannel = new Int32Array(K);
  const rotationAxes = new Int8Array(K * 3);
  let channel = 0;
  JOINT_KEYS.forEach((key, k) => {
    const parentKey = PARENT[key];
    const parent = parentKey === null ? -1 : jointIndex[JOINT_KEYS.indexOf(parentKey)]!;
    const order = spec.orders[key];
    const channels: ChannelName[] = [];
    if (parent < 0 || spec.positionsOnAllJoints) channels.push('Xposition', 'Yposition', 'Zposition');
    const rotStart = channel + channels.length;
    for (const ch of order) channels.push(`${ch as 'X' | 'Y' | 'Z'}rotation`);
    const name = jointName(key, spec.naming);
    jointIndex[k] = joints.length;
    joints.push({ name, parent, offset: toOut(off[key]), channels, channelStart: channel, endSite: false, line: 0 });
    rotationChannel[k] = rotStart;
    for (let a = 0; a < 3; a++) rotationAxes[k * 3 + a] = order.charCodeAt(a) - 88;
    channel += channels.length;
    if (CHAIN_ENDS.includes(key)) {
      endIndex[k] = joints.length;
      joints.push({ name: `${name}_End`, parent: jointIndex[k]!, offset: toOut(off[`${key}_end`]), channels: [], channelStart: channel, endSite: true, line: 0 });
    }
  });
  return { joints, channelCount: channel, jointIndex, endIndex, rotationChannel, rotationAxes, rootPositionChannel: 0 };
}

/** Returns x with -0 and round-off residue below 1e-12 turned into 0, so offsets print cleanly. */
function cleanZero(x: number): number {
  const r = Math.round(x * 1e9) / 1e9;
  return r === 0 ? 0 : r;
}
