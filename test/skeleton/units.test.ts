// Units and up-axis detection on the role fixtures. Expected answers come from construction
// (test/fixtures/roles/bodies.ts): each style is built in a known unit and axis convention from a
// body with an 85 cm leg (thigh 43 + shank 42) and a 175 cm head top over a floor 1 cm below the toes' level.
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readBvhFile } from '../../src/bvh/parse.js';
import { UsageError } from '../../src/errors/index.js';
import { forwardKinematics } from '../../src/skeleton/fk.js';
import { parseUnits, parseUp, resolveFrame } from '../../src/skeleton/frame.js';
import { inferRoles } from '../../src/skeleton/roles.js';
import { detectUnits, detectUp, METRES_PER_UNIT, type Units } from '../../src/skeleton/units.js';
import { STYLES, buildBody, style, type Style } from '../fixtures/roles/bodies.js';

const FIXTURES = join(import.meta.dirname, '..', 'fixtures', 'roles');

/** The unit a style was built in (its units per centimetre). */
function builtUnits(st: Style): Units {
  return st.unitsPerCm === 1 ? 'cm' : st.unitsPerCm === 0.01 ? 'm' : st.unitsPerCm === 10 ? 'mm' : 'in';
}

describe('units', () => {
  for (const st of STYLES) {
    it(`${st.id}: built in ${builtUnits(st)}`, () => {
      const u = detectUnits(buildBody(st).take);
      expect(u.units).toBe(builtUnits(st));
      expect(u.metresPerUnit).toBe(METRES_PER_UNIT[builtUnits(st)]);
      // Leg 85 cm by construction, in any unit: hip to knee 43 cm plus knee to ankle 42 cm.
      expect(u.candidates[0]!.legMetres).toBeCloseTo(0.85, 9);
    });
    it(`${st.id}.bvh: built in ${builtUnits(st)}, read through the parser`, () => {
      expect(detectUnits(readBvhFile(join(FIXTURES, `${st.id}.bvh`))).units).toBe(builtUnits(st));
    });
  }

  it('states leg length and standing height with the arithmetic a reader can check', () => {
    const u = detectUnits(buildBody(style('camel-prefix-cm-yup')).take);
    expect(u.evidence[0]).toBe('Leg length (hip to ankle) is 85.0 file units, which is 0.850 m if cm (adult range 0.6-1.1 m).');
    // Head top 175 cm, lowest foot point 1 cm (ankle 7 cm, toe 6 cm lower), measured along the rest up.
    expect(u.candidates[0]!.statureMetres).toBeCloseTo(1.74, 2);
    // 85 / 174 = 0.4885.
    expect(u.evidence[2]).toBe('Leg length is 0.489 of standing height, within the usual 0.45-0.53.');
    expect(u.confidence).toBe(0.95);
  });

  it('lists both readings and lowers confidence when inches and cm both give a person', () => {
    // 85 cm written in inches is 33.5 units: 0.85 m as inches (adult), 0.335 m as cm (a small child);
    // standing height 175 − 1 = 174 cm (head top over the lowest foot point).
    const u = detectUnits(buildBody(style('namespace-hyphen-inches')).take);
    expect(u.units).toBe('in');
    expect(u.candidates.map((c) => c.units).slice(0, 2)).toEqual(['in', 'cm']);
    expect(u.candidates[1]!.legMetres).toBeCloseTo(0.335, 3);
    expect(u.confidence).toBeLessThan(0.8);
    expect(u.confidence).toBeGreaterThan(0.5);
    const both = u.evidence.find((e) => e.startsWith('Two units fit'));
    expect(both).toContain('inches gives an adult (leg 0.85 m, height 1.74 m)');
    expect(both).toContain('cm gives a child');
    expect(both).toContain('--units');
  });

  it('detects millimetres and says so when no unit gives a person', () => {
    expect(detectUnits(buildBody({ ...style('camel-prefix-cm-yup'), unitsPerCm: 10 }).take).units).toBe('mm');
    const odd = detectUnits(buildBody({ ...style('camel-prefix-cm-yup'), unitsPerCm: 1000 }).take);
    expect(odd.confidence).toBeLessThanOrEqual(0.2);
    expect(odd.evidence).toContain('No unit puts the skeleton in the human range; pass --units to set them.');
  });
});

describe('up axis', () => {
  const builtUp = (st: Style) => (st.axes.startsWith('Z') ? 'z' : 'y');
  for (const st of STYLES) {
    it(`${st.id}: built ${st.axes}`, () => {
      const d = detectUp(buildBody(st).take);
      expect(d.up).toBe(builtUp(st));
      expect(d.sign).toBe(1);
      expect(d.confidence).toBeGreaterThan(0.9);
    });
    it(`${st.id}.bvh: built ${st.axes}, read through the parser`, () => {
      expect(detectUp(readBvhFile(join(FIXTURES, `${st.id}.bvh`))).up).toBe(builtUp(st));
    });
  }

  it('gives the head-over-feet distance and the floor as evidence', () => {
    const d = detectUp(buildBody(style('suffix-cm-zup')).take);
    // Head joint 160 cm; feet points (ankle 7, toe 1 cm) average 4 cm: 156 cm apart at rest, nearly so in motion.
    expect(d.evidence[0]).toMatch(/^Over 4 sampled frames the head stays on average 15\d\.\d units from the feet along \+Z/);
    expect(d.evidence[1]).toMatch(/^The lower foot's height along \+Z varies by \d\.\d units over the take/);
    expect(d.vector).toEqual([0, 0, 1]);
    expect(d.restVector).toEqual([0, 0, 1]);
  });

  it('reports a take written upside down (−Y up) with sign −1', () => {
    const d = detectUp(buildBody({ ...style('camel-prefix-cm-yup'), axes: 'Y-down facing +Z' }).take);
    expect(d.up).toBe('y');
    expect(d.sign).toBe(-1);
    expect(d.vector).toEqual([0, -1, 0]);
    expect(d.evidence.some((e) => e.includes('upside down'))).toBe(true);
  });

  it('uses the motion when the root turns a Y-up rest pose upright along Z', () => {
    const b = buildBody(style('camel-prefix-cm-yup'));
    const root = b.take.joints[0]!;
    const xr = root.channelStart + root.channels.indexOf('Xrotation');
    // Xrotation +90° maps +Y to +Z: R_x(90)·(0,1,0) = (0, cos 90, sin 90) = (0, 0, 1).
    for (let f = 0; f < b.take.frameCount; f++) b.take.values[f * b.take.channelCount + xr] = 90;
    const d = detectUp(b.take);
    expect(d.up).toBe('z');
    expect(d.restVector).toEqual([0, 1, 0]);
    expect(d.evidence.some((e) => e.startsWith('The rest pose stands along +Y but the motion stands along +Z'))).toBe(true);
  });

  it('falls back on the rest pose for a take without frames and accepts precomputed positions', () => {
    const still = detectUp(buildBody(style('suffix-cm-zup'), 0).take);
    expect(still.up).toBe('z');
    expect(still.evidence[0]).toMatch(/^In the rest pose the head lies 156\.0 units from the feet along \+Z/);
    const take = buildBody(style('dotted-metres-reference')).take;
    expect(detectUp(take, forwardKinematics(take))).toEqual(detectUp(take));
  });
});

describe('resolveFrame', () => {
  it('returns the detections unflagged when nothing is overridden', () => {
    const take = buildBody(style('suffix-cm-zup')).take;
    const fr = resolveFrame(take);
    expect(fr.units.overridden).toBe(false);
    expect(fr.up.overridden).toBe(false);
    expect(fr.units.units).toBe('cm');
    expect(fr.up.up).toBe('z');
    expect(fr.roles.roles.l_knee!.name).toBe(inferRoles(take).roles.l_knee!.name);
  });

  it('lets the caller set units and up, keeping what the detection said', () => {
    const take = buildBody(style('namespace-hyphen-inches')).take;
    const fr = resolveFrame(take, { units: 'cm', up: 'z' });
    expect(fr.units).toMatchObject({ units: 'cm', metresPerUnit: 0.01, confidence: 1, overridden: true });
    expect(fr.units.evidence[0]).toBe('Units set by the caller to cm; the detection alone would have chosen in.');
    expect(fr.up).toMatchObject({ up: 'z', sign: 1, vector: [0, 0, 1], overridden: true });
    expect(fr.up.evidence[0]).toBe('Up axis set by the caller to z; the detection alone would have chosen y.');
    const same = resolveFrame(take, { units: 'in' });
    expect(same.units.evidence[0]).toBe('Units set by the caller to in, as detected.');
  });

  it('reads command-line values and refuses others with a usage error', () => {
    expect(parseUnits('Inches')).toBe('in');
    expect(parseUnits('cm')).toBe('cm');
    expect(parseUnits('metres')).toBe('m');
    expect(parseUp('Y')).toBe('y');
    expect(parseUp('+z')).toBe('z');
    expect(parseUp('-y')).toBe('-y');
    expect(() => parseUnits('furlong')).toThrow(UsageError);
    expect(() => parseUp('x')).toThrow(UsageError);
  });
});
