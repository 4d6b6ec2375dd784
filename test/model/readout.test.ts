// The pair readout (src/model/readout.ts): its ridge fit against simple-statistics' least-squares line
// (a reference library from the registry), knot interpolation and feature values hand-computed, the
// mirror, the correction reaching every forecast path, its block in the model file, and the fitting data's
// jittered copies.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { linearRegression } from 'simple-statistics';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors/index.js';
import { resolveModelConfig } from '../../src/model/config.js';
import { createModel } from '../../src/model/model.js';
import { loadModel, saveModel } from '../../src/model/modelfile.js';
import {
  captureJitter, fitReadout, JITTER_STEPS, mirrorNodeVectors, readoutCorrection, readoutFeatures, readoutFeaturesPerNode, readoutFor, readoutKnots, readoutScratch,
  spreadKnots, type ReadoutData,
} from '../../src/model/readout.js';
import { JITTER_THRESHOLD_FACTOR, jitterThreshold, mergeReadoutData, readoutData, readoutTrainingData } from '../../src/model/readout-fit.js';
import { statsOfTakes } from '../../src/model/train.js';
import { Pcg32 } from '../../src/nn/prng.js';
import { identityStats, TINY } from './support.js';
import { SMALL, synthTrainingTake } from './takes.js';

const dir = mkdtempSync(join(tmpdir(), 'jointloom-readout-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const c = resolveModelConfig(TINY);
const N = c.nodes, per = readoutFeaturesPerNode(c), K = readoutKnots(c).length;

/** Data where only feature `j` varies and every target is a line in it plus noise. */
function lineData(n: number, j: number, slope: number, seed: number, noise = 0.05): ReadoutData {
  const rng = new Pcg32(seed, 3), out: ReadoutData = { features: [], targets: [] };
  for (let i = 0; i < n; i++) {
    const f = new Float64Array(N * per).fill(0.5), x = rng.gauss();
    f[j] = x;
    const t = new Float64Array(N * K * 3);
    for (let o = 0; o < t.length; o++) t[o] = 0.2 + slope * x * (o + 1) / t.length + noise * rng.gauss();
    out.features.push(f);
    out.targets.push(t);
  }
  return out;
}

describe('pair readout', () => {
  it('fits, with a tiny ridge weight, the least-squares line of simple-statistics', () => {
    const data = lineData(200, 7, 1.5, 1), fit = fitReadout(c, 'all', data, lineData(5, 7, 1.5, 9), [1e-9]);
    const r = fit.readout, out = new Float64Array(N * K * 3);
    for (const o of [0, out.length - 1]) {
      // Reference: simple-statistics' linearRegression on the (feature, target) points of output o.
      const ref = linearRegression(data.features.map((f, i) => [f[7]!, data.targets[i]![o]!]));
      for (const x of [-1, 0.3, 2]) {
        const f = new Float64Array(N * per).fill(0.5);
        f[7] = x;
        const pred = r.targetMean[o]! + Array.from(f, (v, jj) => r.weights[jj * N * K * 3 + o]! * (v - r.featureMean[jj]!) / r.featureSd[jj]!).reduce((a, b) => a + b, 0);
        expect(pred).toBeCloseTo(ref.m * x + ref.b, 6);
      }
    }
  });

  it("lets a receiver read another node's features only when every node is a sender", () => {
    // Targets of node 0 depend on a feature of node 2: 'all' learns it, 'self' cannot (held-out error stays).
    const j = 2 * per + 4, train = lineData(300, j, 1, 2, 0.01), valid = lineData(100, j, 1, 3, 0.01);
    for (const d of [train, valid]) for (const t of d.targets) for (let o = K * 3; o < t.length; o++) t[o] = 0;
    const all = fitReadout(c, 'all', train, valid), self = fitReadout(c, 'self', train, valid);
    expect(all.validError.find((e) => e.lambda === all.readout.lambda)!.error).toBeLessThan(0.1 * all.validNone);
    // 'self' learns the mean correction only (node 0's own features never vary).
    expect(Math.min(...self.validError.map((e) => e.error))).toBeGreaterThan(5 * all.validError.find((e) => e.lambda === all.readout.lambda)!.error);
  });

  it('interpolates between knots and grows from 0 before the first (hand-computed)', () => {
    const knots = [4, 9], values = Float64Array.from([10, 0, -5, 20, 5, 0]); // one node: knot 4 (10, 0, −5), knot 9 (20, 5, 0)
    const out = spreadKnots(knots, values, 1, 12, new Float64Array(36));
    expect(Array.from(out.subarray(0, 3))).toEqual([2, 0, -1]); // step 0: 1/5 of knot 4
    expect(Array.from(out.subarray(12, 15))).toEqual([10, 0, -5]); // step 4
    expect(Array.from(out.subarray(18, 21)).map((v) => +v.toFixed(9))).toEqual([14, 2, -3]); // step 6: 2/5 of the way
    expect(Array.from(out.subarray(33, 36))).toEqual([20, 5, 0]); // step 11: after the last knot, held
  });

  it('mirrors node vectors: left and right swapped, y negated, twice the identity', () => {
    const mirror = Int32Array.from([0, 2, 1]), v = Float64Array.from([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    const m = mirrorNodeVectors(v, mirror, new Float64Array(9));
    expect(Array.from(m)).toEqual([1, -2, 3, 7, -8, 9, 4, -5, 6]);
    expect(Array.from(mirrorNodeVectors(m, mirror, new Float64Array(9)))).toEqual(Array.from(v));
  });

  it('reads the lags and the backcast of straight-line motion (hand-computed: constant velocity forecasts it exactly)', () => {
    const H = c.priorHistory, W = N * 6, hist = new Float64Array(H * W);
    for (let t = 0; t < H; t++) for (let n = 0; n < N; n++) { hist[t * W + n * 6] = 0.01 * t + n; hist[t * W + n * 6 + 2] = 0.5; }
    const f = readoutFeatures(c, hist, H, readoutScratch(c))!;
    expect(f).not.toBeNull();
    // Node 1, lag 2: x = 0.01 · (H − 3) + 1.
    expect(f[per + 2 * 3]).toBeCloseTo(0.01 * (H - 3) + 1, 12);
    // Backcast features (the last 15 of each node) vanish on straight-line motion.
    for (let n = 0; n < N; n++) for (let k = per - 15; k < per; k++) expect(Math.abs(f[n * per + k]!)).toBeLessThan(1e-9);
    expect(readoutFeatures(c, hist, H - 1, readoutScratch(c))).toBeNull();
  });

  it('is stored in the model file, round-trips and is refused when corrupt or of another layout', () => {
    const model = createModel(c, identityStats(N), { seed: 5 });
    model.readout = fitReadout(c, 'self', lineData(50, 3, 1, 4), { features: [], targets: [] }).readout;
    const path = join(dir, 'm.json');
    saveModel(path, model);
    const back = loadModel(path).model.readout!;
    expect(back.senders).toBe('self');
    expect(Array.from(back.weights)).toEqual(Array.from(Float32Array.from(model.readout.weights)));
    const j = JSON.parse(readFileSync(path, 'utf8'));
    const write = (name: string, edit: (x: any) => void) => { const k = JSON.parse(JSON.stringify(j)); edit(k); const p = join(dir, name); writeFileSync(p, JSON.stringify(k)); return p; };
    const refused = (p: string) => { try { loadModel(p); } catch (e) { expect(e).toBeInstanceOf(InputError); return (e as Error).message; } throw new Error('accepted'); };
    expect(refused(write('sum.json', (k) => { k.readout.values.sha256 = '0'.repeat(64); }))).toMatch(/readout values do not match/);
    expect(refused(write('lags.json', (k) => { k.readout.lags = [0, 1]; }))).toMatch(/readout layout/);
    expect(refused(write('short.json', (k) => { k.readout.values.base64 = k.readout.values.base64.slice(0, 40); }))).toMatch(/truncated/);
    // A file written before the readout loads without one.
    expect(loadModel(write('old.json', (k) => { delete k.readout; })).model.readout).toBeNull();
  });
});

describe('pair readout fitting data', () => {
  it('made in two shares (one per thread) and merged, is the data of one pass, entry for entry', () => {
    const takes = [synthTrainingTake(3, 9), synthTrainingTake(4, 9)];
    const sc = resolveModelConfig(SMALL), model = createModel(sc, statsOfTakes(takes, sc), { seed: 2 });
    const whole = readoutTrainingData(model, takes, 20);
    const shares = [0, 1].map((index) => readoutTrainingData(model, takes, 20, { index, of: 2 }));
    expect(new Set(whole.window).size).toBeGreaterThan(3);
    // Each share holds every other window; merged, the shares are the whole, in order.
    for (const [k, d] of shares.entries()) expect(d.window!.every((w) => w % 2 === k)).toBe(true);
    const merged = mergeReadoutData([shares[1]!, shares[0]!]);
    expect(merged.window).toEqual(whole.window);
    expect(merged.copy).toEqual(whole.copy);
    expect(merged.jitter).toEqual(whole.jitter);
    merged.features.forEach((f, e) => expect(Array.from(f)).toEqual(Array.from(whole.features[e]!)));
    merged.targets.forEach((t, e) => expect(Array.from(t)).toEqual(Array.from(whole.targets[e]!)));
  });

  it('adds jittered copies of each window with the clean target, mirrored like the clean ones', () => {
    const take = synthTrainingTake(3, 9);
    const sc = resolveModelConfig(SMALL), model = createModel(sc, statsOfTakes([take], sc), { seed: 2 });
    const plain = readoutData(model, [take], 30, { mirror: false, jitterScales: [] });
    const aug = readoutData(model, [take], 30, { mirror: true, jitterScales: [0.25, 1] });
    const n = plain.features.length;
    expect(n).toBeGreaterThan(0);
    // Per window: clean, its mirror, then two jittered copies each with its mirror.
    expect(aug.features.length).toBe(6 * n);
    expect(aug.copy!.map((k) => k >= 0)).toEqual(Array.from({ length: n }, () => [false, false, true, true, true, true]).flat());
    expect(aug.copy).toEqual(Array.from({ length: n }, () => [-1, -1, 0, 0, 1, 1]).flat());
    // A window's copies measure more jitter than the clean window, its mirror image the same as itself.
    for (let w = 0; w < n; w++) {
      expect(aug.jitter![6 * w + 1]).toBe(aug.jitter![6 * w]);
      expect(aug.jitter![6 * w + 4]).toBeGreaterThan(aug.jitter![6 * w]!);
    }
    for (let w = 0; w < n; w++) {
      expect(Array.from(aug.features[6 * w]!)).toEqual(Array.from(plain.features[w]!));
      for (const q of [2, 4]) {
        expect(Array.from(aug.targets[6 * w + q]!)).toEqual(Array.from(plain.targets[w]!));
        // The jittered copy's features differ from the clean ones, by a little.
        const d = aug.features[6 * w + q]!.map((x, i) => Math.abs(x - plain.features[w]![i]!));
        expect(Math.max(...d)).toBeGreaterThan(0);
        expect(Math.max(...d)).toBeLessThan(0.2);
      }
    }
  });
});

describe('jitter switch', () => {
  it('measures no jitter on cubic motion and the SD of white noise added to it', () => {
    // Hand-computed: the fourth difference of a cubic vanishes; of white noise of SD σ it has variance
    // (1 + 16 + 36 + 16 + 1)σ² = 70σ².
    const Nn = 5, H = 150, pos = new Float64Array(H * Nn * 3);
    for (let t = 0; t < H; t++) for (let i = 0; i < Nn * 3; i++) pos[t * Nn * 3 + i] = 0.3 + 0.01 * i * t - 1e-4 * t * t + 2e-7 * t * t * t;
    expect(captureJitter(pos, H, Nn)).toBeLessThan(1e-9);
    const rng = new Pcg32(8, 1), sigma = 0.004;
    // Only the last JITTER_STEPS steps (and the 4 before them) are read: noise earlier changes nothing.
    const noisy = pos.map((x, k) => x + (k >= (H - JITTER_STEPS - 4) * Nn * 3 ? sigma * rng.gauss() : 0));
    const early = noisy.map((x, k) => (k < 50 * Nn * 3 ? x + 1 : x));
    expect(captureJitter(noisy, H, Nn) / sigma).toBeCloseTo(1, 1);
    expect(captureJitter(early, H, Nn)).toBe(captureJitter(noisy, H, Nn));
  });

  it('sets the threshold at a factor times the 99th percentile of the clean windows (hand-computed)', () => {
    // 101 values 0, 0.01, …, 1: the type-7 99th percentile (Hyndman and Fan 1996; common practice) is 0.99.
    const v = Array.from({ length: 101 }, (_, i) => (100 - i) / 100);
    expect(jitterThreshold(v)).toBeCloseTo(JITTER_THRESHOLD_FACTOR * 0.99, 12);
    // Between order statistics: 11 values 0 … 10, p · (n − 1) = 9.9 → 9 + 0.9 · 1 = 9.9.
    expect(jitterThreshold(Array.from({ length: 11 }, (_, i) => i))).toBeCloseTo(JITTER_THRESHOLD_FACTOR * 9.9, 12);
  });

  it('corrects a window of high jitter with the robust readout, and keeps the switch in the model file', () => {
    const model = createModel(c, identityStats(N), { seed: 5 });
    const clean = fitReadout(c, 'all', lineData(50, 3, 1, 4), { features: [], targets: [] }).readout;
    const robust = fitReadout(c, 'all', lineData(50, 3, -1, 6), { features: [], targets: [] }).readout;
    model.readout = { ...clean, jitter: { threshold: 0.01, robust } };
    expect(readoutFor(model.readout, 0.005)).toBe(model.readout);
    expect(readoutFor(model.readout, 0.02)).toBe(robust);
    // A history of straight lines (no jitter) and the same with alternating ±0.02 on every coordinate (jitter 0.02 · 16 / √70 ≈ 0.038).
    const H = c.priorHistory, W = N * 6, quiet = new Float64Array(H * W);
    for (let t = 0; t < H; t++) for (let n = 0; n < N; n++) quiet[t * W + n * 6] = 0.01 * t + n;
    const loud = quiet.map((x, k) => (k % 6 < 3 ? x + 0.02 * ((Math.floor(k / W) % 2) * 2 - 1) : x));
    const corr = (r: typeof clean, h: Float64Array) => Array.from(readoutCorrection(c, r, h, H, readoutScratch(c), new Float64Array(c.forecast * N * 3))!);
    expect(corr(model.readout, quiet)).toEqual(corr(clean, quiet));
    expect(corr(model.readout, loud)).toEqual(corr(robust, loud));
    expect(corr(model.readout, loud)).not.toEqual(corr(clean, loud));
    const path = join(dir, 'switch.json');
    saveModel(path, model);
    const back = loadModel(path).model.readout!;
    expect(back.jitter!.threshold).toBe(0.01);
    expect(Array.from(back.jitter!.robust.weights)).toEqual(Array.from(Float32Array.from(robust.weights)));
    const j = JSON.parse(readFileSync(path, 'utf8'));
    j.readout.jitter.readout.values.sha256 = '0'.repeat(64);
    writeFileSync(path, JSON.stringify(j));
    expect(() => loadModel(path)).toThrow(/robust readout: .*readout values do not match/);
  });
});
