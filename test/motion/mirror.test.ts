// Left/right mirror augmentation: twice is the identity, left and right swap with y reflected, pair
// values follow the pair mirror map, and toWorld of a mirrored window lands on the original take.
import { Matrix4, Vector3 } from 'three';
import { describe, expect, it } from 'vitest';
import { mirrorPairValues, mirrorState, mirrorTrack, mirrorWindow } from '../../src/motion/mirror.js';
import { DEFAULT_PAIRS, MOTION_NODES, NODE_MIRROR, pairIndex } from '../../src/motion/roles.js';
import { makeWindow } from '../../src/motion/window.js';
import { at, sameBits, synthTrack } from './support.js';

const ix = (n: (typeof MOTION_NODES)[number]) => MOTION_NODES.indexOf(n);
const N = MOTION_NODES.length;

describe('mirror augmentation', () => {
  // A take with a stiff left knee, so left and right really differ.
  const tr = synthTrack('stiff.bvh', { seed: 41, duration: 8, impairments: { left: { kneeRange: 0.4 } } });
  const w = makeWindow(tr, 150);
  const m = mirrorWindow(w, NODE_MIRROR);

  it('twice is the identity, bit for bit', () => {
    const mm = mirrorWindow(m, NODE_MIRROR);
    expect(sameBits(mm.observed, w.observed)).toBe(true);
    expect(sameBits(mm.future, w.future)).toBe(true);
    expect(mm.mirrored).toBe(false);
    expect(mm.frame.mirror).toBeNull();
  });

  it('swaps left and right nodes and reflects y (three\'s scale(1, −1, 1) as the reference reflection)', () => {
    const reflect = new Matrix4().makeScale(1, -1, 1);
    for (let t = 0; t < w.observe; t += 11)
      for (const [a, b] of [['l_knee', 'r_knee'], ['r_wrist', 'l_wrist'], ['pelvis', 'pelvis'], ['head', 'head']] as const)
        for (const off of [0, 3]) {
          const o = at(N, t, ix(b)) + off;
          const v = new Vector3(w.observed[o], w.observed[o + 1], w.observed[o + 2]).applyMatrix4(reflect);
          const q = at(N, t, ix(a)) + off;
          expect([m.observed[q], m.observed[q + 1], m.observed[q + 2]]).toEqual([v.x, v.y, v.z]);
        }
  });

  it('keeps the left hip on the subject\'s left (+y) and makes the stiff knee the right one', () => {
    const last = w.observe - 1;
    expect(m.observed[at(N, last, ix('l_hip')) + 1]).toBeGreaterThan(0.05);
    expect(m.observed[at(N, last, ix('r_hip')) + 1]).toBeLessThan(-0.05);
    // Knee flexion: range of the angle at the knee between thigh and shank (Winter 2009: about 60° in
    // normal walking, recalled from memory); the stiff knee (40 % range) moves less.
    const range = (win: typeof w, side: 'l' | 'r') => {
      const node = (j: string) => ix(`${side}_${j}` as never);
      let lo = Infinity, hi = -Infinity;
      for (let t = 0; t < win.observe; t++) {
        const k = at(N, t, node('knee')), h = at(N, t, node('hip')), a = at(N, t, node('ankle'));
        const u = new Vector3(win.observed[h]! - win.observed[k]!, win.observed[h + 1]! - win.observed[k + 1]!, win.observed[h + 2]! - win.observed[k + 2]!);
        const v = new Vector3(win.observed[a]! - win.observed[k]!, win.observed[a + 1]! - win.observed[k + 1]!, win.observed[a + 2]! - win.observed[k + 2]!);
        const angle = u.angleTo(v);
        lo = Math.min(lo, angle); hi = Math.max(hi, angle);
      }
      return hi - lo;
    };
    expect(range(w, 'l')).toBeLessThan(0.9 * range(w, 'r')); // measured 47° against 58°
    expect(range(m, 'r')).toBe(range(w, 'l'));
    expect(range(m, 'l')).toBe(range(w, 'r'));
  });

  it('maps a mirrored window back onto the original take with toWorld', () => {
    const a = w.toWorld(w.observed, new Float64Array(w.observed.length));
    const b = m.toWorld(m.observed, new Float64Array(m.observed.length));
    expect(sameBits(a, b)).toBe(true);
  });

  it('works in place as out of place', () => {
    const copy = Float64Array.from(w.observed);
    mirrorState(copy, NODE_MIRROR, copy);
    expect(sameBits(copy, m.observed)).toBe(true);
  });

  it('moves pair values to the mirror pair, and twice is the identity', () => {
    const width = 2;
    const values = Float64Array.from({ length: DEFAULT_PAIRS.count * width }, (_, i) => i + 0.5);
    const out = mirrorPairValues(values, DEFAULT_PAIRS.mirror, width, new Float64Array(values.length));
    const p = pairIndex(ix('l_hip'), ix('l_knee')), q = pairIndex(ix('r_hip'), ix('r_knee'));
    expect([out[q * 2], out[q * 2 + 1]]).toEqual([values[p * 2], values[p * 2 + 1]]);
    const s = pairIndex(ix('thorax'), ix('head'));
    expect([out[s * 2], out[s * 2 + 1]]).toEqual([values[s * 2], values[s * 2 + 1]]);
    expect(sameBits(mirrorPairValues(out, DEFAULT_PAIRS.mirror, width, out), values)).toBe(true);
  });

  it('a mirrored track is the mirror-image walker: its windows are the mirrored windows, and twice is the identity', () => {
    const mt = mirrorTrack(tr);
    expect(sameBits(mirrorTrack(mt).positions, tr.positions)).toBe(true);
    // The heading frame of the reflected walker is the reflected frame, so the window of the mirrored
    // track equals the mirrored window of the original up to rounding of the frame's rotation.
    const wm = makeWindow(mt, 150);
    let worst = 0;
    for (let i = 0; i < wm.observed.length; i++) worst = Math.max(worst, Math.abs(wm.observed[i]! - m.observed[i]!));
    expect(worst).toBeLessThan(1e-9);
  });
});
