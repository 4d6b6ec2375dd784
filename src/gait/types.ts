// Shared shapes of gait results: events, walking passes, strides.

export type SideName = 'left' | 'right';
export type EventKind = 'initial_contact' | 'toe_off';

/** One gait event as detected (or read back from a reviewed events file). */
export interface GaitEvent {
  side: SideName;
  kind: EventKind;
  /** Frame index of the event (the coordinate method's frame after bias correction, rounded). */
  frame: number;
  /** Event time in seconds, frame / fps (may carry a sub-frame bias correction). */
  time: number;
  /** Frame the foot-velocity cross-check found, or null where it found none nearby. */
  checkFrame: number | null;
  /** True when the two methods disagree by more than 2 frames. */
  disagree: boolean;
  /** Index of the walking pass the event belongs to. */
  pass: number;
  /** False for the first and last steps of a pass (not steady state) when those are excluded. */
  steady: boolean;
  /** Where the event came from. */
  source: 'detected' | 'file';
}

/** A stretch of steady walking in one direction (turns, standing and non-walking left out). */
export interface WalkingPass {
  index: number;
  startFrame: number;
  /** Exclusive end frame. */
  endFrame: number;
  /** Mean walking direction of the pass, unit, horizontal (canonical frame, Z up). */
  direction: [number, number, number];
}

/** What event detection returns. */
export interface EventDetection {
  events: GaitEvent[];
  passes: WalkingPass[];
  /** Frames found not to be walking (standing, turning on the spot, other): [start, end) ranges. */
  excluded: { startFrame: number; endFrame: number; reason: 'standing' | 'turning' | 'not walking' }[];
  /** Per frame, the unit walking direction (horizontal), frames x 3; zero where not walking. */
  direction: Float64Array;
  warnings: string[];
}
