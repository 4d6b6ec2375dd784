// Event detection behaviour: takes that are not walking, steady-state exclusion, short takes, the
// disagreement flag between the coordinate and foot-velocity methods, and the peak helpers.
import { describe, expect, it } from 'vitest';
import type { Take } from '../../src/bvh/take.js';
import { InputError } from '../../src/errors/index.js';
import { walkingDirection } from '../../src/gait/direction.js';
import { detectEvents, makeEvent } from '../../src/gait/events.js';
import { parabolicOffset, pickPeaks, stridePeriod } from '../../src/gait/events-peaks.js';
import { detectionFromEvents } from '../../src/gait/events-review.js';
import { strideCount } from '../../src/gait/events-steady.js';
import { type GaitInput, prepareGait } from '../../src/gait/input.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake } from '../../src/synth/index.js';

const gaitOfTake = (name: string, take: Take): GaitInput => prepareGait(resolveImported(name, take));

/**
 * Returns a non-walking take made from a synthetic one: every rotation zero (the standing rest pose) and the
 * root held at its first position, then `pose(frame, set)` may set channels (`set(joint, channel, value)`).
 */
function stillTake(
  seed: number, seconds: number,
  pose?: (f: number, set: (joint: string, channel: string, v: number) => void, first: (joint: string, channel: string) => number) => void,
): Take {
  const { take, truth } = synthesizeTake({ seed, duration: seconds });
  const C = take.channelCount;
  const values = new Float64Array(take.values.length);
  const at = new Map<string, number>();
  for (const j of take.joints) j.channels.forEach((ch, k) => at.set(`${j.name}/${ch}`, j.channelStart + k));
  const root = take.joints[0]!;
  for (let f = 0; f < take.frameCount; f++) {
    root.channels.forEach((ch, k) => { if (ch.endsWith('position')) values[f * C + root.channelStart + k] = take.values[root.channelStart + k]!; });
    const slot = (joint: string, ch: string) => {
      const k = at.get(`${truth.jointNames[joint as keyof typeof truth.jointNames]}/${ch}`);
      if (k === undefined) throw new Error(`no channel ${ch} on ${joint}`);
      return k;
    };
    pose?.(f, (joint, ch, v) => { values[f * C + slot(joint, ch)] = v; }, (joint, ch) => take.values[slot(joint, ch)]!);
  }
  return { ...take, values };
}

describe('takes that are not walking', () => {
  it('a standing take raises one line naming the file and the speed threshold', () => {
    const g = gaitOfTake('standing.bvh', stillTake(7, 8));
    expect(() => detectEvents(g)).toThrow(InputError);
    // Threshold 0.1·√(g·L) (the Froude scaling of walking speed, common practice), L from the rest pose.
    const v = (0.1 * Math.sqrt(9.80665 * g.legLengthM)).toFixed(2);
    expect(() => detectEvents(g)).toThrow(`standing.bvh: no walking found: the pelvis moves less than ${v} m/s for the whole take.`);
    try { detectEvents(g); } catch (e) { expect((e as Error).message).not.toContain('\n'); expect((e as InputError).exitCode).toBe(1); }
  });

  it('a crouching take (pelvis down and up by 25 cm every 2 s, knees bending) raises the same error', () => {
    const g = gaitOfTake('crouch.bvh', stillTake(8, 8, (f, set, first) => {
      const s = 0.5 - 0.5 * Math.cos((2 * Math.PI * f) / 240); // 0..1, 2 s period at 120 Hz
      set('pelvis', 'Yposition', first('pelvis', 'Yposition') - 25 * s); // centimetres, Y up (the walker's defaults)
      set('l_knee', 'Xrotation', 70 * s);
      set('r_knee', 'Xrotation', 70 * s);
    }));
    let lo = Infinity, hi = -Infinity;
    for (let f = 0; f < g.frames; f++) { const z = g.positions[(f * g.jointCount + g.role.pelvis) * 3 + 2]!; lo = Math.min(lo, z); hi = Math.max(hi, z); }
    expect(hi - lo).toBeGreaterThan(0.2); // the take does move: 25 cm down and up
    expect(() => detectEvents(g)).toThrow(/^crouch\.bvh: no walking found: the pelvis moves less than 0\.\d\d m\/s for the whole take\.$/);
  });

  it('turning on the spot (pelvis yaw 90°/s) is excluded as turning, and there is no walking', () => {
    const g = gaitOfTake('spin.bvh', stillTake(9, 6, (f, set) => set('pelvis', 'Yrotation', (90 * f) / 120)));
    const dir = walkingDirection(g);
    expect(dir.passes).toEqual([]);
    const turning = dir.excluded.filter((e) => e.reason === 'turning').reduce((a, e) => a + e.endFrame - e.startFrame, 0);
    expect(turning).toBeGreaterThan(0.8 * g.frames);
    expect(() => detectEvents(g)).toThrow(InputError);
  });
});

describe('steady-state exclusion', () => {
  const g = gaitOfTake('steady.bvh', synthesizeTake({ seed: 11, duration: 12 }).take);

  it('is on by default: the first and last steps of the pass are not steady', () => {
    const det = detectEvents(g);
    expect(det.passes.length).toBe(1);
    const ics = det.events.filter((e) => e.kind === 'initial_contact');
    // The first step runs from the pass's first contact to its second, the last from the second-to-last to the last.
    expect(ics[0]!.steady).toBe(false);
    expect(ics[ics.length - 1]!.steady).toBe(false);
    expect(ics.slice(1, -1).every((e) => e.steady)).toBe(true);
    const t1 = ics[1]!.time, tn = ics[ics.length - 2]!.time;
    for (const e of det.events) expect(e.steady).toBe(e.time >= t1 && e.time <= tn);
    // 12 s at about 0.55 s per step: some 20 contacts. The two not steady (first and last) each bound one
    // stride of their side, so each side loses as many strides as it has non-steady contacts, two in all.
    const off = detectEvents(g, { steadyOnly: false });
    for (const side of ['left', 'right'] as const) {
      const lost = ics.filter((e) => e.side === side && !e.steady).length;
      expect(strideCount(det.events, side)).toBe(strideCount(off.events, side) - lost);
    }
    expect(ics.filter((e) => !e.steady).length).toBe(2);
  });

  it('is off by option: every event is steady', () => {
    const det = detectEvents(g, { steadyOnly: false });
    expect(det.events.length).toBeGreaterThan(30);
    expect(det.events.every((e) => e.steady)).toBe(true);
    expect(det.warnings.filter((w) => w.includes('strides'))).toEqual([]);
  });

  it('warns when a side has fewer than 3 strides', () => {
    // 3 s at 110 steps/min is about 2.7 strides in all; fewer steady ones.
    const short = gaitOfTake('short.bvh', synthesizeTake({ seed: 12, duration: 3 }).take);
    const det = detectEvents(short);
    expect(det.warnings.some((w) => /^short\.bvh: only \d strides? found on the left side \(fewer than 3\)/.test(w))).toBe(true);
    expect(det.warnings.some((w) => /^short\.bvh: only \d strides? found on the right side \(fewer than 3\)/.test(w))).toBe(true);
  });
});

describe('disagreement flag', () => {
  const input = { fps: 120, frames: 1000 } as GaitInput;
  const zero = { contact: 0, toeOff: 0, contactCheck: 0, toeOffCheck: 0 };

  it('is set when the methods differ by more than 2 frames, not at 2', () => {
    // Hand-computed: 100 vs 102 frames is 2 frames apart (agree); 100 vs 102.1 is more than 2 (disagree).
    expect(makeEvent(input, 'left', 'initial_contact', 100, 102, zero, 2, 0).disagree).toBe(false);
    expect(makeEvent(input, 'left', 'initial_contact', 100, 102.1, zero, 2, 0).disagree).toBe(true);
    expect(makeEvent(input, 'right', 'toe_off', 100, 97.5, zero, 2, 0).disagree).toBe(true);
    const e = makeEvent(input, 'right', 'toe_off', 100.4, 98.6, zero, 2, 0);
    expect(e.frame).toBe(100);
    expect(e.checkFrame).toBe(99);
    expect(e.disagree).toBe(false);
    // No cross-check found counts as not confirmed.
    expect(makeEvent(input, 'left', 'initial_contact', 100, NaN, zero, 2, 0)).toMatchObject({ checkFrame: null, disagree: true });
  });

  it('flags a reviewed contact moved 8 frames away, and only that one', () => {
    const g = gaitOfTake('flag.bvh', synthesizeTake({ seed: 13, duration: 10 }).take);
    const det = detectEvents(g);
    const agreeing = det.events.filter((e) => !e.disagree && e.kind === 'initial_contact' && e.steady);
    expect(agreeing.length).toBeGreaterThan(5);
    const moved = agreeing[2]!;
    const edited = det.events.map((e) => (e === moved ? { ...e, frame: e.frame + 8, time: e.time + 8 / g.fps } : e));
    const back = detectionFromEvents(g, edited);
    const flagged = back.events.filter((e) => e.disagree && !det.events.find((d) => d.side === e.side && d.kind === e.kind && d.frame === e.frame)?.disagree);
    expect(flagged.map((e) => [e.side, e.kind, e.frame])).toEqual([[moved.side, moved.kind, moved.frame + 8]]);
    expect(back.events.every((e) => e.source === 'file')).toBe(true);
    expect(back.passes).toEqual(det.passes);
  });
});

describe('peak helpers', () => {
  it('finds the parabola vertex: y = −(x − 0.3)² sampled at −1, 0, 1 peaks at +0.3', () => {
    const y = (x: number) => -((x - 0.3) ** 2);
    expect(parabolicOffset(y(-1), y(0), y(1))).toBeCloseTo(0.3, 12);
  });

  it('finds the period of a sine with a harmonic (period 130 frames) and one peak per period', () => {
    const n = 1300, x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = Math.sin((2 * Math.PI * i) / 130) + 0.4 * Math.sin((4 * Math.PI * i) / 130 + 1);
    const T = stridePeriod(x, new Uint8Array(n).fill(1), 72, 360);
    expect(T).toBeGreaterThan(129.5);
    expect(T).toBeLessThan(130.5);
    const peaks = pickPeaks(x, Math.round(0.4 * T), Math.round(0.5 * T));
    // Ten periods, one maximum each (the harmonic adds a lesser bump that the separation rejects).
    expect(peaks.length).toBe(10);
    for (let k = 1; k < peaks.length; k++) expect(peaks[k]! - peaks[k - 1]!).toBe(130);
  });
});
