// Choosing the joints inside one chain: hip, knee, ankle, toe of a leg; shoulder, elbow, wrist of an arm;
// spine, neck and head of the trunk. Geometry of the rest pose decides; names break ties and veto helpers.
import type { Take } from '../bvh/take.js';
import { isEndName, isTwistName, partOfName, type PartWord } from './names.js';
import { dist, isAncestor } from './structure.js';

/** One chosen joint with how sure the choice is and why. */
export interface Pick {
  joint: number;
  confidence: number;
  evidence: string;
}

/** Thigh length over shank length in an adult: 0.245 H / 0.246 H (Winter 2009, segment lengths; recalled from memory). */
export const THIGH_OVER_SHANK = 0.245 / 0.246;
/** Upper-arm length over forearm length: 0.186 H / 0.146 H (Winter 2009, segment lengths; recalled from memory). */
export const UPPERARM_OVER_FOREARM = 0.186 / 0.146;

type V3 = [number, number, number];

function sub(p: ArrayLike<number>, a: number, b: number): V3 {
  return [p[a * 3]! - p[b * 3]!, p[a * 3 + 1]! - p[b * 3 + 1]!, p[a * 3 + 2]! - p[b * 3 + 2]!];
}

/** Returns |v·u| / |v| and |v − (v·u)u| / |v| for a unit `u`: how vertical and how horizontal v is. */
function verticality(v: V3, u: ArrayLike<number>): [number, number] {
  const len = Math.hypot(v[0], v[1], v[2]);
  if (len === 0) return [0, 0];
  const h = v[0] * u[0]! + v[1] * u[1]! + v[2] * u[2]!;
  const hx = v[0] - h * u[0]!, hy = v[1] - h * u[1]!, hz = v[2] - h * u[2]!;
  return [Math.abs(h) / len, Math.hypot(hx, hy, hz) / len];
}

/** Returns the confidence a name lends to a pick: higher when it carries the expected word, lower when another. */
function nameConfidence(name: string, expected: readonly PartWord[]): number {
  const part = partOfName(name);
  if (part === null) return 0.8;
  return expected.includes(part) ? 0.95 : 0.65;
}

/** Returns true for a joint that can take a role: not an End Site and not an end effector written as a JOINT. */
function isRoleJoint(take: Take, j: number): boolean {
  const joint = take.joints[j]!;
  return !joint.endSite && !isEndName(joint.name);
}

/** Returns the leg's hip, knee, ankle and toe picks along its main path `chain` from the pelvis `branch`. */
export function pickLeg(take: Take, rest: Float64Array, chain: number[], branch: number, up: ArrayLike<number>, scale: number): { hip: Pick | null; knee: Pick | null; ankle: Pick | null; toe: Pick | null } {
  const eps = 0.005 * scale;
  const nm = (j: number) => take.joints[j]!.name;
  const hipK = chain.findIndex((j) => isRoleJoint(take, j) && dist(rest, j, branch) > eps);
  if (hipK < 0) return { hip: null, knee: null, ankle: null, toe: null };
  const hipJ = chain[hipK]!;
  const hip: Pick = {
    joint: hipJ,
    confidence: nameConfidence(nm(hipJ), ['thigh', 'pelvis']),
    evidence: `'${nm(hipJ)}' is the first joint of the leg chain set apart from the pelvis.`,
  };
  // Ankle: the joint where the vertical shank turns into the horizontal foot.
  let ankleK = -1;
  let best = 0.3;
  for (let k = hipK + 1; k < chain.length; k++) {
    const j = chain[k]!;
    if (!isRoleJoint(take, j)) continue;
    let prev = k - 1;
    while (prev > hipK && dist(rest, chain[prev]!, j) <= eps) prev--;
    let next = k + 1;
    while (next < chain.length && dist(rest, chain[next]!, j) <= eps) next++;
    if (next >= chain.length) continue;
    const inV = verticality(sub(rest, j, chain[prev]!), up)[0];
    const outH = verticality(sub(rest, chain[next]!, j), up)[1];
    const score = inV * outH + (partOfName(nm(j)) === 'foot' ? 0.3 : 0) - (isTwistName(nm(j)) ? 0.5 : 0);
    if (score > best) { best = score; ankleK = k; }
  }
  let ankleWhy = 'where the shank turns into the foot';
  if (ankleK < 0) {
    for (let k = chain.length - 1; k > hipK; k--) if (isRoleJoint(take, chain[k]!)) { ankleK = k; break; }
    ankleWhy = 'the last joint of the leg chain (no foot turn was found)';
  }
  if (ankleK < 0) return { hip, knee: null, ankle: null, toe: null };
  const ankleJ = chain[ankleK]!;
  const ankle: Pick = {
    joint: ankleJ,
    confidence: nameConfidence(nm(ankleJ), ['foot']) * (best > 0.3 ? 1 : 0.7),
    evidence: `'${nm(ankleJ)}' is ${ankleWhy}.`,
  };
  let toe: Pick | null = null;
  if (ankleK + 1 < chain.length) {
    const t = chain[ankleK + 1]!;
    const site = take.joints[t]!.endSite || isEndName(nm(t));
    toe = {
      joint: t,
      confidence: site ? 0.8 : nameConfidence(nm(t), ['toe']),
      evidence: site ? `The foot has no toe joint; its end point '${nm(t)}' stands for the toe.` : `'${nm(t)}' is the joint after the ankle.`,
    };
  }
  // Knee: the joint between hip and ankle whose thigh/shank ratio is closest to the adult value.
  let knee: Pick | null = null;
  let kneeScore = -Infinity;
  let kneeRatio = 0;
  for (let k = hipK + 1; k < ankleK; k++) {
    const j = chain[k]!;
    if (!isRoleJoint(take, j)) continue;
    const a = dist(rest, hipJ, j), b = dist(rest, j, ankleJ);
    if (a <= eps || b <= eps) continue;
    const part = partOfName(nm(j));
    const score = -Math.abs(Math.log(a / b / THIGH_OVER_SHANK)) + (part === 'shank' ? 0.3 : 0) - (part === 'twist' ? 1 : 0) - (part === 'thigh' ? 0.3 : 0);
    if (score > kneeScore) { kneeScore = score; knee = { joint: j, confidence: 0, evidence: '' }; kneeRatio = a / b; }
  }
  if (knee) {
    knee.confidence = nameConfidence(nm(knee.joint), ['shank']) * (Math.abs(Math.log(kneeRatio / THIGH_OVER_SHANK)) < 0.4 ? 1 : 0.7);
    knee.evidence = `'${nm(knee.joint)}' splits hip-to-ankle with a thigh/shank length ratio of ${kneeRatio.toFixed(2)} (adults about 1.0).`;
  }
  return { hip, knee, ankle, toe };
}

/** Returns the arm's shoulder, elbow and wrist picks along its main path `chain` from the thorax. */
export function pickArm(take: Take, rest: Float64Array, kids: number[][], chain: number[], scale: number): { shoulder: Pick | null; elbow: Pick | null; wrist: Pick | null } {
  const eps = 0.005 * scale;
  const nm = (j: number) => take.joints[j]!.name;
  // Wrist: where the hand splits into fingers, else a joint named hand/wrist, else the chain's last joint.
  let wristK = chain.findIndex((j, k) => k >= 2 && isRoleJoint(take, j) && kids[j]!.length >= 2);
  let wristWhy = 'the joint where the hand splits into fingers';
  if (wristK < 0) {
    for (let k = chain.length - 1; k >= 0; k--) {
      const j = chain[k]!;
      if (isRoleJoint(take, j) && partOfName(nm(j)) === 'hand') { wristK = k; wristWhy = 'the hand joint'; break; }
    }
  }
  if (wristK < 0) {
    for (let k = chain.length - 1; k >= 0; k--) if (isRoleJoint(take, chain[k]!)) { wristK = k; wristWhy = 'the last joint of the arm chain'; break; }
  }
  if (wristK < 0) return { shoulder: null, elbow: null, wrist: null };
  const wristJ = chain[wristK]!;
  const wrist: Pick = { joint: wristJ, confidence: nameConfidence(nm(wristJ), ['hand']), evidence: `'${nm(wristJ)}' is ${wristWhy}.` };
  // Shoulder and elbow: the pair whose upper-arm/forearm ratio is closest to the adult value.
  let bestScore = -Infinity;
  let si = -1, ei = -1, ratio = 0;
  for (let i = 0; i < wristK; i++) {
    const ji = chain[i]!;
    if (!isRoleJoint(take, ji)) continue;
    for (let e = i + 1; e < wristK; e++) {
      const je = chain[e]!;
      if (!isRoleJoint(take, je)) continue;
      const a = dist(rest, ji, je), b = dist(rest, je, wristJ);
      if (a <= eps || b <= eps) continue;
      const pi = partOfName(nm(ji)), pe = partOfName(nm(je));
      const score = -Math.abs(Math.log(a / b / UPPERARM_OVER_FOREARM))
        + (pi === 'upperarm' ? 0.3 : 0) - (pi === 'clavicle' ? 0.8 : 0) - (pi === 'twist' ? 1 : 0)
        + (pe === 'forearm' ? 0.3 : 0) - (pe === 'twist' ? 1 : 0);
      if (score > bestScore) { bestScore = score; si = i; ei = e; ratio = a / b; }
    }
  }
  if (si < 0) {
    const only = chain.slice(0, wristK).reverse().find((j) => isRoleJoint(take, j));
    return {
      shoulder: only === undefined ? null : { joint: only, confidence: 0.5, evidence: `'${nm(only)}' is the only joint above the wrist.` },
      elbow: null,
      wrist,
    };
  }
  const sj = chain[si]!, ej = chain[ei]!;
  const fit = Math.abs(Math.log(ratio / UPPERARM_OVER_FOREARM)) < 0.4 ? 1 : 0.7;
  const skipped = chain.slice(0, si).filter((j) => isRoleJoint(take, j)).map((j) => `'${nm(j)}'`);
  return {
    shoulder: {
      joint: sj,
      confidence: nameConfidence(nm(sj), ['upperarm']) * fit,
      evidence: `'${nm(sj)}' starts the upper arm${skipped.length ? ` (${skipped.join(', ')} before it is taken as clavicle)` : ''}.`,
    },
    elbow: {
      joint: ej,
      confidence: nameConfidence(nm(ej), ['forearm']) * fit,
      evidence: `'${nm(ej)}' splits shoulder-to-wrist with an upper-arm/forearm ratio of ${ratio.toFixed(2)} (adults about 1.27).`,
    },
    wrist,
  };
}

/** Returns the spine pick: the trunk joint between pelvis and thorax nearest their midpoint. */
export function pickSpine(take: Take, rest: Float64Array, pelvis: number, thorax: number, scale: number): Pick | null {
  const eps = 0.01 * scale;
  const between: number[] = [];
  for (let j = take.joints[thorax]!.parent; j >= 0 && !isAncestor(take, j, pelvis); j = take.joints[j]!.parent) between.push(j);
  let lca = thorax;
  while (lca >= 0 && !isAncestor(take, lca, pelvis)) lca = take.joints[lca]!.parent;
  if (lca >= 0 && lca !== pelvis && lca !== thorax) between.push(lca);
  for (let j = take.joints[pelvis]!.parent; j >= 0 && j !== lca; j = take.joints[j]!.parent) between.push(j);
  let best: number = -1;
  let bestScore = Infinity;
  const full = dist(rest, pelvis, thorax);
  for (const j of between) {
    if (dist(rest, j, pelvis) <= eps || dist(rest, j, thorax) <= eps) continue;
    const off = Math.abs(dist(rest, j, pelvis) - dist(rest, j, thorax)) / (full || 1) - (partOfName(take.joints[j]!.name) === 'spine' ? 0.2 : 0);
    if (off < bestScore) { bestScore = off; best = j; }
  }
  if (best < 0) return null;
  const nmB = take.joints[best]!.name;
  return { joint: best, confidence: nameConfidence(nmB, ['spine']), evidence: `'${nmB}' is the trunk joint nearest midway between pelvis and thorax.` };
}

/** Returns the neck and head picks along the head chain. */
export function pickHead(take: Take, headChain: number[]): { neck: Pick | null; head: Pick | null } {
  const real = headChain.filter((j) => isRoleJoint(take, j));
  if (real.length === 0) return { neck: null, head: null };
  const nm = (j: number) => take.joints[j]!.name;
  const named = real.filter((j) => partOfName(nm(j)) === 'head');
  const headJ = named.length ? named[named.length - 1]! : real[real.length - 1]!;
  const head: Pick = { joint: headJ, confidence: nameConfidence(nm(headJ), ['head']), evidence: `'${nm(headJ)}' is the top joint of the chain above the thorax.` };
  const below = real.slice(0, real.indexOf(headJ));
  if (below.length === 0) return { neck: null, head };
  const neckJ = below.find((j) => partOfName(nm(j)) === 'neck') ?? below[0]!;
  return { neck: { joint: neckJ, confidence: nameConfidence(nm(neckJ), ['neck']), evidence: `'${nm(neckJ)}' is the first joint of the chain from the thorax to the head.` }, head };
}
