// Per-cycle angle curves from gait events: how cycles are cut, and the results on a synthesized take with the
// detected events against the walker's truth.
import { describe, expect, it } from 'vitest';
import { angleCycles, sideCycles } from '../../src/gait/angles-cycles.js';
import { jointAngles } from '../../src/gait/angles.js';
import { detectEvents } from '../../src/gait/events.js';
import { prepareGait } from '../../src/gait/input.js';
import { meanSd } from '../../src/gait/normalize.js';
import type { GaitEvent } from '../../src/gait/types.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake } from '../../src/synth/index.js';
import { figureInput } from '../fixtures/gait/pose.js';

const ev = (side: 'left' | 'right', kind: GaitEvent['kind'], frame: number, pass = 0, steady = true): GaitEvent =>
  ({ side, kind, frame, time: frame / 100, checkFrame: frame, disagree: false, pass, steady, source: 'file' });

describe('cutting cycles', () => {
  it('joins successive contacts of one side within one pass, steady ones only by default', () => {
    // Left contacts at 10, 110, 210 (pass 0), 400, 500 (pass 1, the last not steady); at 100 fps.
    const events = [ev('left', 'initial_contact', 10), ev('left', 'initial_contact', 110), ev('right', 'initial_contact', 60),
      ev('left', 'initial_contact', 210), ev('left', 'initial_contact', 400, 1), ev('left', 'initial_contact', 500, 1, false)];
    // By hand: 10→110 and 110→210 (pass 0); 210→400 crosses passes; 400→500 ends on a non-steady contact.
    expect(sideCycles(events, 'left', 100, 1000)).toEqual([{ start: 10, end: 110 }, { start: 110, end: 210 }]);
    expect(sideCycles(events, 'left', 100, 1000, false)).toHaveLength(3);
    expect(sideCycles(events, 'right', 100, 1000)).toEqual([]);
  });
  it('shows the pelvis from each side: obliquity up and rotation forward of that side positive', () => {
    // Figure frames 0..4 with obliquity +5° (left hip up) and rotation +8° (turned left: right hip forward).
    const input = figureInput(Array.from({ length: 5 }, () => ({ obliquity: 5, rotation: 8 })));
    input.fps = 100;
    const a = jointAngles(input, new Float64Array(15).fill(0).map((_, i) => (i % 3 === 0 ? 1 : 0)));
    const c = angleCycles(a, [ev('left', 'initial_contact', 0), ev('left', 'initial_contact', 4), ev('right', 'initial_contact', 0), ev('right', 'initial_contact', 4)], { samples: 5 });
    expect(c.left.curves.pelvis_obliquity.mean[2]).toBeCloseTo(5, 9);
    expect(c.right.curves.pelvis_obliquity.mean[2]).toBeCloseTo(-5, 9);
    expect(c.left.curves.pelvis_rotation.mean[2]).toBeCloseTo(-8, 9);
    expect(c.right.curves.pelvis_rotation.mean[2]).toBeCloseTo(8, 9);
  });
});

describe('a default synthesized take with detected events', () => {
  const r = synthesizeTake({ seed: 1 });
  const g = prepareGait(resolveImported('synth-1.bvh', r.take));
  const det = detectEvents(g);
  const c = angleCycles(jointAngles(g, det.direction), det.events);
  for (const side of ['left', 'right'] as const) {
    it(`gives the ${side} side's peak swing knee flexion within 2° of the walker's nominal peak`, () => {
      expect(c[side].cycles.length).toBeGreaterThan(20);
      const pk = meanSd(c[side].peakSwingKneeFlexion);
      expect(pk.n).toBe(c[side].cycles.length);
      expect(Math.abs(pk.mean - r.truth.sides[side].nominalPeakKneeDeg)).toBeLessThan(2);
      // 101 samples per curve (0-100 % of the cycle, common practice).
      expect(c[side].curves.knee_flexion.mean.length).toBe(101);
    });
    it(`reads the ${side} foot's toe-out in mid-stance within 1.5° of the walker's`, () => {
      // 20 % of the cycle is mid-stance (foot flat on the floor, common practice).
      expect(Math.abs(c[side].curves.foot_progression.mean[20]! - r.truth.sides[side].toeOutDeg)).toBeLessThan(1.5);
    });
    it(`places the ${side} toe-off near the walker's stance fraction`, () => {
      expect(Math.abs(meanSd(c[side].toeOffPct).mean - 100 * r.truth.summary.stanceFraction[side])).toBeLessThan(2);
    });
    it(`has the ${side} hip forward at its own contact (pelvis rotation seen from that side positive)`, () => {
      // At initial contact the pelvis is rotated forward on the leading side (common practice, a few degrees).
      expect(c[side].curves.pelvis_rotation.mean[0]).toBeGreaterThan(1);
    });
  }
});
