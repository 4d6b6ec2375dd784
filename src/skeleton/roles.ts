// Joint roles (pelvis, trunk, head, left/right leg and arm joints) from topology and rest pose first,
// names second, with a safety check on sides: names and geometry must agree or a warning is raised.
//
// Side rule: with u the rest pose's up and f the facing direction (the feet's toe-minus-ankle, horizontal
// part), the subject's left is l = u × f. In a right-handed Y-up frame facing +Z that gives l = +X;
// in a Z-up frame facing +Y it gives l = −X.
import type { Take } from '../bvh/take.js';
import { analyseStructure, snapAxis, type LimbPair } from './structure.js';
import { pickArm, pickHead, pickLeg, pickSpine, type Pick } from './limbs.js';
import { sideOfName } from './names.js';

export const ROLE_NAMES = [
  'pelvis', 'spine', 'thorax', 'neck', 'head',
  'l_hip', 'l_knee', 'l_ankle', 'l_toe', 'l_shoulder', 'l_elbow', 'l_wrist',
  'r_hip', 'r_knee', 'r_ankle', 'r_toe', 'r_shoulder', 'r_elbow', 'r_wrist',
] as const;

/** A canonical joint role. */
export type RoleName = (typeof ROLE_NAMES)[number];

/** The joint that plays a role, how sure the choice is (0-1) and one sentence of why. */
export interface RoleAssignment {
  joint: number;
  name: string;
  confidence: number;
  evidence: string;
}

/** Every role with its joint, or null where the skeleton lacks it. */
export type RoleMap = Record<RoleName, RoleAssignment | null>;

/** Which source decides left and right when names and geometry disagree. */
export type SidePolicy = 'names' | 'geometry';

/** Roles fixed by a role-map file: joint index per role (null: the role is absent on purpose). */
export interface RoleOverrides {
  file: string;
  roles: Partial<Record<RoleName, number | null>>;
}

export interface RoleOptions {
  /** Who wins when names and geometry disagree; default: names when they are unambiguous. */
  sides?: SidePolicy;
  /** Roles fixed by a role-map file; they replace the inferred ones. */
  overrides?: RoleOverrides;
  /** Up direction of the rest pose, used only when the skeleton's own (feet to head) cannot be found. */
  up?: ArrayLike<number>;
}

/** How one limb pair got its sides. */
export interface SideDecision {
  limb: 'legs' | 'arms';
  /** What decided: both agreeing, one of them alone, the policy in a conflict, or nothing (a guess). */
  source: 'names+geometry' | 'names' | 'geometry' | 'guess';
  /** True when names and geometry disagree (a mirrored export or mislabelled rig). */
  conflict: boolean;
}

/** The role map and everything said on the way. */
export interface RoleDetection {
  roles: RoleMap;
  warnings: string[];
  evidence: string[];
  /** Rest-pose up (unit), feet towards head, or null. */
  restUp: [number, number, number] | null;
  /** Rest-pose facing (unit, horizontal), or null. */
  forward: [number, number, number] | null;
  sides: SideDecision[];
}

type V3 = [number, number, number];

/** Returns a role map with every role null. */
export function emptyRoleMap(): RoleMap {
  return Object.fromEntries(ROLE_NAMES.map((r) => [r, null])) as RoleMap;
}

function cross(a: V3, b: V3): V3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

/** Returns the side the names of a chain's joints state, or null when they state none or both. */
function chainNameSide(take: Take, chain: number[]): 'l' | 'r' | null {
  let l = 0, r = 0;
  for (const j of chain) {
    if (take.joints[j]!.endSite) continue;
    const s = sideOfName(take.joints[j]!.name);
    if (s === 'l') l++;
    else if (s === 'r') r++;
  }
  return l > 0 && r === 0 ? 'l' : r > 0 && l === 0 ? 'r' : null;
}

/** Returns a vector's text as "(x, y, z)" with two decimals. */
function fmt(v: ArrayLike<number>): string {
  return `(${Array.from(v, (x) => (Math.abs(x) < 5e-3 ? 0 : x).toFixed(2)).join(', ')})`;
}

/**
 * Returns which chain of the pair is the subject's left (0 or 1), how that was decided and a sentence
 * for each chain; appends warnings for conflicts and missing evidence.
 */
function decideSides(
  take: Take, limb: 'legs' | 'arms', pair: LimbPair, anchors: [number, number], rest: Float64Array,
  left: V3 | null, scale: number, policy: SidePolicy | undefined, warnings: string[],
): { leftChain: 0 | 1; decision: SideDecision; confidence: number; why: [string, string] } {
  const n0 = chainNameSide(take, pair.chains[0]);
  const n1 = chainNameSide(take, pair.chains[1]);
  const namesLeft: 0 | 1 | null = n0 && n1 && n0 !== n1 ? (n0 === 'l' ? 0 : 1) : null;
  let geoLeft: 0 | 1 | null = null;
  let lat: [number, number] = [0, 0];
  if (left) {
    const b = pair.branch * 3;
    lat = anchors.map((j) => (rest[j * 3]! - rest[b]!) * left[0] + (rest[j * 3 + 1]! - rest[b + 1]!) * left[1] + (rest[j * 3 + 2]! - rest[b + 2]!) * left[2]) as [number, number];
    if (Math.abs(lat[0] - lat[1]) > 0.02 * scale) geoLeft = lat[0] > lat[1] ? 0 : 1;
  }
  const jn = (c: 0 | 1) => `'${take.joints[anchors[c]]!.name}'`;
  const what = limb === 'legs' ? 'leg' : 'arm';
  let leftChain: 0 | 1 = 0;
  let source: SideDecision['source'];
  let confidence: number;
  let conflict = false;
  if (namesLeft !== null && geoLeft !== null && namesLeft === geoLeft) {
    leftChain = namesLeft; source = 'names+geometry'; confidence = 0.95;
  } else if (namesLeft !== null && geoLeft !== null) {
    conflict = true;
    const followed = policy === 'geometry' ? 'geometry' : 'names';
    leftChain = followed === 'geometry' ? geoLeft : namesLeft;
    source = followed; confidence = 0.5;
    warnings.push(
      `Names and geometry disagree on the ${limb}: ${jn(namesLeft)} is named left but lies on the subject's right in the rest pose (lateral offset ${lat[namesLeft].toFixed(1)} units along the subject's left ${fmt(left!)}); this looks like a mirrored export. Sides follow the ${followed}${policy ? ' as asked' : ' (the default)'}; check the take before trusting left/right results.`,
    );
  } else if (geoLeft !== null) {
    leftChain = geoLeft; source = 'geometry'; confidence = 0.8;
    warnings.push(
      n0 && n0 === n1
        ? `Both ${limb} are named ${n0 === 'l' ? 'left' : 'right'}; their sides come from the rest-pose geometry alone.`
        : `The ${what} names carry no clear left/right token; the ${limb}' sides come from the rest-pose geometry alone.`,
    );
  } else if (namesLeft !== null) {
    leftChain = namesLeft; source = 'names'; confidence = 0.7;
    warnings.push(`The ${limb}' sides come from their names alone; the rest pose gives no facing direction to check them against.`);
  } else {
    source = 'guess'; confidence = 0.3;
    warnings.push(`Left and right ${limb} could not be told apart by names or geometry; l_ and r_ are a guess.`);
  }
  const say = (c: 0 | 1) => {
    const side = c === leftChain ? 'left' : 'right';
    if (source === 'names+geometry') return `It is ${side} by its name and by its place in the rest pose.`;
    if (source === 'guess') return `Its side (${side}) is a guess.`;
    if (conflict) return `It is ${side} by its ${source}, against the ${source === 'names' ? 'geometry' : 'name'}.`;
    return `It is ${side} by its ${source === 'names' ? 'name' : 'place in the rest pose'}.`;
  };
  return { leftChain, decision: { limb, source, conflict }, confidence, why: [say(0), say(1)] };
}

/** Returns the assignment of `pick` with confidences multiplied in and extra evidence appended. */
function assign(take: Take, pick: Pick | null, factor: number, extra = ''): RoleAssignment | null {
  if (!pick) return null;
  return {
    joint: pick.joint,
    name: take.joints[pick.joint]!.name,
    confidence: Math.round(Math.min(1, pick.confidence * factor) * 100) / 100,
    evidence: extra ? `${pick.evidence} ${extra}` : pick.evidence,
  };
}

/** Returns the role map of a take with warnings and evidence; see the side rule at the top of the file. */
export function inferRoles(take: Take, options: RoleOptions = {}): RoleDetection {
  const st = analyseStructure(take);
  const { rest, scale } = st;
  const roles = emptyRoleMap();
  const warnings = [...st.warnings];
  const evidence = [...st.evidence];
  const upRaw = st.restUp ?? (options.up ? ([options.up[0]!, options.up[1]!, options.up[2]!] as V3) : null);
  const up = upRaw ? snapAxis(upRaw) : null;
  if (up) evidence.push(`In the rest pose the head lies along ${fmt(up)} from the feet.`);
  let forward: V3 | null = null;
  const sides: SideDecision[] = [];
  if (st.legs && up) {
    const legs = st.legs;
    const picks = legs.chains.map((c) => pickLeg(take, rest, c, legs.branch, up, scale));
    const f: V3 = [0, 0, 0];
    for (const p of picks) {
      if (!p.ankle || !p.toe) continue;
      for (let a = 0; a < 3; a++) f[a] += rest[p.toe.joint * 3 + a]! - rest[p.ankle.joint * 3 + a]!;
    }
    const h = f[0] * up[0] + f[1] * up[1] + f[2] * up[2];
    const fh: V3 = [f[0] - h * up[0], f[1] - h * up[1], f[2] - h * up[2]];
    const fl = Math.hypot(...fh);
    let left: V3 | null = null;
    if (fl > 0.01 * scale) {
      forward = snapAxis([fh[0] / fl, fh[1] / fl, fh[2] / fl]);
      left = cross(up, forward);
      evidence.push(`The feet point along ${fmt(forward)} at rest, so the subject's left is up × forward = ${fmt(left)}.`);
    } else warnings.push('The rest pose shows no foot direction, so sides cannot be checked against geometry.');
    const structConf = Math.max(0.5, 1 - legs.mirrorError);
    const anchors = picks.map((p, c) => p.hip?.joint ?? legs.chains[c]![0]!) as [number, number];
    const sd = decideSides(take, 'legs', legs, anchors, rest, left, scale, options.sides, warnings);
    sides.push(sd.decision);
    for (const c of [0, 1] as const) {
      const s = c === sd.leftChain ? 'l' : 'r';
      const p = picks[c]!;
      const k = structConf * sd.confidence / 0.95;
      roles[`${s}_hip`] = assign(take, p.hip, k, sd.why[c]);
      roles[`${s}_knee`] = assign(take, p.knee, k);
      roles[`${s}_ankle`] = assign(take, p.ankle, k);
      roles[`${s}_toe`] = assign(take, p.toe, k);
    }
    roles.pelvis = {
      joint: legs.branch,
      name: take.joints[legs.branch]!.name,
      confidence: Math.round(structConf * 0.95 * 100) / 100,
      evidence: `The two legs branch from '${take.joints[legs.branch]!.name}'.`,
    };
    if (st.arms) {
      const arms = st.arms;
      const ap = arms.chains.map((c) => pickArm(take, rest, st.children, c, scale));
      const aConf = Math.max(0.5, 1 - arms.mirrorError);
      const aAnch = ap.map((p, c) => p.shoulder?.joint ?? arms.chains[c]![0]!) as [number, number];
      const sa = decideSides(take, 'arms', arms, aAnch, rest, left, scale, options.sides, warnings);
      sides.push(sa.decision);
      for (const c of [0, 1] as const) {
        const s = c === sa.leftChain ? 'l' : 'r';
        const k = aConf * sa.confidence / 0.95;
        roles[`${s}_shoulder`] = assign(take, ap[c]!.shoulder, k, sa.why[c]);
        roles[`${s}_elbow`] = assign(take, ap[c]!.elbow, k);
        roles[`${s}_wrist`] = assign(take, ap[c]!.wrist, k);
      }
      roles.thorax = {
        joint: arms.branch,
        name: take.joints[arms.branch]!.name,
        confidence: Math.round(aConf * 0.95 * 100) / 100,
        evidence: `The two arms branch from '${take.joints[arms.branch]!.name}'.`,
      };
      roles.spine = assign(take, pickSpine(take, rest, legs.branch, arms.branch, scale), 1);
      if (st.headChain) {
        const hp = pickHead(take, st.headChain);
        roles.neck = assign(take, hp.neck, 1);
        roles.head = assign(take, hp.head, 1);
      }
    }
  } else if (st.legs) warnings.push('The rest pose gives no up direction; leg joints could not be placed.');
  applyOverrides(take, roles, options.overrides, warnings);
  const missing = ROLE_NAMES.filter((r) => roles[r] === null);
  if (missing.length) warnings.push(`No joint was found for: ${missing.join(', ')}.`);
  const seen = new Map<number, RoleName>();
  for (const r of ROLE_NAMES) {
    const a = roles[r];
    if (!a) continue;
    const other = seen.get(a.joint);
    if (other) warnings.push(`Joint '${a.name}' plays two roles, ${other} and ${r}.`);
    else seen.set(a.joint, r);
  }
  return { roles, warnings, evidence, restUp: up, forward, sides };
}

/** Writes the roles fixed by a role-map file into `roles`. */
function applyOverrides(take: Take, roles: RoleMap, overrides: RoleOverrides | undefined, warnings: string[]): void {
  if (!overrides) return;
  for (const r of ROLE_NAMES) {
    if (!(r in overrides.roles)) continue;
    const j = overrides.roles[r];
    const before = roles[r];
    if (j === null || j === undefined) {
      roles[r] = null;
      continue;
    }
    const name = take.joints[j]!.name;
    if (before && before.joint !== j) warnings.push(`The role-map file '${overrides.file}' sets ${r} to '${name}' where the skeleton suggested '${before.name}'.`);
    roles[r] = { joint: j, name, confidence: 1, evidence: `Set by the role-map file '${overrides.file}'.` };
  }
}
