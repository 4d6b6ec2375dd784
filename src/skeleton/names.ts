// Reading joint names: namespace prefixes, word splitting, left/right tokens and body-part words.
// Names are the second source of joint roles; topology and the rest pose come first.

/** A body side as role names spell it. */
export type Side = 'l' | 'r';

/** Body-part words a joint name may carry. */
export type PartWord =
  | 'pelvis'
  | 'spine'
  | 'neck'
  | 'head'
  | 'thigh'
  | 'shank'
  | 'foot'
  | 'toe'
  | 'clavicle'
  | 'upperarm'
  | 'forearm'
  | 'hand'
  | 'twist'
  | 'end';

/** Returns the name without namespace prefixes such as `rig:`, `Char01:` or DAG paths `a|b|`. */
export function stripNamespace(name: string): string {
  const i = Math.max(name.lastIndexOf(':'), name.lastIndexOf('|'));
  return i >= 0 ? name.slice(i + 1) : name;
}

/**
 * Returns the lower-case words of a joint name: namespace dropped, split at `_ . - : |` and spaces,
 * at camel-case humps ("LeftUpLeg" → left up leg, "LThigh" → l thigh) and between letters and digits.
 */
export function nameTokens(name: string): string[] {
  return stripNamespace(name)
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .replace(/([A-Z]+)([A-Z][a-z])/g, '$1 $2')
    .replace(/([A-Za-z])(\d)/g, '$1 $2')
    .replace(/(\d)([A-Za-z])/g, '$1 $2')
    .split(/[\s_.\-:|]+/)
    .filter((t) => t.length > 0)
    .map((t) => t.toLowerCase());
}

const LEFT_TOKENS = new Set(['l', 'left', 'lft', 'lt', 'lf']);
const RIGHT_TOKENS = new Set(['r', 'right', 'rgt', 'rt', 'rght']);

/** Returns the side a single word names: whole tokens (l, left, lft, lt) or a left/right prefix or suffix. */
function tokenSide(t: string): Side | null {
  if (LEFT_TOKENS.has(t)) return 'l';
  if (RIGHT_TOKENS.has(t)) return 'r';
  if (t.length > 5 && (t.startsWith('left') || t.endsWith('left'))) return 'l';
  if (t.length > 6 && (t.startsWith('right') || t.endsWith('right'))) return 'r';
  return null;
}

/** Returns the side a joint name states, or null when it states none or both. */
export function sideOfName(name: string): Side | null {
  let l = 0;
  let r = 0;
  for (const t of nameTokens(name)) {
    const s = tokenSide(t);
    if (s === 'l') l++;
    else if (s === 'r') r++;
  }
  if (l > 0 && r === 0) return 'l';
  if (r > 0 && l === 0) return 'r';
  return null;
}

/** Returns the words of a name with the side tokens removed and the rest joined ("LeftUpLeg" → "upleg"). */
export function partStem(name: string): string {
  return nameTokens(name)
    .filter((t) => tokenSide(t) === null)
    .map((t) => t.replace(/^(left|right)|(left|right)$/, ''))
    .join('');
}

// Ordered most specific first: "forearm" must be read before "arm", "upleg" before "leg".
const PART_PATTERNS: ReadonlyArray<readonly [PartWord, RegExp]> = [
  ['end', /(end|tip|nub|effector|site)$/],
  ['twist', /(twist|roll)/],
  ['clavicle', /(clavicle|clav|collar|scapula)/],
  ['forearm', /(forearm|lowerarm|lowarm|elbow|ulna|radius)/],
  ['upperarm', /(upperarm|uparm|humerus|shoulder|arm)/],
  ['hand', /(hand|wrist|palm)/],
  ['thigh', /(upleg|upperleg|thigh|femur|hipjoint|^hip$)/],
  ['shank', /(lowerleg|lowleg|shin|knee|calf|tibia|shank|leg)/],
  ['toe', /(toe|ball)/],
  ['foot', /(foot|ankle|talus)/],
  ['pelvis', /(hips|pelvis|root)/],
  ['neck', /neck/],
  ['head', /(head|skull)/],
  ['spine', /(spine|back|torso|chest|lumbar|abdomen|waist|thorax|belly)/],
];

/** Returns the body-part word a joint name carries (the most specific one), or null. */
export function partOfName(name: string): PartWord | null {
  const stem = partStem(name);
  if (stem.length === 0) return null;
  for (const [part, re] of PART_PATTERNS) if (re.test(stem)) return part;
  return null;
}

/** Returns true when the name marks a twist/roll helper joint. */
export function isTwistName(name: string): boolean {
  return /(twist|roll)/.test(partStem(name));
}

/** Returns true when the name marks an end effector written as a JOINT ("HandEnd", "Toe_Nub", "HeadTip"). */
export function isEndName(name: string): boolean {
  return PART_PATTERNS[0]![1].test(partStem(name));
}
