// The in-memory form of a BVH take: the joint tree and one typed array of channel values.

/** One of the six BVH channel names. */
export type ChannelName = 'Xposition' | 'Yposition' | 'Zposition' | 'Xrotation' | 'Yrotation' | 'Zrotation';

export const CHANNEL_NAMES: readonly ChannelName[] = [
  'Xposition',
  'Yposition',
  'Zposition',
  'Xrotation',
  'Yrotation',
  'Zrotation',
];

/** A joint of the hierarchy; End Sites are joints too, flagged and without channels. */
export interface Joint {
  /** Name as written in the file; End Sites get `<parent>_End` unless the file names them. */
  name: string;
  /** Index of the parent joint in `Take.joints`, or -1 for a root. */
  parent: number;
  /** OFFSET from the parent, in file units. */
  offset: [number, number, number];
  /** Channel names in file order (the order values appear in each frame line). */
  channels: ChannelName[];
  /** Index of this joint's first channel within a frame's values. */
  channelStart: number;
  /** True for an `End Site` block. */
  endSite: boolean;
  /** 1-based source line of the joint's keyword, for messages. */
  line: number;
}

/** A parsed take: joints in file (depth-first) order, so every parent precedes its children. */
export interface Take {
  joints: Joint[];
  /** Seconds per frame, > 0. */
  frameTime: number;
  /** Number of frames read from the data (not the header's claim). */
  frameCount: number;
  /** Channels per frame, the sum over joints. */
  channelCount: number;
  /** Channel values, frame-major: `values[f * channelCount + c]`. Rotations in degrees. */
  values: Float64Array;
  /** The `Frames:` figure of the header, kept for reporting. */
  headerFrameCount: number;
  /** Non-fatal findings of the parser, each a full sentence naming the place. */
  warnings: string[];
}

/** Returns the frames per second of a take. */
export function frameRate(take: Take): number {
  return 1 / take.frameTime;
}

/** Returns the indices of the joints that are not End Sites, in file order. */
export function realJointIndices(take: Take): number[] {
  const out: number[] = [];
  for (let j = 0; j < take.joints.length; j++) if (!take.joints[j]!.endSite) out.push(j);
  return out;
}

/** Returns the children of each joint as index lists. */
export function childLists(take: Take): number[][] {
  const kids: number[][] = take.joints.map(() => []);
  take.joints.forEach((j, i) => {
    if (j.parent >= 0) kids[j.parent]!.push(i);
  });
  return kids;
}

/** Returns the index of the joint with that exact name, or -1. */
export function jointIndex(take: Take, name: string): number {
  return take.joints.findIndex((j) => j.name === name);
}
