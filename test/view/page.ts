// Types of what the viewer page exposes, for node-side code that drives it (the root tsconfig has no
// DOM library): callbacks passed to page.evaluate cast globalThis to PageGlobals.

export type { ProbeResult as Probe, ViewHook } from '../../viewer/src/hook.js';
import type { ViewHook } from '../../viewer/src/hook.js';

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
