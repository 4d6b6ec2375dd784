// The JSON shapes of the viewer's API (`jointloom view`), shared by the server and the browser app.
// The forecast (/api/forecast?t=) and factor (/api/factors) endpoints answer when a model was given;
// `features` tells the page which of them the server offers.

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
  /** The loaded model's timing, when a model was given (else null). */
  forecast: ViewForecastInfo | null;
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

/** What the page needs to know of the model before asking for a forecast. */
export interface ViewForecastInfo {
  /** Model file name (no folder). */
  model: string;
  /** Model rate (steps per second), observed and forecast seconds. */
  rate: number;
  observeS: number;
  horizonS: number;
  /** Earliest and latest start time a forecast may be asked for, seconds. */
  firstS: number;
  lastS: number;
  /** The model's node roles and the node index pairs drawn as bones (as in every forecast). */
  nodes: string[];
  bones: [number, number][];
}

/** Scores of a forecast against the recorded future: mean per-joint error in mm per method and horizon. */
export interface ViewForecastScores {
  horizons_s: number[];
  /** Method name (model, stride_mean, ...) to one error per horizon, mm. */
  mpjpe_mm: Record<string, number[]>;
  coverage_90: number | null;
  surprise: number | null;
}

/** GET /api/forecast?t=SECONDS&samples=N: the model's forecast from the last observed step at t. */
export interface ViewForecast {
  format: 'jointloom-view-forecast';
  version: 1;
  /** Time of the last observed step used: the t asked for, rounded to the model's 30 Hz grid. */
  time_s: number;
  endStep: number;
  rate: number;
  /** Forecast steps (step k, k = 1..steps, lies k / rate after time_s). */
  steps: number;
  /** The model's node roles, and per node the take's joints it stands on (two equal indices, or a midpoint's two). */
  nodes: string[];
  nodeJoints: [number, number][];
  /** Node index pairs to draw as bones. */
  bones: [number, number][];
  frame: string;
  /** Mean positions: steps x nodes x 3, flat, display frame (metres, Y up). */
  mean: number[];
  /** Samples, each steps x nodes x 3 flat, display frame. */
  samples: number[][];
  /** Null when the take ends before the forecast second does. */
  scores: ViewForecastScores | null;
}

/** One unordered node pair of the factor heat, drawn between the given display joints. */
export interface ViewFactorPair {
  a: number;
  b: number;
  /** "roleA–roleB" (the pair filter reads the roles' sides). */
  label: string;
  /** Information in the pair's static factors: KL of their posterior from the N(0, 1) prior, nats, mean of both orders. */
  static: number;
  /** Size of the pair's dynamic factors (Euclidean norm of the posterior mean, mean of both orders) per window. */
  dynamic: number[];
}

/** GET /api/factors: the coupling model's pair factors over the take (only when a model was given). */
export interface ViewFactors {
  format: 'jointloom-view-factors';
  version: 1;
  /** Time (seconds) of each window's last observed step; a frame shows the latest window at or before it. */
  times: number[];
  pairs: ViewFactorPair[];
  staticRange: [number, number];
  dynamicRange: [number, number];
  /**
   * The coupling asymmetry against the model's normative cohort, or null when the model holds none;
   * pattern: the side-only class that fits best ("a shorter stance"), null when a joint class does.
   */
  asymmetry: { summary: string; side: string; joint: string; pattern: string | null; ranked: { pair: string; mirror: string; score: number; ci_low: number; ci_high: number; side: string }[] } | null;
}
