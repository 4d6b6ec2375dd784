// The forecast overlay in a real browser (Debian's Chromium through playwright-core), with a tiny model
// trained here: the toggle and the F key draw the forecast (the canvas pixels change), it follows
// playback over its second, the side panel shows its errors, and a page without a model says the
// forecast is off. Screenshot: test-artifacts/view/viewer-forecast.png.
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { loadModel } from '../../src/model/modelfile.js';
import { importTake } from '../../src/skeleton/import.js';
import { buildViewData } from '../../src/view/data.js';
import { ForecastService } from '../../src/view/forecast.js';
import { startViewServer, type ViewServer } from '../../src/view/server.js';
import { haveChromium, launchChromium } from '../browser/chromium.js';
import { buildViewerTemp } from './build-viewer.js';
import { waitForViewer, type PageGlobals, type Probe } from './page.js';
import { writeTinyModel } from './tiny-model.js';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const TAKE = join(ROOT, 'demo-takes', 'S01-1-walk.bvh');
const SHOTS = join(ROOT, 'test-artifacts', 'view');

describe.skipIf(!haveChromium())('forecast overlay in Chromium', () => {
  const work = mkdtempSync(join(tmpdir(), 'jointloom-view-fc-'));
  let server: ViewServer;
  let bare: ViewServer;
  let browser: Awaited<ReturnType<typeof launchChromium>>;
  let removeBuild = () => {};
  let page: Page;
  const pageErrors: string[] = [];

  beforeAll(async () => {
    const built = await buildViewerTemp();
    removeBuild = built.remove;
    const modelPath = await writeTinyModel(work);
    const imported = importTake(TAKE);
    const data = buildViewData(imported, { version: '0.0.0-test', caution: 'Caution: research and quality aid, not a diagnostic device (test build).' });
    server = await startViewServer({ staticRoot: built.dir, data, port: 0, forecast: new ForecastService(imported, loadModel(modelPath), modelPath) });
    bare = await startViewServer({ staticRoot: built.dir, data, port: 0 });
    browser = await launchChromium();
    page = await browser.context.newPage();
    page.on('pageerror', (e) => pageErrors.push(e.message));
    mkdirSync(SHOTS, { recursive: true });
    await page.goto(server.url);
    await waitForViewer(page);
  }, 90_000);

  afterAll(async () => {
    await browser?.close();
    await server?.close();
    await bare?.close();
    removeBuild();
    rmSync(work, { recursive: true, force: true });
  });

  const probe = () => page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.probe()) as Promise<Probe>;
  const hook = () => page.evaluate(() => {
    const h = (globalThis as unknown as PageGlobals).__jointloomView;
    return { frame: h.frame, on: h.forecastOn, received: h.forecastsReceived, time: h.forecastTime, step: h.forecastStep, error: h.error };
  });

  test('F draws the forecast from the paused time: the pixels change and the panel shows its errors', async () => {
    expect((await hook()).error).toBeNull();
    expect(await page.textContent('#forecast-label')).toBe('forecast');
    // Display frame 500 of the 100 Hz take drawn at 50 Hz is 10.00 s (hand-computed).
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.seek(500));
    const before = await probe();
    await page.keyboard.press('f');
    await page.waitForFunction(() => (globalThis as unknown as PageGlobals).__jointloomView.forecastStep > 0, null, { timeout: 20_000 });
    const h = await hook();
    expect(h.on).toBe(true);
    expect(h.time).toBe(10);
    // At the start time itself (dt = 0) the first forecast step is drawn.
    expect(h.step).toBe(1);
    const after = await probe();
    expect(after.hash).not.toBe(before.hash);
    expect(after.nonBackground).toBeGreaterThan(before.nonBackground);
    const panel = await page.textContent('#forecast-panel');
    expect(panel).toContain('from 10.00 s');
    expect(panel).toContain('model error at 1 s, mm');
    expect(panel).toContain('stride mean at 1 s, mm');
    expect(await page.isVisible('#key-forecast')).toBe(true);
    expect(await page.screenshot({ path: join(SHOTS, 'viewer-forecast.png') })).toBeTruthy();
  });

  test('the overlay plays forward with the playback: at t + dt it draws step round(dt x 30)', async () => {
    // 15 display frames at 50 Hz are 0.3 s; round(0.3 x 30) = 9 (hand-computed).
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.seek(515));
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.probe());
    let h = await hook();
    expect(h.time).toBe(10);
    expect(h.step).toBe(9);
    // Paused at another time: after the short debounce the forecast is asked for again from 10.30 s.
    await page.waitForFunction(() => (globalThis as unknown as PageGlobals).__jointloomView.forecastTime === 10.3, null, { timeout: 20_000 });
    h = await hook();
    expect(h.step).toBe(1);
    await page.screenshot({ path: join(SHOTS, 'viewer-forecast-later.png') });
  });

  test('playing past the forecast second asks for a new one', async () => {
    const start = (await hook()).received;
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.setPlaying(true));
    await page.waitForFunction((n) => (globalThis as unknown as PageGlobals).__jointloomView.forecastsReceived > n && (globalThis as unknown as PageGlobals).__jointloomView.forecastTime! > 11.2, start, { timeout: 20_000 });
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.setPlaying(false));
  });

  test('F again hides the overlay and the pixels return', async () => {
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.seek(500));
    await page.waitForFunction(() => (globalThis as unknown as PageGlobals).__jointloomView.forecastTime === 10, null, { timeout: 20_000 });
    const on = await probe();
    await page.keyboard.press('f');
    const off = await probe();
    expect((await hook()).step).toBe(0);
    expect(off.hash).not.toBe(on.hash);
    expect(off.nonBackground).toBeLessThan(on.nonBackground);
    expect(await page.isVisible('#key-forecast')).toBe(false);
  });

  test('the help overlay lists F for the forecast', async () => {
    await page.keyboard.press('?');
    expect(await page.textContent('#help')).toContain('forecast overlay on / off');
    await page.keyboard.press('Escape');
  });

  test('without a model the page says the forecast is off and F does nothing', async () => {
    const p2 = await browser.context.newPage();
    p2.on('pageerror', (e) => pageErrors.push(e.message));
    await p2.goto(bare.url);
    await p2.waitForFunction(() => (globalThis as unknown as PageGlobals).__jointloomView?.ready === true, null, { timeout: 30_000 });
    expect(await p2.textContent('#forecast-label')).toBe('no model given: forecast off');
    expect(await p2.isDisabled('#forecast')).toBe(true);
    await p2.keyboard.press('f');
    expect(await p2.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.forecastOn)).toBe(false);
    expect(await p2.textContent('#forecast-panel')).toContain('no model given');
    await p2.close();
  });

  test('the pair lines switch from distance spread to static coupling and to the dynamic factors of the current window', async () => {
    await page.evaluate(() => { const v = (globalThis as unknown as PageGlobals).__jointloomView; v.setForecast(false); v.seek(500); v.setPairs(true); });
    const geometry = await probe();
    expect(await page.textContent('#legend-title')).toContain('pair distance spread');
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.setHeat('static'));
    const stat = await probe();
    // Same frame, same lines: only their colours changed.
    expect(stat.hash).not.toBe(geometry.hash);
    expect(await page.textContent('#legend-title')).toContain('static coupling');
    expect(await page.textContent('#legend-note')).toContain('coupling model factors');
    await page.keyboard.press('g');
    const dyn = await probe();
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.heatSource)).toBe('dynamic');
    expect(dyn.hash).not.toBe(stat.hash);
    // Display frame 500 at 50 Hz is 10.00 s; windows end every 0.2 s from 2.00 s, so window (10 − 2) / 0.2 = 40 (hand-computed).
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.heatWindow)).toBe(40);
    expect(await page.textContent('#legend-title')).toContain('dynamic factors at 10.00 s');
    await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.seek(600));
    await probe();
    // 12.00 s: window (12 − 2) / 0.2 = 50.
    expect(await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.heatWindow)).toBe(50);
    await page.screenshot({ path: join(SHOTS, 'viewer-factor-heat.png') });
    // The tiny model holds no normative figures, and the panel says so.
    expect(await page.textContent('#asymmetry-panel')).toContain('no normative coupling figures');
  });

  test('no page error was raised', () => {
    expect(pageErrors).toEqual([]);
  });
});
