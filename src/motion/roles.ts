// The coupling model's nodes: a fixed, ordered set of 17 joint roles, their left/right mirror map, the
// default joint-pair list (every ordered pair) with its mirror map, and where each node's position comes
// from in a given take (one joint, or the midpoint of two as a documented fallback).
//
// Why 17 of the 19 roles: `spine` and `neck` are the roles whose joint differs most between skeleton
// layouts (one to five spine joints, a neck or none), so a model trained on one layout would meet a
// different body point under the same name on another. Pelvis, thorax (where the arms branch) and head
// are found on every layout the importer supports; they carry the trunk.
import { InputError } from '../errors/index.js';
import type { ImportedTake } from '../skeleton/import.js';
import type { RoleName } from '../skeleton/roles.js';

/** The model's nodes in their fixed order: the midline, then the left side, then the right side. */
export const MOTION_NODES = [
  'pelvis', 'thorax', 'head',
  'l_hip', 'l_knee', 'l_ankle', 'l_toe', 'l_shoulder', 'l_elbow', 'l_wrist',
  'r_hip', 'r_knee', 'r_ankle', 'r_toe', 'r_shoulder', 'r_elbow', 'r_wrist',
] as const satisfies readonly RoleName[];

/** A node's role name. */
export type MotionNode = (typeof MOTION_NODES)[number];

/** Number of nodes (17). */
export const NODE_COUNT = MOTION_NODES.length;

/** Returns the index of a node in MOTION_NODES, or -1 when the role is not a node. */
export function nodeIndex(role: string): number {
  return (MOTION_NODES as readonly string[]).indexOf(role);
}

/** Returns the mirror map of a node list: l_x ↔ r_x, every other node mapped to itself. */
export function mirrorMapOf(nodes: readonly string[]): Int32Array {
  const m = new Int32Array(nodes.length);
  nodes.forEach((n, i) => {
    const other = n.startsWith('l_') ? `r_${n.slice(2)}` : n.startsWith('r_') ? `l_${n.slice(2)}` : n;
    const j = nodes.indexOf(other);
    if (j < 0) throw new Error(`node list has ${n} but not its mirror ${other}`);
    m[i] = j;
  });
  return m;
}

/** Mirror of each node of MOTION_NODES (an involution: NODE_MIRROR[NODE_MIRROR[i]] = i). */
export const NODE_MIRROR: Int32Array = mirrorMapOf(MOTION_NODES);

/** A list of ordered joint pairs (sender → receiver) and the index of each pair's mirror pair. */
export interface PairSet {
  nodeCount: number;
  count: number;
  sender: Int32Array;
  receiver: Int32Array;
  /** Pair (i, j) ↔ pair (mirror i, mirror j). */
  mirror: Int32Array;
}

/**
 * Returns every ordered pair (i, j), i ≠ j, in row-major order (pair index = i·(n−1) + j − [j > i]),
 * with the pair mirror map taken from the node mirror map.
 */
export function allPairs(nodeCount: number = NODE_COUNT, nodeMirror: Int32Array = NODE_MIRROR): PairSet {
  const count = nodeCount * (nodeCount - 1);
  const sender = new Int32Array(count), receiver = new Int32Array(count), mirror = new Int32Array(count);
  let p = 0;
  for (let i = 0; i < nodeCount; i++)
    for (let j = 0; j < nodeCount; j++) {
      if (i === j) continue;
      sender[p] = i;
      receiver[p] = j;
      p++;
    }
  for (let q = 0; q < count; q++) mirror[q] = pairIndex(nodeMirror[sender[q]!]!, nodeMirror[receiver[q]!]!, nodeCount);
  return { nodeCount, count, sender, receiver, mirror };
}

/** Returns the index of ordered pair (i, j), i ≠ j, in the allPairs order. */
export function pairIndex(i: number, j: number, nodeCount: number = NODE_COUNT): number {
  return i * (nodeCount - 1) + j - (j > i ? 1 : 0);
}

/** The default pair list: all 272 ordered pairs of the 17 nodes. */
export const DEFAULT_PAIRS: PairSet = allPairs();

/**
 * Where each node's position comes from in one take: the mean of joints `a[i]` and `b[i]` (equal for a
 * node played by one joint). `fallback[i]` says in words how a missing role was filled, or is null.
 */
export interface NodeSources {
  a: Int32Array;
  b: Int32Array;
  fallback: (string | null)[];
}

/** Fallbacks for missing roles: the role is placed at the midpoint of two other roles (or on one). */
const FALLBACKS: Partial<Record<MotionNode, readonly [RoleName, RoleName]>> = {
  // Where the arms branch lies between the shoulders in every layout the importer reads.
  thorax: ['l_shoulder', 'r_shoulder'],
  // A skeleton without a head joint ends its head chain at the neck; the neck stands in for it.
  head: ['neck', 'neck'],
};

/**
 * Returns the joint(s) behind each node of `nodes` in an imported take; a missing role is filled by
 * its fallback (thorax: shoulder midpoint; head: neck) or raises InputError naming the file and role.
 */
export function nodeSources(imported: ImportedTake, nodes: readonly MotionNode[] = MOTION_NODES): NodeSources {
  const roles = imported.frame.roles.roles;
  const n = nodes.length;
  const a = new Int32Array(n), b = new Int32Array(n);
  const fallback: (string | null)[] = [];
  nodes.forEach((node, i) => {
    const r = roles[node];
    if (r) {
      a[i] = b[i] = r.joint;
      fallback.push(null);
      return;
    }
    const fb = FALLBACKS[node];
    const ra = fb ? roles[fb[0]] : null, rb = fb ? roles[fb[1]] : null;
    if (fb && ra && rb) {
      a[i] = ra.joint;
      b[i] = rb.joint;
      fallback.push(fb[0] === fb[1] ? `${node} taken from ${fb[0]}` : `${node} placed midway between ${fb[0]} and ${fb[1]}`);
      return;
    }
    const hint = fb ? ` (nor ${fb[0] === fb[1] ? fb[0] : `${fb[0]} and ${fb[1]}`} to stand in for it)` : '';
    throw new InputError(`${imported.path}: the motion model needs the ${node} role, which was not found${hint}; give it in a role-map file (--roles).`);
  });
  return { a, b, fallback };
}
