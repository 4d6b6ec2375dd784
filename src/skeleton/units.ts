// Length units (m, cm, mm, inches) and the up axis (Y or Z) of a take, each with its evidence.
// Units: the skeleton must come out human-sized (leg length and standing height in the adult ranges).
// Up: the head stays above the feet through the motion; the rest pose is checked against it.
import type { Take } from '../bvh/take.js';
import { planFk, poseFrame, restPose } from './fk.js';
import { inferRoles, type RoleMap } from './roles.js';
import { snapAxis } from './structure.js';

/** A length unit a BVH file may be written in. */
export type Units = 'm' | 'cm' | 'mm' | 'in';
/** The vertical axis of a take. */
export type UpAxis = 'y' | 'z';

export const METRES_PER_UNIT: Readonly<Record<Units, number>> = { m: 1, cm: 0.01, mm: 0.001, in: 0.0254 };
const UNIT_WORDS: Readonly<Record<Units, string>> = { m: 'metres', cm: 'cm', mm: 'mm', in: 'inches' };

/** Adult hip-to-ankle leg length in metres (0.45-0.53 of a 1.4-2.1 m stature; common practice). */
export const ADULT_LEG_M: readonly [number, number] = [0.6, 1.1];
/** Adult standing height in metres (common practice). */
export const ADULT_STATURE_M: readonly [number, number] = [1.4, 2.1];
/** Leg length as a fraction of standing height in adults (common practice). */
export const LEG_OVER_STATURE: readonly [number, number] = [0.45, 0.53];

/** One reading of the file's numbers in one unit. */
export interface UnitCandidate {
  units: Units;
  legMetres: number | null;
  statureMetres: number | null;
  /** 1 adult-sized, 0.25 child-sized, near 0 not human. */
  plausibility: number;
}

export interface UnitsDetection {
  units: Units;
  metresPerUnit: number;
  confidence: number;
  evidence: string[];
  /** Every unit tried, most plausible first. */
  candidates: UnitCandidate[];
}

export interface UpDetection {
  up: UpAxis;
  /** +1 when the head lies along +up from the feet, −1 for a take written upside down (−Y or −Z up). */
  sign: 1 | -1;
  /** The detected up direction as a signed unit axis in file coordinates (may be X, see evidence). */
  vector: [number, number, number];
  confidence: number;
  evidence: string[];
  /** Up of the rest pose (signed unit axis), which differs from `vector` when the root turns the rig upright. */
  restVector: [number, number, number] | null;
}

const AXES = ['X', 'Y', 'Z'] as const;

/** Returns how human a length is: 1 in the adult range, 0.5 child-sized, 0.5 just above adult, else 0.02. */
function band(metres: number, adult: readonly [number, number]): number {
  if (metres >= adult[0] && metres <= adult[1]) return 1;
  if (metres >= adult[0] * 0.45 && metres < adult[0]) return 0.5;
  if (metres > adult[1] && metres <= adult[1] * 1.1) return 0.5;
  return 0.02;
}

/** Returns the joints of the subtree of `j` (itself included). */
function subtree(take: Take, j: number): number[] {
  const out = [j];
  for (let k = j + 1; k < take.joints.length; k++) if (out.includes(take.joints[k]!.parent)) out.push(k);
  return out;
}

function jointList(roles: RoleMap, names: readonly (keyof RoleMap)[]): number[] {
  return names.map((r) => roles[r]?.joint ?? -1).filter((j) => j >= 0);
}

/** Returns the take's length units from leg length and standing height in the rest pose, with evidence. */
export function detectUnits(take: Take, roles: RoleMap = inferRoles(take).roles): UnitsDetection {
  const rest = restPose(take);
  const d = (a: number, b: number) => Math.hypot(rest[a * 3]! - rest[b * 3]!, rest[a * 3 + 1]! - rest[b * 3 + 1]!, rest[a * 3 + 2]! - rest[b * 3 + 2]!);
  const legs: number[] = [];
  for (const s of ['l', 'r'] as const) {
    const hip = roles[`${s}_hip`], knee = roles[`${s}_knee`], ankle = roles[`${s}_ankle`];
    if (!hip || !ankle) continue;
    legs.push(knee ? d(hip.joint, knee.joint) + d(knee.joint, ankle.joint) : d(hip.joint, ankle.joint));
  }
  const leg = legs.length ? legs.reduce((a, b) => a + b, 0) / legs.length : null;
  // Standing height: from the lowest point of the feet to the highest point of the head, along feet→head.
  let stature: number | null = null;
  let headTopSeen = false;
  const feet = jointList(roles, ['l_ankle', 'r_ankle', 'l_toe', 'r_toe']);
  const headRole = roles.head ?? roles.neck;
  if (feet.length && headRole) {
    const foot = feet.flatMap((j) => subtree(take, j));
    const head = subtree(take, headRole.joint);
    headTopSeen = head.length > 1;
    const u = snapAxis([0, 1, 2].map((a) => rest[headRole.joint * 3 + a]! - feet.reduce((s, j) => s + rest[j * 3 + a]!, 0) / feet.length));
    const ul = Math.hypot(u[0]!, u[1]!, u[2]!);
    if (ul > 0) {
      const h = (j: number) => (rest[j * 3]! * u[0]! + rest[j * 3 + 1]! * u[1]! + rest[j * 3 + 2]! * u[2]!) / ul;
      stature = Math.max(...head.map(h)) - Math.min(...foot.map(h));
    }
  }
  const evidence: string[] = [];
  if (leg === null && stature === null) {
    return { units: 'cm', metresPerUnit: 0.01, confidence: 0.1, evidence: ['No legs or head were found, so units cannot be judged; cm is assumed. Pass --units to set them.'], candidates: [] };
  }
  const candidates: UnitCandidate[] = (Object.keys(METRES_PER_UNIT) as Units[]).map((units) => {
    const k = METRES_PER_UNIT[units];
    const legM = leg === null ? null : leg * k;
    const statM = stature === null ? null : stature * k;
    const p = (legM === null ? 1 : band(legM, ADULT_LEG_M)) * (statM === null ? 1 : band(statM, ADULT_STATURE_M));
    return { units, legMetres: legM, statureMetres: statM, plausibility: p };
  });
  candidates.sort((a, b) => b.plausibility - a.plausibility);
  const best = candidates[0]!;
  const second = candidates[1]!;
  const word = UNIT_WORDS[best.units];
  if (leg !== null)
    evidence.push(`Leg length (hip to ankle) is ${leg.toFixed(1)} file units, which is ${best.legMetres!.toFixed(3)} m if ${word} (adult range ${ADULT_LEG_M[0]}-${ADULT_LEG_M[1]} m).`);
  if (stature !== null)
    evidence.push(`Standing height is about ${stature.toFixed(1)} file units${headTopSeen ? '' : ' (to the head joint, below the top of the head)'}, which is ${best.statureMetres!.toFixed(2)} m if ${word} (adult range ${ADULT_STATURE_M[0]}-${ADULT_STATURE_M[1]} m).`);
  let confidence = best.plausibility >= 1 ? 0.95 : best.plausibility >= 0.25 ? 0.6 : 0.2;
  if (leg !== null && stature !== null && stature > 0) {
    const ratio = leg / stature;
    if (ratio >= LEG_OVER_STATURE[0] && ratio <= LEG_OVER_STATURE[1]) evidence.push(`Leg length is ${ratio.toFixed(3)} of standing height, within the usual ${LEG_OVER_STATURE[0]}-${LEG_OVER_STATURE[1]}.`);
    else {
      evidence.push(`Leg length is ${ratio.toFixed(3)} of standing height, outside the usual ${LEG_OVER_STATURE[0]}-${LEG_OVER_STATURE[1]}; the joints chosen as hip, ankle or head may be off.`);
      confidence *= 0.8;
    }
  }
  if (second.plausibility >= 0.2) {
    const describe = (c: UnitCandidate) =>
      `${UNIT_WORDS[c.units]} gives ${c.plausibility >= 1 ? 'an adult' : 'a child or an unusually sized adult'} (${c.legMetres !== null ? `leg ${c.legMetres.toFixed(2)} m` : ''}${c.legMetres !== null && c.statureMetres !== null ? ', ' : ''}${c.statureMetres !== null ? `height ${c.statureMetres.toFixed(2)} m` : ''})`;
    evidence.push(`Two units fit: ${describe(best)}, ${describe(second)}; ${word} was chosen as the likelier reading. Pass --units to override.`);
    confidence *= best.plausibility / (best.plausibility + second.plausibility);
  } else if (best.plausibility < 0.25) {
    evidence.push('No unit puts the skeleton in the human range; pass --units to set them.');
  } else if (best.plausibility < 1) {
    evidence.push(`No unit gives an adult size; ${word} is the likeliest reading and gives a child or an unusually sized adult. Pass --units if this is wrong.`);
  }
  return { units: best.units, metresPerUnit: METRES_PER_UNIT[best.units], confidence: Math.round(confidence * 100) / 100, evidence, candidates };
}

/** Returns the signed unit axis nearest to v and the cosine between them. */
function nearestAxis(v: ArrayLike<number>): { axis: 0 | 1 | 2; sign: 1 | -1; cos: number } {
  let a: 0 | 1 | 2 = 0;
  for (const k of [1, 2] as const) if (Math.abs(v[k]!) > Math.abs(v[a]!)) a = k;
  const len = Math.hypot(v[0]!, v[1]!, v[2]!);
  return { axis: a, sign: v[a]! < 0 ? -1 : 1, cos: len > 0 ? Math.abs(v[a]!) / len : 0 };
}

function axisText(axis: number, sign: number): string {
  return `${sign < 0 ? '−' : '+'}${AXES[axis]}`;
}

/** Most frames sampled for up detection (evenly spaced); enough for a stable mean. */
const MAX_UP_FRAMES = 240;

/**
 * Returns the take's up axis: where the head lies from the feet over the motion (sampled frames of
 * `positions`, frames x joints x 3, when given, else computed), checked against the rest pose.
 */
export function detectUp(take: Take, positions?: Float64Array, roles: RoleMap = inferRoles(take).roles): UpDetection {
  const J = take.joints.length;
  const top = (roles.head ?? roles.neck ?? roles.thorax)?.joint ?? -1;
  const feet = jointList(roles, ['l_ankle', 'r_ankle', 'l_toe', 'r_toe']);
  const evidence: string[] = [];
  const rest = restPose(take);
  const vecAt = (p: ArrayLike<number>, base: number, out: number[]) => {
    for (let a = 0; a < 3; a++) {
      let m = 0;
      for (const j of feet) m += p[base + j * 3 + a]!;
      out[a] = p[base + top * 3 + a]! - m / feet.length;
    }
  };
  if (top < 0 || feet.length === 0) {
    return { up: 'y', sign: 1, vector: [0, 1, 0], confidence: 0.1, restVector: null, evidence: ['No head or feet were found, so the up axis cannot be judged; +Y is assumed. Pass --up to set it.'] };
  }
  const restV = [0, 0, 0];
  vecAt(rest, 0, restV);
  const restAx = nearestAxis(restV);
  const restVector = [0, 0, 0] as [number, number, number];
  restVector[restAx.axis] = restAx.sign;
  let mean = restV;
  let consistency = 1;
  const n = take.frameCount;
  const frames = Math.min(n, MAX_UP_FRAMES);
  let floorRange = 0;
  if (frames > 0) {
    const plan = planFk(take);
    const pos = new Float64Array(J * 3);
    const rot = new Float64Array(J * 9);
    const v = [0, 0, 0];
    // Returns the positions array and base offset of sample s (computing the pose when not given).
    const sample = (s: number): [ArrayLike<number>, number] => {
      const f = frames === 1 ? 0 : Math.round((s * (n - 1)) / (frames - 1));
      if (positions) return [positions, f * J * 3];
      poseFrame(plan, take.values, f, pos, rot);
      return [pos, 0];
    };
    const sum = [0, 0, 0];
    for (let s = 0; s < frames; s++) {
      const [p, base] = sample(s);
      vecAt(p, base, v);
      for (let a = 0; a < 3; a++) sum[a]! += v[a]!;
    }
    mean = sum.map((x) => x / frames);
    const ax = nearestAxis(mean);
    let agree = 0;
    let lo = Infinity, hi = -Infinity;
    for (let s = 0; s < frames; s++) {
      const [p, base] = sample(s);
      vecAt(p, base, v);
      const a = nearestAxis(v);
      if (a.axis === ax.axis && a.sign === ax.sign) agree++;
      let low = Infinity;
      for (const j of feet) low = Math.min(low, ax.sign * p[base + j * 3 + ax.axis]!);
      lo = Math.min(lo, low);
      hi = Math.max(hi, low);
    }
    consistency = agree / frames;
    floorRange = hi - lo;
  }
  const ax = nearestAxis(mean);
  const others = [0, 1, 2].filter((a) => a !== ax.axis).map((a) => `${Math.abs(mean[a]!).toFixed(1)} along ${AXES[a]}`).join(', ');
  const where = frames > 0 ? `Over ${frames} sampled frames the head stays on average` : 'In the rest pose the head lies';
  evidence.push(`${where} ${Math.abs(mean[ax.axis]!).toFixed(1)} units from the feet along ${axisText(ax.axis, ax.sign)} (${others}).`);
  if (frames > 1) {
    const height = Math.abs(mean[ax.axis]!);
    evidence.push(`The lower foot's height along ${axisText(ax.axis, ax.sign)} varies by ${floorRange.toFixed(1)} units over the take (${height > 0 ? ((100 * floorRange) / height).toFixed(0) : '?'}% of the head-to-feet height), as feet resting on a floor would make it.`);
  }
  if (frames > 0 && (restAx.axis !== ax.axis || restAx.sign !== ax.sign))
    evidence.push(`The rest pose stands along ${axisText(restAx.axis, restAx.sign)} but the motion stands along ${axisText(ax.axis, ax.sign)}: the root's rotation turns the skeleton upright, so the motion's axis is used.`);
  let confidence = ax.cos * consistency;
  let up: UpAxis = ax.axis === 2 ? 'z' : 'y';
  let sign = ax.sign;
  if (ax.sign < 0) evidence.push(`The head lies towards ${axisText(ax.axis, -1)}: the take is upside down or written with ${axisText(ax.axis, -1)} up; it is treated as ${AXES[ax.axis]}-up with sign −1.`);
  if (ax.axis === 0) {
    up = Math.abs(mean[2]!) > Math.abs(mean[1]!) ? 'z' : 'y';
    sign = mean[up === 'z' ? 2 : 1]! < 0 ? -1 : 1;
    confidence = Math.min(confidence, 0.2);
    evidence.push(`X appears to be vertical, which jointloom does not support; ${up.toUpperCase()} is reported with low confidence. Re-export the take Y-up or Z-up.`);
  }
  const vector = [0, 0, 0] as [number, number, number];
  vector[ax.axis] = ax.sign;
  return { up, sign, vector, confidence: Math.round(confidence * 100) / 100, evidence, restVector };
}
