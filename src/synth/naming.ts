// Joint naming styles of the walker's skeleton: the same joints spelled five ways, so importers meet variety.

/** The walker's joints in file (depth-first) order; End Sites are added by the skeleton builder. */
export const JOINT_KEYS = [
  'pelvis',
  'l_hip', 'l_knee', 'l_ankle', 'l_toe',
  'r_hip', 'r_knee', 'r_ankle', 'r_toe',
  'spine', 'chest', 'neck', 'head',
  'l_clavicle', 'l_shoulder', 'l_elbow', 'l_wrist',
  'r_clavicle', 'r_shoulder', 'r_elbow', 'r_wrist',
] as const;

export type JointKey = (typeof JOINT_KEYS)[number];

/** Naming styles: `camel` LeftKnee, `snake` l_knee, `dotted` knee.L, `prefixed` loom:Knee_Lt, `caps` L_KNEE. */
export type NamingStyle = 'camel' | 'snake' | 'dotted' | 'prefixed' | 'caps';

export const NAMING_STYLES: readonly NamingStyle[] = ['camel', 'snake', 'dotted', 'prefixed', 'caps'];

const WORDS: Record<string, string> = {
  pelvis: 'pelvis', spine: 'spine', chest: 'chest', neck: 'neck', head: 'head',
  hip: 'hip', knee: 'knee', ankle: 'ankle', toe: 'toe',
  clavicle: 'clavicle', shoulder: 'shoulder', elbow: 'elbow', wrist: 'wrist',
};

const cap = (w: string) => w.charAt(0).toUpperCase() + w.slice(1);

/** Returns the name of a joint in a naming style. */
export function jointName(key: JointKey, style: NamingStyle): string {
  const sided = key.startsWith('l_') || key.startsWith('r_');
  const left = key.startsWith('l_');
  const word = WORDS[sided ? key.slice(2) : key]!;
  switch (style) {
    case 'camel':
      return sided ? `${left ? 'Left' : 'Right'}${cap(word)}` : cap(word);
    case 'snake':
      return sided ? `${left ? 'l' : 'r'}_${word}` : word;
    case 'dotted':
      return sided ? `${word}.${left ? 'L' : 'R'}` : word;
    case 'prefixed':
      return `loom:${cap(word)}${sided ? (left ? '_Lt' : '_Rt') : ''}`;
    case 'caps':
      return sided ? `${left ? 'L' : 'R'}_${word.toUpperCase()}` : word.toUpperCase();
  }
}

/** Returns the map from joint key to name for a naming style. */
export function jointNames(style: NamingStyle): Record<JointKey, string> {
  const out = {} as Record<JointKey, string>;
  for (const k of JOINT_KEYS) out[k] = jointName(k, style);
  return out;
}
