// Benchmark section: the viewer on the bench's long take in headless Chromium (WebGL through SwiftShader
// on this machine): the time from starting `jointloom view` to the page's first drawn frame, and the
// frame rate while playing, counted over 2 s: skeleton alone, with the pair lines, and with the dynamic
// factor heat and the forecast overlay (the shipped model).
// Run alone: npx tsx test/bench/viewer.ts [--quick]
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { launchChromium, haveChromium } from '../browser/chromium.js';
import { buildViewerTemp } from '../view/build-viewer.js';
import type { PageGlobals } from '../view/page.js';
import type { BenchInput } from './take-source.js';
import { ratio, type Row, type Section } from './report.js';

const MAIN = fileURLToPath(new URL('../../src/cli/main.ts', import.meta.url));

/** Returns the started `jointloom view` child, its URL and the milliseconds until it printed it. */
function startView(take: string, viewerDir: string): Promise<{ url: string; ms: number; stop: () => Promise<number | null> }> {
  const t0 = performance.now();
  const child = spawn(process.execPath, ['--import', 'tsx', MAIN, 'view', take, '--port', '0'], {
    env: { ...process.env, JOINTLOOM_VIEWER_DIR: viewerDir },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '', err = '';
  child.stderr.on('data', (c: Buffer) => (err += c.toString()));
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  return new Promise((resolve, reject) => {
    child.stdout.on('data', (c: Buffer) => {
      out += c.toString();
      const m = /jointloom view: (http:\/\/\S+)/.exec(out);
      if (m) resolve({ url: m[1]!, ms: performance.now() - t0, stop: () => (child.kill('SIGINT'), exited) });
    });
    void exited.then((code) => reject(new Error(`jointloom view exited (${code}) before printing its URL: ${err.trim()}`)));
  });
}

/** Returns the viewer section: start-up to first frame, and frames per 2 s of playback. */
export async function runViewer(options: { input: BenchInput }): Promise<Section> {
  const title = 'viewer: jointloom view in headless Chromium';
  if (!haveChromium()) return { title, rows: [], ratios: [], notes: ['chromium not installed; section skipped'] };
  const built = await buildViewerTemp();
  const browser = await launchChromium();
  const rows: Row[] = [];
  const notes: string[] = [];
  try {
    const page = await browser.context.newPage();
    await page.goto('about:blank');
    const t0 = performance.now();
    const view = await startView(options.input.path, built.dir);
    await page.goto(view.url);
    await page.waitForFunction(() => (globalThis as unknown as PageGlobals).__jointloomView?.firstFrameMs != null || (globalThis as unknown as PageGlobals).__jointloomView?.error != null, null, { timeout: 120_000, polling: 10 });
    const tFirst = performance.now() - t0;
    const error = await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.error);
    if (error) throw new Error(`the page reported: ${error}`);
    const facts = await page.evaluate(() => ({ joints: (globalThis as unknown as PageGlobals).document.getElementById('take-facts')?.textContent ?? '' }));
    rows.push({ name: 'view start to URL printed', value: view.ms / 1000, unit: 's', note: 'tsx start, import of the take, gait analysis, pair measure, display positions' });
    rows.push({ name: 'view start to first frame', value: tFirst / 1000, unit: 's', note: 'browser already open; includes page load and the positions download' });
    const fps = async (pairs: boolean) => {
      await page.evaluate((on) => {
        const box = (globalThis as unknown as PageGlobals).document.getElementById('pairs')!;
        if (box.checked !== on) box.click();
        (globalThis as unknown as PageGlobals).__jointloomView.setPlaying(true);
      }, pairs);
      await page.waitForTimeout(300);
      const n0 = await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.rendered);
      const w0 = performance.now();
      await page.waitForTimeout(2000);
      const n1 = await page.evaluate(() => (globalThis as unknown as PageGlobals).__jointloomView.rendered);
      const w1 = performance.now();
      return ((n1 - n0) * 1000) / (w1 - w0);
    };
    const plain = await fps(false);
    const withPairs = await fps(true);
    // The factor heat at the current window and the forecast overlay on top (the shipped model).
    const hasModel = await page.evaluate(async () => ((await (await (globalThis as unknown as PageGlobals).fetch('./api/take')).json()) as { features: { factors: boolean } }).features.factors);
    await page.evaluate(() => { const v = (globalThis as unknown as PageGlobals).__jointloomView; v.setHeat('dynamic'); v.setForecast(true); });
    const withHeat = hasModel ? await fps(true) : NaN;
    rows.push({ name: 'frame rate, skeleton', value: plain, unit: 'frames/s', note: 'frames drawn over 2 s of playback, 1280x900 page' });
    rows.push({ name: 'frame rate, skeleton + pair lines', value: withPairs, unit: 'frames/s', note: 'pair distance spread' });
    rows.push({ name: 'frame rate, dynamic heat + forecast', value: withHeat, unit: 'frames/s', note: '136 factor-heat lines following the time, forecast overlay on (shipped model)' });
    notes.push(`take: ${facts.joints}`);
    notes.push('WebGL renders through SwiftShader (no GPU) on this machine; a GPU browser is far faster.');
    const code = await view.stop();
    if (code !== 0) notes.push(`jointloom view exited with ${code} on SIGINT`);
    return {
      title,
      rows,
      ratios: [
        ratio('frame rate with heat and forecast (frames/s)', withHeat, '>=', 30, 'common practice: 30 frames/s reads as smooth'),
        ratio('view start to first frame (s)', tFirst / 1000, '<=', 10),
      ],
      notes,
    };
  } finally {
    await browser.close();
    built.remove();
  }
}

const isMain = process.argv[1] !== undefined && import.meta.url === new URL(`file://${process.argv[1]}`).href;
if (isMain) {
  const { buildBenchInput } = await import('./take-source.js');
  const { formatSections } = await import('./report.js');
  const { rmSync } = await import('node:fs');
  const { dirname } = await import('node:path');
  const input = await buildBenchInput(process.argv.includes('--quick') ? 60 : 600);
  try {
    process.stdout.write(formatSections([await runViewer({ input })]) + '\n');
  } finally {
    rmSync(dirname(input.path), { recursive: true, force: true });
  }
}
