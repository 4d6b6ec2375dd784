// Segment lengths of the walker from body height: Drillis and Contini's ratios as tabulated in
// Winter, "Biomechanics and Motor Control of Human Movement" (4th ed., 2009, fig. 4.1) — recalled from memory.

/** Lengths of the walker's segments in metres (internal frame: Y up, Z forward, X to the subject's left). */
export interface SegmentLengths {
  height: number;
  /** Floor to ankle joint, 0.039 H. */
  ankleHeight: number;
  /** Knee to ankle, 0.285 H - 0.039 H = 0.246 H. */
  shank: number;
  /** Hip (greater trochanter level) to knee, 0.530 H - 0.285 H = 0.245 H. */
  thigh: number;
  /** Half the distance between the hip joint centres: half of 0.191 H hip breadth, halved again (own choice). */
  hipHalfWidth: number;
  /** Hip joint centres below the pelvis root (own choice, 0.02 H). */
  hipBelowRoot: number;
  /** Horizontal ankle-to-toe-joint (MTP) distance; with heel and toe it makes the 0.152 H foot length. */
  ankleToToeJoint: number;
  /** Toe joint to toe tip (own split of the foot length, 0.035 H). */
  toe: number;
  /** Heel point behind the ankle: 0.3 x ankleToToeJoint (the analysis side's virtual-heel rule). */
  heelBehindAnkle: number;
  /** Root to lumbar spine joint, spine to thorax, thorax to neck base, neck to head joint, head joint to crown. */
  rootToSpine: number;
  spineToChest: number;
  chestToNeck: number;
  neckToHead: number;
  headToCrown: number;
  /** Thorax to the clavicle root: up and out. */
  clavicleUp: number;
  clavicleOut: number;
  /** Clavicle root to shoulder joint: out and up; the shoulders end 0.259 H apart at 0.818 H height. */
  shoulderOut: number;
  shoulderUp: number;
  /** Upper arm 0.186 H, forearm 0.146 H, hand 0.108 H. */
  upperArm: number;
  forearm: number;
  hand: number;
}

/** Returns the walker's segment lengths in metres for a body height in metres. */
export function segmentLengths(height: number): SegmentLengths {
  const H = height;
  const foot = 0.152 * H;
  const toe = 0.035 * H;
  const ankleToToeJoint = (foot - toe) / 1.3; // heel (0.3 a) + a + toe = foot length
  const rootHeight = 0.55 * H; // hip joints at 0.530 H, root 0.02 H above them
  const chest = rootHeight + 0.04 * H + 0.12 * H; // 0.71 H
  return {
    height: H,
    ankleHeight: 0.039 * H,
    shank: 0.246 * H,
    thigh: 0.245 * H,
    hipHalfWidth: 0.25 * 0.191 * H,
    hipBelowRoot: 0.02 * H,
    ankleToToeJoint,
    toe,
    heelBehindAnkle: 0.3 * ankleToToeJoint,
    rootToSpine: 0.04 * H,
    spineToChest: 0.12 * H,
    chestToNeck: 0.828 * H - chest, // neck base just above shoulder height (0.818 H)
    neckToHead: 0.042 * H, // head joint near chin level (0.870 H)
    headToCrown: 0.13 * H, // crown at 1.000 H
    clavicleUp: 0.09 * H,
    clavicleOut: 0.02 * H,
    shoulderOut: 0.259 * H * 0.5 - 0.02 * H,
    shoulderUp: 0.818 * H - (chest + 0.09 * H),
    upperArm: 0.186 * H,
    forearm: 0.146 * H,
    hand: 0.108 * H,
  };
}

/** Returns the height of the pelvis root above the floor in the rest pose, in metres. */
export function restRootHeight(seg: SegmentLengths): number {
  return seg.ankleHeight + seg.shank + seg.thigh + seg.hipBelowRoot;
}
