// The viewer in a real browser (Debian's Chromium through playwright-core): a demo take loads, the
// canvas draws the skeleton in both side colours, scrubbing changes the frame, the pair lines and their
// legend appear, the help overlay lists the keys, and nothing is fetched from any other origin.
// Screenshots go to test-artifacts/view/.
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { importTake } from '../../src/skeleton/import.js';
import { buildViewData } from '../../src/view/data.js';
import { startViewServer, type ViewServer } from '../../src/view/server.js';
import { haveChromium, launchChromium } from '../browser/chromium.js';
import { buildViewerTemp } from './build-viewer.js';
import { waitForViewer, type PageGlobals, type Probe } from './page.js';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const TAKE = join(ROOT, 'demo-takes', 'S01-1-walk.bvh');
const SHOTS = join(ROOT, 'test-artifacts', 'view');

describe.skipIf(!haveChromium())('viewer in Chromium', () => {
  let server: ViewServer;
  let browser: Awaited<ReturnType<typeof launchChromium>>;
  let removeBuild = () => {};
  let page: Page;
  const foreign: string[] = [];
  const pageErrors: string[] = [];

  beforeAll(async () => {
    const built = await buildViewerTemp();
    removeBuild = built.remove;
    const data = buildViewData(importTake(TAKE), { version: '0.0.0-test', caution: 'Caution: research and quality aid, not a diagnostic device (test build).' });
    server = await startViewServer({ staticRoot: built.dir, data, port: 0 });
    browser = await launchChromium();
    page = await browser.context.newPage();
    page.on('request', (r) => {
      if (!r.url().startsWith(server.url) && !r.url().startsWith('data:')) foreign.push(r.url());
    });
    page.on('pageerror', (e) => pageErrors.push(e.message));
    mkdirSync(SHOTS, { recursive: true });
    await page.goto(server.url);
    await waitForViewer(page);
  }, 90_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
    removeBuild();
  });

  const probe = () => page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.probe()) as Promise<Probe>;

  test('the page loads the demo take with its summary and the caution', async () => {
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.error)).toBeNull();
    expect(await page.textContent('#take-name')).toBe('S01-1-walk.bvh');
    // The take's header: 2200 frames at 100 Hz (frame time 0.01 s), drawn at 50 Hz (stride 2, hand-computed).
    const facts = await page.textContent('#take-facts');
    expect(facts).toContain('100 Hz · 2200 frames · 22.0 s');
    expect(facts).toContain('drawn at 50 Hz');
    expect(await page.textContent('#caution')).toContain('not a diagnostic device');
    expect(await page.textContent('#summary')).toContain('cadence steps/min');
    expect(await page.locator('#summary table tr').count()).toBe(10);
    expect(pageErrors).toEqual([]);
    await page.screenshot({ path: join(SHOTS, 'viewer-start.png') });
  });

  test('the canvas draws non-background pixels in both side colours', async () => {
    const p = await probe();
    expect(p.width).toBeGreaterThan(300);
    // Grid and skeleton: well over 1 % of the canvas differs from the background.
    expect(p.nonBackground).toBeGreaterThan(0.01 * p.width * p.height);
    // The reports' colours: teal #0f7b74 for left, burnt orange #b3541e for right (the project's own).
    expect(p.left).toBeGreaterThan(50);
    expect(p.right).toBeGreaterThan(50);
  });

  test('scrubbing moves to the chosen frame and the drawing changes', async () => {
    const before = await probe();
    await page.evaluate(() => {
      const s = (globalThis as unknown as PageGlobals).document.getElementById('scrub')!;
      s.value = '500';
      s.dispatchEvent(new (globalThis as unknown as PageGlobals).Event('input', { bubbles: true }));
    });
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.frame)).toBe(500);
    // Display frame 500 at stride 2 is recorded frame 1000, at 1000 / 100 Hz = 10.00 s (hand-computed).
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.sourceFrame)).toBe(1000);
    expect(await page.textContent('#readout')).toMatch(/^10\.00 s · frame\s+1000 \/ 2199$/);
    const after = await probe();
    expect(after.hash).not.toBe(before.hash);
    expect(after.left).toBeGreaterThan(50);
    await page.screenshot({ path: join(SHOTS, 'viewer-frame-1000.png') });
  });

  test('frame steps and the keyboard move one display frame', async () => {
    await page.keyboard.press('ArrowRight');
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.frame)).toBe(501);
    await page.keyboard.press('ArrowLeft');
    await page.keyboard.press('ArrowLeft');
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.frame)).toBe(499);
    await page.keyboard.press('Home');
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.frame)).toBe(0);
    await page.keyboard.press('n');
    // The first initial contact of the take, in display frames (server events / stride 2).
    const ic = await page.evaluate(async () => {
      const ev = (await (await (globalThis as unknown as PageGlobals).fetch('./api/events')).json()) as { events: { kind: string; frame: number }[] };
      return Math.min(...ev.events.filter((e) => e.kind === 'initial_contact').map((e) => Math.round(e.frame / 2)));
    });
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.frame)).toBe(ic);
  });

  test('play advances the frame; pause holds it', async () => {
    await page.keyboard.press(' ');
    const start = await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.frame);
    await page.waitForTimeout(600);
    await page.keyboard.press(' ');
    const stopped = await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.frame);
    expect(stopped).toBeGreaterThan(start);
    await page.waitForTimeout(200);
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.frame)).toBe(stopped);
  });

  test('pair lines and the viridis legend appear with P and change the drawing', async () => {
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.seek(500));
    const before = await probe();
    expect(await page.isVisible('#legend')).toBe(false);
    await page.keyboard.press('p');
    expect(await page.isVisible('#legend')).toBe(true);
    expect(await page.textContent('#legend-title')).toBe('pair distance spread (cm)');
    expect(await page.textContent('#legend-note')).toContain('not the coupling model');
    const after = await probe();
    expect(after.hash).not.toBe(before.hash);
    expect(after.nonBackground).toBeGreaterThan(before.nonBackground);
    // C(17, 2) = 136 pairs of the 17 roles; "left with right" keeps 7 x 7 = 49 (hand-computed).
    expect(await page.textContent('#legend-count')).toBe('136 of 136 pairs shown');
    await page.screenshot({ path: join(SHOTS, 'viewer-pairs.png') });
    await page.selectOption('#pair-filter', 'across');
    expect(await page.textContent('#legend-count')).toBe('49 of 136 pairs shown');
    const across = await probe();
    expect(across.hash).not.toBe(after.hash);
    await page.screenshot({ path: join(SHOTS, 'viewer-pairs-across.png') });
    await page.selectOption('#pair-filter', 'all');
    await page.locator('#pair-filter').blur();
    await page.keyboard.press('p');
    expect(await page.isVisible('#legend')).toBe(false);
  });

  test('the help overlay lists the shortcuts', async () => {
    await page.keyboard.press('?');
    expect(await page.isVisible('#help')).toBe(true);
    const text = await page.textContent('#help');
    for (const t of ['play / pause', 'one frame back', 'next gait event', 'pair lines']) expect(text).toContain(t);
    await page.screenshot({ path: join(SHOTS, 'viewer-help.png') });
    await page.keyboard.press('Escape');
    expect(await page.isVisible('#help')).toBe(false);
  });

  test('gait events are drawn on the timeline strip', async () => {
    const marks = await page.evaluate(() => {
      const c = (globalThis as unknown as PageGlobals).document.getElementById('events-strip')!;
      const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
      let teal = 0, orange = 0;
      for (let i = 0; i < d.length; i += 4) {
        if (Math.abs(d[i]! - 0x0f) + Math.abs(d[i + 1]! - 0x7b) + Math.abs(d[i + 2]! - 0x74) < 40) teal++;
        if (Math.abs(d[i]! - 0xb3) + Math.abs(d[i + 1]! - 0x54) + Math.abs(d[i + 2]! - 0x1e) < 40) orange++;
      }
      return { teal, orange };
    });
    expect(marks.teal).toBeGreaterThan(20);
    expect(marks.orange).toBeGreaterThan(20);
  });

  test('nothing was requested from another origin and no page error was raised', () => {
    expect(foreign).toEqual([]);
    expect(pageErrors).toEqual([]);
  });
});
