// Windows: the frame (right-handed, x along the walking direction, y to the subject's left, z up,
// pelvis at the origin, leg-length scale), velocities, the map back to the world, independence from
// units, up axis and naming, and causality (nothing after the observed part reaches it).
import { Matrix4, Vector3 } from 'three';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors/index.js';
import { prepareGait } from '../../src/gait/input.js';
import { frameToWorld, worldToFrame } from '../../src/motion/frame.js';
import { lastSourceFrame } from '../../src/motion/resample.js';
import { MOTION_NODES } from '../../src/motion/roles.js';
import { type Track, trackFromImported } from '../../src/motion/track.js';
import { makeWindow, windowEnds, windowsOf, type Window } from '../../src/motion/window.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake } from '../../src/synth/index.js';
import { at, importSynth, sameBits, synthTrack, truncateTake } from './support.js';

const ix = (n: (typeof MOTION_NODES)[number]) => MOTION_NODES.indexOf(n);
const N = MOTION_NODES.length;
const DEG = 180 / Math.PI;

/** Returns the signed angle a − b wrapped to (−π, π]. */
function angleDiff(a: number, b: number): number {
  const d = a - b;
  return Math.atan2(Math.sin(d), Math.cos(d));
}

/**
 * Least-squares circle centre (Kåsa 1976, "A circle fitting procedure and its error analysis", IEEE
 * Trans. Instrum. Meas. 25): minimise Σ (x² + y² + D x + E y + F)², linear in D, E, F; centre (−D/2, −E/2).
 */
function kasaCentre(pts: [number, number][]): [number, number] {
  const A = [[0, 0, 0], [0, 0, 0], [0, 0, 0]], b = [0, 0, 0];
  for (const [x, y] of pts) {
    const r = [x, y, 1], z = -(x * x + y * y);
    for (let i = 0; i < 3; i++) { b[i] += r[i]! * z; for (let j = 0; j < 3; j++) A[i]![j] += r[i]! * r[j]!; }
  }
  const det = (m: number[][]) => m[0]![0]! * (m[1]![1]! * m[2]![2]! - m[1]![2]! * m[2]![1]!) - m[0]![1]! * (m[1]![0]! * m[2]![2]! - m[1]![2]! * m[2]![0]!) + m[0]![2]! * (m[1]![0]! * m[2]![1]! - m[1]![1]! * m[2]![0]!);
  const d = det(A);
  const col = (k: number) => A.map((row, i) => row.map((v, j) => (j === k ? b[i]! : v)));
  return [-det(col(0)) / d / 2, -det(col(1)) / d / 2];
}

/** World images (canonical frame) of the window's unit x, y, z directions, from toWorld of velocities. */
function axesOf(win: Window): [Vector3, Vector3, Vector3] {
  return [0, 1, 2].map((a) => {
    const s = new Float64Array(6);
    s[3 + a] = 1;
    const o = win.toWorld(s, new Float64Array(6));
    return new Vector3(o[3]!, o[4]!, o[5]!).divideScalar(win.frame.scale);
  }) as [Vector3, Vector3, Vector3];
}

/** Pelvis horizontal position of a track at step k. */
function pelvisXY(tr: Track, k: number): [number, number] {
  const o = (k * tr.nodeCount + ix('pelvis')) * 3;
  return [tr.positions[o]!, tr.positions[o + 1]!];
}

const TAKES = {
  straightY: synthTrack('straight-y.bvh', { seed: 11, duration: 14 }),
  straightZ: synthTrack('straight-z.bvh', { seed: 12, duration: 14, units: 'm', upAxis: 'Z', naming: 'snake' }),
  circleY: synthTrack('circle-y.bvh', { seed: 13, duration: 20, path: { kind: 'circle', radius: 4, turn: 'left' } }),
  circleZ: synthTrack('circle-z.bvh', { seed: 14, duration: 20, upAxis: 'Z', path: { kind: 'circle', radius: 3, turn: 'right' } }),
  serpentineZ: synthTrack('serp-z.bvh', { seed: 15, duration: 14, upAxis: 'Z', units: 'mm', path: { kind: 'serpentine' } }),
};

describe('window frame geometry', () => {
  for (const [name, tr] of Object.entries(TAKES)) {
    it(`is right-handed, z up, pelvis at the origin, left hip at +y (${name})`, () => {
      for (const e of windowEnds(tr, 7)) {
        const w = makeWindow(tr, e);
        const last = w.observe - 1;
        // Pelvis at the origin at the last observed step: p − p = 0 exactly (±0 from the rotation).
        for (let a = 0; a < 3; a++) expect(Math.abs(w.observed[at(N, last, ix('pelvis')) + a]!)).toBe(0);
        // Role geometry: the left hip lies on the subject's left, the right hip on the right.
        expect(w.observed[at(N, last, ix('l_hip')) + 1]).toBeGreaterThan(0.05);
        expect(w.observed[at(N, last, ix('r_hip')) + 1]).toBeLessThan(-0.05);
        // Up: head above the pelvis (about 0.65 leg lengths), ankles about a leg length below.
        expect(w.observed[at(N, last, ix('head')) + 2]).toBeGreaterThan(0.5);
        expect(w.observed[at(N, last, ix('l_ankle')) + 2]).toBeLessThan(-0.8);
        // Right-handed: three's determinant of the basis (x, y, z) is +1, and z is the world's +Z.
        const [x, y, z] = axesOf(w);
        expect(new Matrix4().makeBasis(x, y, z).determinant()).toBeCloseTo(1, 12);
        expect(new Vector3().crossVectors(x, y).distanceTo(z)).toBeLessThan(1e-12);
        expect(z.z).toBeCloseTo(1, 12);
        expect(w.frame.heading).toBe('motion');
      }
    });
  }

  it('points x along a straight walk within 5° (the path direction is the take\'s start-to-end chord)', () => {
    for (const tr of [TAKES.straightY, TAKES.straightZ]) {
      const [x0, y0] = pelvisXY(tr, 0), [x1, y1] = pelvisXY(tr, tr.steps - 1);
      const path = Math.atan2(y1 - y0, x1 - x0);
      let worst = 0;
      for (const e of windowEnds(tr, 1)) {
        const w = makeWindow(tr, e);
        worst = Math.max(worst, Math.abs(angleDiff(Math.atan2(w.frame.sin, w.frame.cos), path)));
      }
      // Measured 3.9°: the pelvis sways sideways within the 0.5 s span (about half a stride).
      expect(worst * DEG).toBeLessThan(5);
    }
  });

  it('points x along the tangent of a circle, lagging it by half the arc of the heading span', () => {
    for (const [tr, turn] of [[TAKES.circleY, 'left'], [TAKES.circleZ, 'right']] as const) {
      const pts: [number, number][] = [];
      for (let k = 0; k < tr.steps; k += 2) pts.push(pelvisXY(tr, k));
      const [cx, cy] = kasaCentre(pts);
      const radius = pts.reduce((s, [x, y]) => s + Math.hypot(x - cx, y - cy), 0) / pts.length;
      let pathLen = 0;
      for (let k = 1; k < tr.steps; k++) { const [a, b] = pelvisXY(tr, k - 1), [c, d] = pelvisXY(tr, k); pathLen += Math.hypot(c - a, d - b); }
      const omega = pathLen / ((tr.steps - 1) / tr.rate) / radius; // rad/s
      // Seen from above in a right-handed Z-up frame, a left turn runs counter-clockwise: tangent = ẑ × r̂.
      const sense = turn === 'left' ? 1 : -1;
      const diffs: number[] = [];
      for (const e of windowEnds(tr, 1)) {
        const w = makeWindow(tr, e);
        const [px, py] = pelvisXY(tr, e);
        const tangent = Math.atan2(sense * (px - cx), -sense * (py - cy));
        diffs.push(sense * angleDiff(Math.atan2(w.frame.sin, w.frame.cos), tangent));
      }
      // Tangent-chord angle theorem: a chord makes with the tangent at its end half the central angle it
      // subtends, here ω · 0.5 s / 2; the heading lags the true tangent by that much on average.
      const lag = (omega * 0.5) / 2;
      const mean = diffs.reduce((a, b) => a + b, 0) / diffs.length;
      expect(mean).toBeLessThan(0);
      expect(Math.abs(mean + lag) * DEG).toBeLessThan(1.5);
      expect(Math.max(...diffs.map(Math.abs)) * DEG).toBeLessThan(11);
    }
  });

  it('scales positions by the leg length: hip-knee plus knee-ankle is 1 on average over both legs', () => {
    const tr = TAKES.straightY;
    const w = makeWindow(tr, 150);
    const d = (t: number, a: number, b: number) => {
      const p = at(N, t, a), q = at(N, t, b);
      return Math.hypot(w.observed[p]! - w.observed[q]!, w.observed[p + 1]! - w.observed[q + 1]!, w.observed[p + 2]! - w.observed[q + 2]!);
    };
    for (let t = 0; t < w.observe; t++) {
      // FK is rigid, so segment lengths equal the rest pose's, the leg length's own definition.
      const legs = 0.5 * (d(t, ix('l_hip'), ix('l_knee')) + d(t, ix('l_knee'), ix('l_ankle')) + d(t, ix('r_hip'), ix('r_knee')) + d(t, ix('r_knee'), ix('r_ankle')));
      expect(legs).toBeCloseTo(1, 9);
    }
    // The walker's default 1.75 m subject has a leg (hip to ankle) of about 0.86 m (Winter 2009 segment
    // table: thigh 0.245 H + shank 0.246 H = 0.86 m, recalled from memory).
    expect(tr.legLength).toBeGreaterThan(0.8);
    expect(tr.legLength).toBeLessThan(0.92);
  });

  it('turns to the hips line when the pelvis stands still', () => {
    const syn = synthesizeTake({ seed: 16, duration: 4 });
    const take = syn.take;
    const root = take.joints[0]!;
    // Freeze the root's horizontal position channels (Y is up in this take): the pelvis stands still.
    for (const axis of ['Xposition', 'Zposition'] as const) {
      const c = root.channelStart + root.channels.indexOf(axis);
      for (let f = 1; f < take.frameCount; f++) take.values[f * take.channelCount + c] = take.values[c]!;
    }
    const tr = trackFromImported(resolveImported('standing.bvh', take));
    const w = makeWindow(tr, 80);
    expect(w.frame.heading).toBe('hips');
    const last = w.observe - 1;
    // forward = left × up with left along the hips line: the hips differ only in y.
    expect(Math.abs(w.observed[at(N, last, ix('l_hip'))]! - w.observed[at(N, last, ix('r_hip'))]!)).toBeLessThan(1e-12);
    expect(w.observed[at(N, last, ix('l_hip')) + 1]).toBeGreaterThan(0.05);
  });
});

describe('window state', () => {
  const tr = TAKES.serpentineZ;
  const w = makeWindow(tr, 200);

  it('holds velocities as backward differences of the positions times the rate', () => {
    for (let t = 1; t < w.observe; t++)
      for (let n = 0; n < N; n++)
        for (let a = 0; a < 3; a++) {
          const v = (w.observed[at(N, t, n) + a]! - w.observed[at(N, t - 1, n) + a]!) * tr.rate;
          expect(w.observed[at(N, t, n) + 3 + a]).toBeCloseTo(v, 9);
        }
    // The first future step's velocity reads the last observed step.
    for (let n = 0; n < N; n++) {
      const v = (w.future[at(N, 0, n) + 1]! - w.observed[at(N, w.observe - 1, n) + 1]!) * tr.rate;
      expect(w.future[at(N, 0, n) + 4]).toBeCloseTo(v, 9);
    }
  });

  it('maps back to the world with toWorld, and worldToFrame inverts it', () => {
    const world = w.toWorld(w.observed, new Float64Array(w.observed.length));
    const first = w.endObservedStep - w.observe + 1;
    for (let t = 0; t < w.observe; t++)
      for (let n = 0; n < N; n++) {
        const k = first + t;
        for (let a = 0; a < 3; a++) {
          const p = tr.positions[(k * N + n) * 3 + a]!, q = tr.positions[((k - 1) * N + n) * 3 + a]!;
          expect(world[at(N, t, n) + a]).toBeCloseTo(p, 12);
          expect(world[at(N, t, n) + 3 + a]).toBeCloseTo((p - q) * tr.rate, 9);
        }
      }
    const back = worldToFrame(w.frame, world, new Float64Array(world.length));
    for (let i = 0; i < back.length; i++) expect(back[i]).toBeCloseTo(w.observed[i]!, 12);
    // In place gives the same numbers.
    const copy = Float64Array.from(w.future);
    frameToWorld(w.frame, copy, copy);
    const fresh = w.toWorld(w.future, new Float64Array(w.future.length));
    expect(Array.from(copy)).toEqual(Array.from(fresh));
  });

  it('matches the unfiltered gait input at the take\'s own rate (the same canonical frame)', () => {
    const imp = importSynth('rate.bvh', { seed: 17, duration: 3, upAxis: 'Y' });
    const own = trackFromImported(imp, { rate: 120 });
    const g = prepareGait(imp, null);
    expect(own.steps).toBe(g.frames);
    MOTION_NODES.forEach((node, n) => {
      const j = g.role[node];
      for (let f = 0; f < g.frames; f += 13)
        for (let a = 0; a < 3; a++) expect(own.positions[(f * N + n) * 3 + a]).toBeCloseTo(g.positions[(f * g.jointCount + j) * 3 + a]!, 12);
    });
    expect(own.legLength).toBeCloseTo(g.legLengthM, 12);
  });
});

describe('independence from units, up axis and naming', () => {
  const base = { seed: 21, duration: 8 } as const;
  const ref = synthTrack('cm-y.bvh', { ...base, units: 'cm', upAxis: 'Y', naming: 'camel' });

  /** Largest position and velocity difference between the windows of two tracks. */
  function worstDiff(a: Track, b: Track): [number, number] {
    let p = 0, v = 0;
    for (const e of windowEnds(a, 9)) {
      const wa = makeWindow(a, e), wb = makeWindow(b, e);
      for (let i = 0; i < wa.observed.length; i++) {
        const d = Math.abs(wa.observed[i]! - wb.observed[i]!);
        if (i % 6 < 3) p = Math.max(p, d);
        else v = Math.max(v, d);
      }
    }
    return [p, v];
  }

  it('gives the same windows within the rounding of the written values', () => {
    // The walker rounds every value to 2 decimals in cm (0.005° on angles): about 6 joints from the root to
    // a toe, each up to 8.7e-5 rad off on a lever under 1 m, give under 5e-4 m, 6e-4 leg lengths; a
    // velocity difference is two such errors times 30 Hz, under 0.04 leg lengths per second.
    for (const other of [
      synthTrack('m-z.bvh', { ...base, units: 'm', upAxis: 'Z', naming: 'snake' }),
      synthTrack('in-z.bvh', { ...base, units: 'in', upAxis: 'Z', naming: 'caps' }),
    ]) {
      expect(other.steps).toBe(ref.steps);
      const [p, v] = worstDiff(ref, other);
      expect(p).toBeLessThan(1e-3);
      expect(v).toBeLessThan(0.04);
    }
  });

  it('gives the same windows to 1e-6 when both takes are written with 7 decimals', () => {
    const a = synthTrack('cm7.bvh', { ...base, units: 'cm', upAxis: 'Y', naming: 'dotted', decimals: 7 });
    const b = synthTrack('m7.bvh', { ...base, units: 'm', upAxis: 'Z', naming: 'prefixed', decimals: 7 });
    const [p, v] = worstDiff(a, b);
    expect(p).toBeLessThan(1e-6);
    expect(v).toBeLessThan(1e-4);
  });
});

describe('causality', () => {
  for (const fps of [120, 100]) {
    const syn = synthesizeTake({ seed: 31, duration: 8, frameRate: fps, path: { kind: 'serpentine' } });
    const full = resolveImported('full.bvh', syn.take);
    const trFull = trackFromImported(full);

    it(`truncating the take right after the observed part leaves the window unchanged, bit for bit (${fps} Hz)`, () => {
      for (const e of [60, 97, 151, 200]) {
        const cut = lastSourceFrame(e, syn.take.frameTime, 30) + 1;
        const trCut = trackFromImported(resolveImported('cut.bvh', truncateTake(syn.take, cut)));
        const a = makeWindow(trFull, e), b = makeWindow(trCut, e);
        expect(trCut.steps).toBe(e + 1);
        expect(b.futureSteps).toBe(0);
        expect(b.future.length).toBe(0);
        expect(sameBits(a.observed, b.observed)).toBe(true);
        expect(sameBits(a.frame.origin, b.frame.origin)).toBe(true);
        expect([a.frame.cos, a.frame.sin, a.frame.scale]).toEqual([b.frame.cos, b.frame.sin, b.frame.scale]);
      }
    });

    it(`scrambling every frame after the observed part leaves it unchanged, bit for bit (${fps} Hz)`, () => {
      const e = 120;
      const cut = lastSourceFrame(e, syn.take.frameTime, 30) + 1;
      const values = Float64Array.from(syn.take.values);
      for (let i = cut * syn.take.channelCount; i < values.length; i++) values[i] = values[i]! * -3 + 77;
      const scrambled = trackFromImported({ ...full, take: { ...syn.take, values } });
      const a = makeWindow(trFull, e), b = makeWindow(scrambled, e);
      expect(sameBits(a.observed, b.observed)).toBe(true);
      expect(sameBits(a.future, b.future)).toBe(false); // the future did change
      if (fps === 100) {
        // Negative control: the last source frame the step reads does reach the window (a tight bound).
        const v2 = Float64Array.from(syn.take.values);
        for (let i = (cut - 1) * syn.take.channelCount; i < cut * syn.take.channelCount; i++) v2[i] = v2[i]! + 5;
        const touched = trackFromImported({ ...full, take: { ...syn.take, values: v2 } });
        expect(sameBits(a.observed, makeWindow(touched, e).observed)).toBe(false);
      }
    });
  }
});

describe('windowsOf', () => {
  const tr = TAKES.straightY;

  it('visits ends from observe by stride while the future fits, equal to makeWindow', () => {
    const ends = windowEnds(tr, 25);
    expect(ends[0]).toBe(60);
    expect(ends.at(-1)!).toBeLessThanOrEqual(tr.steps - 1 - 30);
    expect(ends.at(-1)! + 25).toBeGreaterThan(tr.steps - 1 - 30);
    const wins = [...windowsOf(tr, 25)];
    expect(wins.map((w) => w.endObservedStep)).toEqual(ends);
    for (const w of wins) {
      expect(w.futureSteps).toBe(30);
      expect(sameBits(w.observed, makeWindow(tr, w.endObservedStep).observed)).toBe(true);
    }
  });

  it('includes windows with a cut future when asked', () => {
    const ends = windowEnds(tr, 1, { partial: true });
    expect(ends.at(-1)).toBe(tr.steps - 1);
    const last = makeWindow(tr, tr.steps - 5);
    expect(last.futureSteps).toBe(4);
    expect(last.future.length).toBe(4 * N * 6);
  });

  it('raises InputError naming the file for a take shorter than one observed part', () => {
    const short = synthTrack('short.bvh', { seed: 3, duration: 1.5 });
    expect(() => makeWindow(short, 40)).toThrow(InputError);
    expect(() => makeWindow(short, 40)).toThrow(/short\.bvh/);
    expect([...windowsOf(short, 1)]).toEqual([]);
  });
});
