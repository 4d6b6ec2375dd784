// Independent reference for joint world positions: three.js's BVHLoader read through three's own scene
// graph (Bone, Object3D.updateMatrixWorld), with its tracks applied to the bones by hand per frame.
//
// Two known differences of that reference are corrected here, not copied into jointloom:
//  (a) BVHLoader adds the OFFSET to position-channel values (its position track holds value + offset);
//      with `correctOffset` (default on) the offset is subtracted again on the axes that have a
//      position channel, so position channels replace the OFFSET as BVH exporters mean them to.
//  (b) BVHLoader reads exactly the header's frame count: fewer frames when the header is short, and a
//      crash (it runs out of lines) when the header claims more. `withHeaderFrames` rewrites the
//      `Frames:` line so a caller can feed it the count of data lines.
// AnimationMixer is not used: its property binding cannot resolve bone names that contain ':'.
import { BVHLoader } from 'three/examples/jsm/loaders/BVHLoader.js';
import type { Bone, KeyframeTrack } from 'three';

export interface ThreeFkOptions {
  /** Subtract the OFFSET from position-track values on axes with a position channel (difference a). */
  correctOffset?: boolean;
  /** Only frames [from, to) of those three read. */
  from?: number;
  to?: number;
}

export interface ThreeFkResult {
  /** Bone names in three's order (depth-first, End Sites included and named "ENDSITE"). */
  names: string[];
  /** Parent bone index per bone, -1 for the root. */
  parents: Int32Array;
  /** Rest position of each bone relative to its parent (three's bone.position before animation). */
  restOffsets: Float64Array;
  /** Frames three read from the file (the header's count). */
  frames: number;
  /** World positions, [frames x bones x 3], float64 scene-graph arithmetic on float32 track values. */
  positions: Float64Array;
  /** console.error / console.warn messages BVHLoader printed while parsing. */
  messages: string[];
}

/** Per channel-bearing joint in file order: which of X, Y, Z carry a position channel. */
export function positionChannelAxes(text: string): boolean[][] {
  const motion = text.search(/^\s*MOTION\b/m);
  const head = motion >= 0 ? text.slice(0, motion) : text;
  const out: boolean[][] = [];
  for (const m of head.matchAll(/\bCHANNELS[ \t]+(\d+)([^\r\n]*)/g)) {
    const names = m[2]!.trim().split(/\s+/).slice(0, Number(m[1]));
    out.push(['X', 'Y', 'Z'].map((a) => names.includes(`${a}position`)));
  }
  return out;
}

/** Returns the text with its `Frames:` figure replaced by `frames`. */
export function withHeaderFrames(text: string, frames: number): string {
  return text.replace(/^(\s*Frames:\s*)\d+/m, `$1${frames}`);
}

/** Returns BVHLoader's skeleton and clip for the text, with any console messages it printed. */
export function loadWithThree(text: string): { bones: Bone[]; tracks: KeyframeTrack[]; messages: string[] } {
  const messages: string[] = [];
  const { error, warn } = console;
  console.error = (...a: unknown[]) => void messages.push(a.map(String).join(' '));
  console.warn = console.error;
  try {
    const { skeleton, clip } = new BVHLoader().parse(text);
    return { bones: skeleton.bones, tracks: clip.tracks, messages };
  } finally {
    console.error = error;
    console.warn = warn;
  }
}

/** Returns world positions of every bone for every frame three read, from three's scene graph. */
export function threeWorldPositions(text: string, options: ThreeFkOptions = {}): ThreeFkResult {
  const { bones, tracks, messages } = loadWithThree(text);
  return poseWithThree(bones, tracks, messages, options.correctOffset === false ? null : positionChannelAxes(text), options);
}

/** Returns world positions from an already loaded skeleton and clip (split out for the benchmark). */
export function poseWithThree(
  bones: Bone[],
  tracks: KeyframeTrack[],
  messages: string[],
  axes: boolean[][] | null,
  options: ThreeFkOptions = {},
): ThreeFkResult {
  const B = bones.length;
  const index = new Map<Bone, number>(bones.map((b, i) => [b, i]));
  const parents = new Int32Array(B);
  const restOffsets = new Float64Array(B * 3);
  bones.forEach((b, i) => {
    parents[i] = b.parent ? (index.get(b.parent as Bone) ?? -1) : -1;
    restOffsets[i * 3] = b.position.x;
    restOffsets[i * 3 + 1] = b.position.y;
    restOffsets[i * 3 + 2] = b.position.z;
  });
  // BVHLoader pushes a position then a quaternion track for every non-End-Site bone, in bone order.
  const animated: number[] = [];
  bones.forEach((b, i) => {
    if (!(b.name === 'ENDSITE' && b.children.length === 0)) animated.push(i);
  });
  if (tracks.length !== animated.length * 2) throw new Error(`three gave ${tracks.length} tracks for ${animated.length} animated bones`);
  const pos: Float32Array[] = [];
  const quat: Float32Array[] = [];
  animated.forEach((bi, k) => {
    const pt = tracks[2 * k]!;
    const qt = tracks[2 * k + 1]!;
    if (pt.name !== `${bones[bi]!.name}.position` || qt.name !== `${bones[bi]!.name}.quaternion`) throw new Error(`track order differs at bone ${bones[bi]!.name}`);
    pos.push(pt.values as Float32Array);
    quat.push(qt.values as Float32Array);
  });
  // Difference (a): the offset three added, per animated bone and axis (0 where no position channel).
  const sub = new Float64Array(animated.length * 3);
  if (axes) {
    if (axes.length !== animated.length) throw new Error(`${axes.length} CHANNELS lines for ${animated.length} animated bones`);
    animated.forEach((bi, k) => {
      for (let a = 0; a < 3; a++) if (axes[k]![a]) sub[k * 3 + a] = restOffsets[bi * 3 + a]!;
    });
  }
  const readFrames = tracks.length > 0 ? tracks[0]!.times.length : 0;
  const from = Math.max(0, options.from ?? 0);
  const to = Math.min(readFrames, options.to ?? readFrames);
  const n = Math.max(0, to - from);
  const positions = new Float64Array(n * B * 3);
  const root = bones[0]!;
  for (let f = 0; f < n; f++) {
    const k = from + f;
    for (let a = 0; a < animated.length; a++) {
      const bone = bones[animated[a]!]!;
      const p = pos[a]!, q = quat[a]!;
      bone.position.set(p[k * 3]! - sub[a * 3]!, p[k * 3 + 1]! - sub[a * 3 + 1]!, p[k * 3 + 2]! - sub[a * 3 + 2]!);
      bone.quaternion.set(q[k * 4]!, q[k * 4 + 1]!, q[k * 4 + 2]!, q[k * 4 + 3]!);
    }
    root.updateMatrixWorld(true);
    const o = f * B * 3;
    for (let b = 0; b < B; b++) {
      const e = bones[b]!.matrixWorld.elements;
      positions[o + b * 3] = e[12]!;
      positions[o + b * 3 + 1] = e[13]!;
      positions[o + b * 3 + 2] = e[14]!;
    }
  }
  return { names: bones.map((b) => b.name), parents, restOffsets, frames: readFrames, positions, messages };
}
