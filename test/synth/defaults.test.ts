// Default walking measured from the written take (parsed back, forward kinematics) and from the truth sidecar.
import { coefficientOfVariation, mean } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { synthesizeTake } from '../../src/synth/index.js';
import { detectEvents, maxStanceSlide, measure, median, swingKneePeaks } from './support.js';

const run = synthesizeTake({ seed: 101 });
const ms = measure(run.bvhText, run.truth);
const ev = [detectEvents(ms.heights[0], ms.frames), detectEvents(ms.heights[1], ms.frames)] as const;

describe('synth defaults: normal adult walking', () => {
  it('finds the truth events again from the parsed take geometry', () => {
    // Same rule, applied to the text as read back: the sidecar must describe the file, frame for frame.
    expect(ev[0].ic).toEqual(run.truth.events.left.initialContactFrames);
    expect(ev[0].to).toEqual(run.truth.events.left.toeOffFrames);
    expect(ev[1].ic).toEqual(run.truth.events.right.initialContactFrames);
    expect(ev[1].to).toEqual(run.truth.events.right.toeOffFrames);
    expect(ev[0].ic.length).toBeGreaterThan(20);
  });

  it('has a cadence of 100-120 steps/min', () => {
    // Normal adult cadence ~100-120 steps/min (Perry and Burnfield 2010; recalled from memory).
    const all = [...ev[0].ic, ...ev[1].ic].sort((a, b) => a - b);
    const cadence = (60 * (all.length - 1)) / ((all[all.length - 1]! - all[0]!) * ms.dt);
    expect(cadence).toBeGreaterThanOrEqual(100);
    expect(cadence).toBeLessThanOrEqual(120);
    expect(run.truth.summary.cadenceStepsPerMin).toBeCloseTo(cadence, 6);
  });

  it('has stance 58-64 % of the cycle on each side', () => {
    // Stance ~60 % of the gait cycle at self-selected speed (Perry and Burnfield 2010; Winter 2009 — recalled from memory).
    for (const e of ev) {
      const shares: number[] = [];
      for (let c = 0; c + 1 < e.ic.length; c++) {
        const t = e.to.find((x) => x > e.ic[c]! && x < e.ic[c + 1]!)!;
        shares.push((t - e.ic[c]!) / (e.ic[c + 1]! - e.ic[c]!));
      }
      expect(mean(shares)).toBeGreaterThanOrEqual(0.58);
      expect(mean(shares)).toBeLessThanOrEqual(0.64);
    }
  });

  it('walks at 1.1-1.5 m/s by root travel', () => {
    // Comfortable adult walking speed ~1.3-1.4 m/s (Bohannon 1997; recalled from memory): 1.1-1.5 m/s.
    const F = ms.frames;
    const dist = Math.hypot(ms.root[(F - 1) * 2]! - ms.root[0]!, ms.root[(F - 1) * 2 + 1]! - ms.root[1]!);
    const speed = dist / ((F - 1) * ms.dt);
    expect(speed).toBeGreaterThanOrEqual(1.1);
    expect(speed).toBeLessThanOrEqual(1.5);
  });

  it('peaks at 55-65° knee flexion in swing, from thigh and shank geometry', () => {
    // Peak swing knee flexion ~60° (Perry and Burnfield 2010; Winter 2009 — recalled from memory).
    for (const s of [0, 1] as const) {
      const peaks = swingKneePeaks(ms, s, ev[s].ic, ev[s].to);
      expect(peaks.length).toBeGreaterThan(20);
      expect(median(peaks)).toBeGreaterThanOrEqual(55);
      expect(median(peaks)).toBeLessThanOrEqual(65);
    }
  });

  it('shows loading-response flexion and near extension in mid/terminal stance', () => {
    // Knee ~15-20° at loading response, near extension (<10°) in mid/terminal stance (Perry 2010; recalled from memory).
    for (const s of [0, 1] as const) {
      const loading: number[] = [], mid: number[] = [];
      for (let c = 0; c + 1 < ev[s].ic.length; c++) {
        const a = ev[s].ic[c]!, b = ev[s].ic[c + 1]!;
        let lo = -Infinity, mi = Infinity;
        for (let f = a; f < b; f++) {
          const p = (f - a) / (b - a);
          if (p < 0.2) lo = Math.max(lo, ms.knee[s][f]!);
          if (p > 0.25 && p < 0.45) mi = Math.min(mi, ms.knee[s][f]!);
        }
        loading.push(lo);
        mid.push(mi);
      }
      expect(median(loading)).toBeGreaterThanOrEqual(12);
      expect(median(loading)).toBeLessThanOrEqual(22);
      expect(median(mid)).toBeLessThan(10);
    }
  });

  it('varies stride time by about 1-2 % (CV)', () => {
    // Healthy adults: stride-time CV ~1-2 % (Hausdorff et al. 1996; recalled from memory); a 30 s take holds
    // ~27 strides, so the estimate itself scatters by ~0.2 %: accept 0.8-2.5 %.
    for (const e of ev) {
      const T = e.ic.slice(1).map((f, i) => (f - e.ic[i]!) * ms.dt);
      const cv = coefficientOfVariation(T);
      expect(cv).toBeGreaterThanOrEqual(0.008);
      expect(cv).toBeLessThanOrEqual(0.025);
    }
  });

  it('keeps the stance foot planted: slide ≤ 1 cm, penetration ≤ 1 cm', () => {
    // Acceptance limits of the walker (issue): a point on the floor moves at most 1 cm; nothing goes 1 cm under it.
    for (const s of [0, 1] as const) {
      expect(maxStanceSlide(ms, s, ev[s].ic, ev[s].to)).toBeLessThanOrEqual(0.01);
      let low = Infinity;
      for (let n = 0; n < ms.heights[s].length; n++) low = Math.min(low, ms.heights[s][n]!);
      expect(low).toBeGreaterThanOrEqual(-0.01);
    }
  });

  it('gives the truth phase 0 at each contact, rising through the stride', () => {
    const ph = run.truth.phase.left;
    const ic = run.truth.events.left.initialContactFrames;
    expect(ph[ic[1]!]).toBe(0);
    const midFrame = Math.round((ic[1]! + ic[2]!) / 2);
    expect(ph[midFrame]!).toBeCloseTo(0.5, 1);
    expect(ph[ic[0]! - 1] ?? null).toBeNull();
    expect(run.truth.events.left.initialContactTimes[1]).toBeCloseTo(ic[1]! * ms.dt, 6);
  });

  it('stays within about 1 MB for a 30 s take at 120 Hz in cm', () => {
    // Compactness target of the issue: demo takes of 20-40 s at 100-120 Hz about 1 MB or less.
    expect(run.bvhText.length).toBeLessThan(1.45e6);
  });
});
