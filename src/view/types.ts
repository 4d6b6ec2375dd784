// The JSON shapes of the viewer's API (`jointloom view`), shared by the server and the browser app.
// Forecast and factor endpoints join later under /api/forecast?t= and /api/factors; `features` tells
// the page which of them the server offers.

/** Which side of the body a joint belongs to, for colour and line style. */
export type ViewSide = 'left' | 'right' | 'centre';

/** One joint of the displayed skeleton (End Sites included, in file order). */
export interface ViewJoint {
  name: string;
  /** Index of the parent joint, -1 for a root. */
  parent: number;
  side: ViewSide;
  /** Canonical role (l_knee, pelvis, ...) or null. */
  role: string | null;
  endSite: boolean;
}

/** GET /api/take: what the take is and how the display positions are laid out. */
export interface ViewTake {
  format: 'jointloom-view-take';
  version: 1;
  file: string;
  /** Frame rate and frame count of the recording. */
  sourceFps: number;
  sourceFrames: number;
  /** Every `stride`-th recorded frame is displayed (decimated for display only). */
  stride: number;
  displayFps: number;
  displayFrames: number;
  durationS: number;
  joints: ViewJoint[];
  /** Joint index of the pelvis role (camera follow), or 0. */
  pelvis: number;
  /** Lowest joint height over the take, metres (the floor the grid is drawn on). */
  floorY: number;
  units: string;
  up: string;
  /** GET /api/positions: displayFrames x joints x 3 float32, little-endian, metres, Y up, right-handed. */
  positions: { path: string; byteLength: number; layout: string };
  features: { gait: boolean; pairs: boolean; forecast: boolean; factors: boolean };
  warnings: string[];
  caution: string;
}

/** One gait event on the timeline. */
export interface ViewEvent {
  side: 'left' | 'right';
  kind: 'initial_contact' | 'toe_off';
  /** Recorded frame and time in seconds. */
  frame: number;
  time: number;
  steady: boolean;
  disagree: boolean;
}

/** GET /api/events. */
export interface ViewEvents {
  events: ViewEvent[];
  passes: { index: number; startS: number; endS: number }[];
  /** Why there are no events, when there are none. */
  note: string | null;
}

/** GET /api/gait: the gait result (the JSON of `jointloom gait`) or why there is none. */
export type ViewGait = { available: true; result: Record<string, unknown> } | { available: false; reason: string };

/** One joint pair of the pair-line layer. */
export interface ViewPair {
  a: number;
  b: number;
  label: string;
  value: number;
}

/** GET /api/pairs: a per-pair measure that exists without the model, with its name and unit. */
export interface ViewPairs {
  measure: string;
  description: string;
  unit: string;
  min: number;
  max: number;
  pairs: ViewPair[];
}
