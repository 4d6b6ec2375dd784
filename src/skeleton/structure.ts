// The body plan of a skeleton read from its tree and rest pose alone (no names, no up axis):
// the two mirrored limb pairs (legs, arms), the trunk between them and the head chain.
import type { Take } from '../bvh/take.js';
import { childLists } from '../bvh/take.js';
import { restPose } from './fk.js';

/** Two mirrored chains branching from one joint. */
export interface LimbPair {
  /** The joint both chains branch from. */
  branch: number;
  /** Each chain's main path: the branch's child, then the child with the longest reach, to a leaf. */
  chains: [number[], number[]];
  /** Mean distance between one chain and the mirror image of the other, relative to their size (0 = exact mirror). */
  mirrorError: number;
  /** Length of the longer chain from the branch to its far end, file units. */
  reach: number;
}

/** What the tree and rest pose say about the body, before names are read. */
export interface BodyStructure {
  /** Rest-pose world positions, joints x 3, file units. */
  rest: Float64Array;
  children: number[][];
  /** Diagonal of the rest pose's bounding box, file units. */
  scale: number;
  legs: LimbPair | null;
  arms: LimbPair | null;
  /** Main path from the thorax's non-arm child up to the top of the head (may end in an End Site). */
  headChain: number[] | null;
  /** Unit vector from the feet towards the head in the rest pose, or null when it cannot be told. */
  restUp: [number, number, number] | null;
  /** Full sentences on how the legs and arms were told apart. */
  evidence: string[];
  warnings: string[];
}

/** Limbs must reach at least this fraction of the skeleton's size (fingers and toes stay below it). */
const LIMB_FRACTION = 0.15;
/** Mirror images within this relative error count as a left/right pair. */
const MIRROR_TOLERANCE = 0.15;

/** Returns `v` snapped to the nearest signed axis when within about 20 degrees of it (cosine 0.94), else `v`. */
export function snapAxis(v: readonly number[]): [number, number, number] {
  let a = 0;
  for (let k = 1; k < 3; k++) if (Math.abs(v[k]!) > Math.abs(v[a]!)) a = k;
  const len = Math.hypot(v[0]!, v[1]!, v[2]!);
  if (!(len > 0) || Math.abs(v[a]!) / len < 0.94) return [v[0]!, v[1]!, v[2]!];
  const out: [number, number, number] = [0, 0, 0];
  out[a] = Math.sign(v[a]!);
  return out;
}

/** Returns the distance between joints a and b of a positions array. */
export function dist(p: ArrayLike<number>, a: number, b: number): number {
  const dx = p[a * 3]! - p[b * 3]!, dy = p[a * 3 + 1]! - p[b * 3 + 1]!, dz = p[a * 3 + 2]! - p[b * 3 + 2]!;
  return Math.sqrt(dx * dx + dy * dy + dz * dz);
}

/** Returns, per joint, the longest bone-length path from it down to a leaf of its subtree. */
function reaches(take: Take, rest: Float64Array, kids: number[][]): Float64Array {
  const reach = new Float64Array(take.joints.length);
  for (let j = take.joints.length - 1; j >= 0; j--) {
    let best = 0;
    for (const c of kids[j]!) best = Math.max(best, dist(rest, j, c) + reach[c]!);
    reach[j] = best;
  }
  return reach;
}

/** Returns the main path from `start`: at every joint the child with the longest reach, down to a leaf. */
export function mainPath(start: number, kids: number[][], rest: Float64Array, reach: Float64Array): number[] {
  const path = [start];
  let j = start;
  while (kids[j]!.length > 0) {
    let best = -1;
    let bestLen = -1;
    for (const c of kids[j]!) {
      const len = dist(rest, j, c) + reach[c]!;
      if (len > bestLen) { bestLen = len; best = c; }
    }
    path.push(best);
    j = best;
  }
  return path;
}

/** Returns the relative error of chain a mirrored onto chain b through a plane containing the branch point. */
function mirrorError(rest: Float64Array, branch: number, a: number[], b: number[]): number {
  const n = Math.min(a.length, b.length);
  const bx = rest[branch * 3]!, by = rest[branch * 3 + 1]!, bz = rest[branch * 3 + 2]!;
  let nx = 0, ny = 0, nz = 0;
  for (let k = 0; k < n; k++) {
    nx += rest[a[k]! * 3]! - rest[b[k]! * 3]!;
    ny += rest[a[k]! * 3 + 1]! - rest[b[k]! * 3 + 1]!;
    nz += rest[a[k]! * 3 + 2]! - rest[b[k]! * 3 + 2]!;
  }
  const nl = Math.hypot(nx, ny, nz);
  if (nl === 0) return Infinity; // coincident chains are not a left/right pair
  nx /= nl; ny /= nl; nz /= nl;
  let err = 0;
  let size = 0;
  for (let k = 0; k < n; k++) {
    const ax = rest[a[k]! * 3]! - bx, ay = rest[a[k]! * 3 + 1]! - by, az = rest[a[k]! * 3 + 2]! - bz;
    const qx = rest[b[k]! * 3]! - bx, qy = rest[b[k]! * 3 + 1]! - by, qz = rest[b[k]! * 3 + 2]! - bz;
    const d = 2 * (ax * nx + ay * ny + az * nz);
    err += Math.hypot(ax - d * nx - qx, ay - d * ny - qy, az - d * nz - qz);
    size += 0.5 * (Math.hypot(ax, ay, az) + Math.hypot(qx, qy, qz));
  }
  const lengthPenalty = a.length === b.length ? 0 : 0.05 * Math.abs(a.length - b.length);
  return (size > 0 ? err / size : Infinity) + lengthPenalty;
}

/** Returns true when `a` is an ancestor of `b` (or `b` itself). */
export function isAncestor(take: Take, a: number, b: number): boolean {
  for (let j = b; j >= 0; j = take.joints[j]!.parent) if (j === a) return true;
  return false;
}

/** Returns the mirrored limb pairs of the skeleton, longest first. */
function findPairs(take: Take, rest: Float64Array, kids: number[][], reach: Float64Array, scale: number): LimbPair[] {
  const pairs: LimbPair[] = [];
  for (let j = 0; j < take.joints.length; j++) {
    const big = kids[j]!.filter((c) => dist(rest, j, c) + reach[c]! >= LIMB_FRACTION * scale);
    let best: LimbPair | null = null;
    for (let x = 0; x < big.length; x++) {
      for (let y = x + 1; y < big.length; y++) {
        const ca = mainPath(big[x]!, kids, rest, reach);
        const cb = mainPath(big[y]!, kids, rest, reach);
        const ra = dist(rest, j, big[x]!) + reach[big[x]!]!;
        const rb = dist(rest, j, big[y]!) + reach[big[y]!]!;
        if (Math.min(ra, rb) < 0.8 * Math.max(ra, rb)) continue;
        const err = mirrorError(rest, j, ca, cb);
        if (err > MIRROR_TOLERANCE) continue;
        if (!best || err < best.mirrorError) best = { branch: j, chains: [ca, cb], mirrorError: err, reach: Math.max(ra, rb) };
      }
    }
    if (best) pairs.push(best);
  }
  return pairs.sort((p, q) => q.reach - p.reach);
}

/** Returns the head chain: the thorax's longest non-arm branch, else the nearest side branch below the thorax. */
function findHeadChain(take: Take, kids: number[][], rest: Float64Array, reach: Float64Array, arms: LimbPair, legs: LimbPair | null, scale: number): number[] | null {
  const taken = new Set<number>([arms.chains[0][0]!, arms.chains[1][0]!]);
  if (legs) { taken.add(legs.chains[0][0]!); taken.add(legs.chains[1][0]!); }
  let onPath = arms.branch;
  for (let j: number = arms.branch; j >= 0; j = take.joints[j]!.parent) {
    if (legs && j === legs.branch && j !== arms.branch) break;
    let best = -1;
    let bestLen = 0.03 * scale;
    for (const c of kids[j]!) {
      if (taken.has(c) || c === onPath || (legs && isAncestor(take, c, legs.branch))) continue;
      const len = dist(rest, j, c) + reach[c]!;
      if (len > bestLen) { bestLen = len; best = c; }
    }
    if (best >= 0) return mainPath(best, kids, rest, reach);
    onPath = j;
  }
  return null;
}

/** Returns the body structure of a take: limb pairs, head chain and rest-pose up, from topology and rest pose. */
export function analyseStructure(take: Take): BodyStructure {
  const rest = restPose(take);
  const kids = childLists(take);
  const J = take.joints.length;
  const lo = [Infinity, Infinity, Infinity];
  const hi = [-Infinity, -Infinity, -Infinity];
  for (let j = 0; j < J; j++)
    for (let a = 0; a < 3; a++) { lo[a] = Math.min(lo[a]!, rest[j * 3 + a]!); hi[a] = Math.max(hi[a]!, rest[j * 3 + a]!); }
  const scale = J > 0 ? Math.hypot(hi[0]! - lo[0]!, hi[1]! - lo[1]!, hi[2]! - lo[2]!) : 0;
  const reach = reaches(take, rest, kids);
  const out: BodyStructure = { rest, children: kids, scale, legs: null, arms: null, headChain: null, restUp: null, evidence: [], warnings: [] };
  const pairs = findPairs(take, rest, kids, reach, scale).slice(0, 2);
  const name = (j: number) => `'${take.joints[j]!.name}'`;
  if (pairs.length < 2) {
    out.warnings.push(
      pairs.length === 0
        ? 'No mirrored pair of limbs was found in the skeleton tree, so legs and arms cannot be placed.'
        : `Only one mirrored pair of limbs was found (branching from ${name(pairs[0]!.branch)}); it is taken as the legs.`,
    );
    if (pairs.length === 1) out.legs = pairs[0]!;
  } else {
    const [p, q] = pairs as [LimbPair, LimbPair];
    const extra = (pr: LimbPair) => kids[pr.branch]!.filter((c) => c !== pr.chains[0][0] && c !== pr.chains[1][0] && dist(rest, pr.branch, c) + reach[c]! >= 0.03 * scale).length;
    if (isAncestor(take, p.branch, q.branch) !== isAncestor(take, q.branch, p.branch)) {
      [out.legs, out.arms] = isAncestor(take, p.branch, q.branch) ? [p, q] : [q, p];
      out.evidence.push(`The arms branch from ${name(out.arms.branch)}, which lies above the legs' branching joint ${name(out.legs.branch)} in the tree.`);
    } else if (extra(p) !== extra(q) && Math.min(extra(p), extra(q)) === 0) {
      [out.legs, out.arms] = extra(p) === 0 ? [p, q] : [q, p];
      out.evidence.push(`The arms are the pair whose branching joint ${name(out.arms.branch)} also carries the neck; the legs branch from ${name(out.legs.branch)}.`);
    } else {
      [out.legs, out.arms] = [p, q];
      out.warnings.push(`The tree does not say which limb pair is the legs; ${name(p.branch)}'s pair was taken as the legs.`);
    }
  }
  if (out.arms) out.headChain = findHeadChain(take, kids, rest, reach, out.arms, out.legs, scale);
  if (out.legs) {
    const top = out.headChain ? out.headChain[out.headChain.length - 1]! : out.arms ? out.arms.branch : out.legs.branch;
    const fa = out.legs.chains[0][out.legs.chains[0].length - 1]!;
    const fb = out.legs.chains[1][out.legs.chains[1].length - 1]!;
    const v = [0, 1, 2].map((a) => rest[top * 3 + a]! - 0.5 * (rest[fa * 3 + a]! + rest[fb * 3 + a]!));
    const len = Math.hypot(v[0]!, v[1]!, v[2]!);
    if (len > 0) out.restUp = [v[0]! / len, v[1]! / len, v[2]! / len];
  }
  return out;
}
