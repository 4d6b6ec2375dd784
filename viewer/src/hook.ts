// The shapes the page exposes as window.__jointloomView, shared by the app and the node-side tests and
// bench that drive it (plain types, no DOM or three.js, so the root tsconfig can read them too).

/** Pixel counts of the last drawn frame, read back right after drawing it (probe.ts). */
export interface ProbeResult {
  width: number;
  height: number;
  nonBackground: number;
  left: number;
  right: number;
  hash: number;
}

/** What the page exposes for tests and the bench (read-only state and two helpers). */
export interface ViewHook {
  ready: boolean;
  error: string | null;
  frame: number;
  sourceFrame: number;
  rendered: number;
  firstFrameMs: number | null;
  playing: boolean;
  /** Forecast overlay: on, forecasts received, the start time and step drawn (null and 0 when none). */
  forecastOn: boolean;
  forecastsReceived: number;
  forecastTime: number | null;
  forecastStep: number;
  /** Pair-line colour source and the dynamic heat's current window (-1 before one is drawn). */
  heatSource: string;
  heatWindow: number;
  seek(d: number): void;
  setHeat(source: string): void;
  setPairs(on: boolean): void;
  setForecast(on: boolean): void;
  setPlaying(on: boolean): void;
  probe(): ProbeResult;
}
