// Types of what the viewer page exposes, for node-side code that drives it (the root tsconfig has no
// DOM library): callbacks passed to page.evaluate cast globalThis to PageGlobals.

/** Pixel counts of the last drawn frame, read back by the page (viewer/src/probe.ts). */
export interface Probe {
  width: number;
  height: number;
  nonBackground: number;
  left: number;
  right: number;
  hash: number;
}

/** The page's window.__jointloomView. */
export interface ViewHook {
  ready: boolean;
  error: string | null;
  frame: number;
  sourceFrame: number;
  rendered: number;
  firstFrameMs: number | null;
  playing: boolean;
  forecastOn: boolean;
  forecastsReceived: number;
  forecastTime: number | null;
  forecastStep: number;
  heatSource: string;
  heatWindow: number;
  seek(d: number): void;
  setForecast(on: boolean): void;
  setHeat(source: string): void;
  setPairs(on: boolean): void;
  setPlaying(on: boolean): void;
  probe(): Probe;
}

/** The few DOM members the tests touch. */
export interface PageElement {
  value: string;
  checked: boolean;
  width: number;
  height: number;
  textContent: string | null;
  click(): void;
  dispatchEvent(e: unknown): boolean;
  getContext(kind: '2d'): { getImageData(x: number, y: number, w: number, h: number): { data: Uint8ClampedArray } } | null;
}

/** globalThis inside the page, as far as the tests use it. */
export interface PageGlobals {
  __jointloomView: ViewHook;
  document: { getElementById(id: string): PageElement | null };
  Event: new (type: string, init?: { bubbles?: boolean }) => unknown;
  fetch(url: string): Promise<{ json(): Promise<unknown> }>;
}

/** Waits until the viewer page says it is ready or has failed (at most 30 s). */
export async function waitForViewer(page: { waitForFunction(fn: () => boolean, arg: null, options: { timeout: number }): Promise<unknown> }): Promise<void> {
  await page.waitForFunction(() => (globalThis as unknown as PageGlobals).__jointloomView?.ready === true || (globalThis as unknown as PageGlobals).__jointloomView?.error !== null, null, { timeout: 30_000 });
}
