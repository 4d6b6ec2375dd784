// The gait command as a user runs it: JSON fields, CSV and HTML outputs, reviewed events read back,
// a non-walking take refused with one line, the shipped synthetic reference used by default (and --no-norms),
// and the HTML report rendered in headless Chromium with its reference bands and profile chart.
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeBvh } from '../../src/bvh/write.js';
import { synthesizeTake } from '../../src/synth/index.js';
import { launchChromium, haveChromium } from '../browser/chromium.js';
import { runCli } from './run.js';

const tmp = mkdtempSync(join(tmpdir(), 'jointloom-gait-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const take = join(tmp, 'walk.bvh');
const html = join(tmp, 'report.html');

beforeAll(() => {
  writeFileSync(take, synthesizeTake({ seed: 7101, duration: 16, impairments: { right: { kneeRange: 0.6 } } }).bvhText);
});

describe('gait command', () => {
  let json: any;
  it('--json has the documented fields', async () => {
    const r = await runCli(['gait', take, '--json', '--html', html, '--csv', join(tmp, 'strides.csv'), '--events-out', join(tmp, 'events.csv')]);
    expect(r.code).toBe(0);
    json = JSON.parse(r.stdout);
    for (const k of ['cadence_steps_per_min', 'speed_m_per_s', 'strides', 'stance_pct', 'step_length_m', 'stride_time_s', 'knee_flexion_peak_swing_deg', 'symmetry_index_pct', 'events', 'warnings'])
      expect(json).toHaveProperty(k);
    for (const k of ['strides', 'stance_pct', 'step_length_m', 'stride_time_s', 'knee_flexion_peak_swing_deg']) {
      expect(json[k]).toHaveProperty('left');
      expect(json[k]).toHaveProperty('right');
    }
    expect(json.events.left.initial_contact.length).toBeGreaterThan(5);
    expect(json.events.right.toe_off.length).toBeGreaterThan(5);
    expect(json.symmetry_index_pct.knee_flexion_rom_deg).toBeLessThan(0);
    expect(json.curves.knee_flexion.left.mean).toHaveLength(101);
  });

  it('scores against the shipped synthetic reference by default, labelled so; --no-norms turns it off', async () => {
    const n = json.norms;
    expect(n.reference.label).toBe('synthetic reference, not clinical');
    expect(n.reference.synthetic).toBe(true);
    expect(n.reference.file).toMatch(/synthetic-norms\.json$/);
    expect(n.curves.knee_flexion.mean).toHaveLength(101);
    // The right knee keeps 60 % of its range: its variable score and the right profile score are the larger.
    expect(n.gvs.knee_flexion.right).toBeGreaterThan(n.gvs.knee_flexion.left);
    expect(n.gps.right).toBeGreaterThan(n.gps.left);
    expect(n.gdi.right.gdi).toBeLessThan(n.gdi.left.gdi);
    expect(n.gdi.note).toMatch(/no hip rotation/);
    const text = await runCli(['gait', take]);
    expect(text.stdout).toMatch(/synthetic reference, not clinical/);
    expect(text.stdout).toMatch(/gait profile score \d+\.\d+° .*MCID 1\.6°/);
    const off = JSON.parse((await runCli(['gait', take, '--json', '--no-norms'])).stdout);
    expect(off.norms).toBeUndefined();
    expect((await runCli(['gait', take, '--no-norms'])).stdout).not.toMatch(/profile score/);
  });

  it('writes the stride CSV and an events file that reads back to the same figures', async () => {
    const csv = readFileSync(join(tmp, 'strides.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toMatch(/^side,pass,start_s,stride_time_s/);
    expect(csv.length - 1).toBe(json.strides.left + json.strides.right);
    const again = JSON.parse((await runCli(['gait', take, '--json', '--events', join(tmp, 'events.csv')])).stdout);
    expect(again.preprocessing.events_from).toBe('file');
    expect(again.cadence_steps_per_min).toBeCloseTo(json.cadence_steps_per_min, 0);
    expect(again.strides).toEqual(json.strides);
  });

  it('an edited events file with a bad row is refused naming file and line', async () => {
    const bad = join(tmp, 'bad-events.csv');
    writeFileSync(bad, readFileSync(join(tmp, 'events.csv'), 'utf8').replace(/\nleft,initial_contact,\d+/, '\nleft,initial_contact,notanumber'));
    const r = await runCli(['gait', take, '--events', bad]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/bad-events\.csv:\d+:/);
  });

  it('--lowpass off and a bad --lowpass', async () => {
    const r = await runCli(['gait', take, '--json', '--lowpass', 'off']);
    expect(JSON.parse(r.stdout).preprocessing.lowpass_hz).toBeNull();
    expect((await runCli(['gait', take, '--lowpass', '-3'])).code).toBe(2);
  });

  it('a take with no walking: one line, exit 1, no report written', async () => {
    const t = synthesizeTake({ seed: 7102, duration: 3 }).take;
    const C = t.channelCount, n = 400;
    const values = new Float64Array(n * C);
    for (let k = 0; k < n; k++) values.set(t.values.subarray(100 * C, 101 * C), k * C);
    const standing = join(tmp, 'standing.bvh');
    writeFileSync(standing, writeBvh({ ...t, values, frameCount: n, headerFrameCount: n }));
    const out = join(tmp, 'never.html');
    const r = await runCli(['gait', standing, '--html', out]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/standing\.bvh: no walking found/);
    expect(() => readFileSync(out)).toThrow();
  });

  it('an --html into a missing folder writes none of the outputs (the CSV and events file stay as they were)', async () => {
    const csv = join(tmp, 'kept.csv'), events = join(tmp, 'kept-events.csv'), bad = join(tmp, 'no-such-folder', 'report.html');
    writeFileSync(csv, 'earlier\n');
    const r = await runCli(['gait', take, '--csv', csv, '--events-out', events, '--html', bad]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n').filter((l) => !l.includes('warning:'))).toEqual([`jointloom: ${bad}: no such file or folder`]);
    expect(readFileSync(csv, 'utf8')).toBe('earlier\n');
    expect(() => readFileSync(events)).toThrow();
    expect(readdirSync(tmp).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('the HTML report is self-contained and renders in headless Chromium with its plots', async () => {
    const text = readFileSync(html, 'utf8');
    expect(text).not.toMatch(/(src|href)="https?:/);
    expect(text).toMatch(/not a diagnostic device/);
    expect(text).toMatch(/synthetic reference, not clinical/);
    if (!haveChromium()) {
      // CI installs Debian's chromium (.ci/run); a developer machine without it checks the text only.
      expect(process.env.CI).not.toBe('true');
      return;
    }
    const { context, close } = await launchChromium();
    try {
      const page = await context.newPage();
      const requests: string[] = [];
      page.on('request', (req) => { if (!req.url().startsWith('file:')) requests.push(req.url()); });
      await page.goto(`file://${html}`);
      expect(await page.title()).toBe('Gait report');
      expect(await page.locator('svg.plot').count()).toBe(8);
      // The reference band under every plot, a strip of the parts outside ±2 SD under each, one profile chart.
      expect(await page.locator('svg.plot path.reference').count()).toBe(8);
      expect(await page.locator('svg.band-strip').count()).toBe(8);
      expect(await page.locator('svg.band-strip rect[fill]').count()).toBeGreaterThan(0);
      expect(await page.locator('svg.profile-chart').count()).toBe(1);
      expect(await page.getByText('Synthetic reference, not clinical', { exact: false }).count()).toBeGreaterThan(0);
      // Per plot at least: two SD bands, two mean lines (and the toe-off markers as lines).
      expect(await page.locator('svg.plot path').count()).toBeGreaterThanOrEqual(8 * 4);
      const box = await page.locator('svg.plot').first().boundingBox();
      expect(box!.width).toBeGreaterThan(300);
      expect(await page.getByText('Caution.').count()).toBe(1);
      await page.screenshot({ path: join(process.cwd(), 'test-artifacts', 'gait-report.png'), fullPage: true }).catch(() => undefined);
      expect(requests).toEqual([]);
    } finally {
      await close();
    }
  });
});
