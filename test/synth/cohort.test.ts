// The invented cohorts of src/synth/cohort.ts: every cohort draws its walkers from its own seeds, so no
// walker the model trains on, or the joint prototypes are fitted on, appears in an evaluation; the
// joint-profile development cohort holds the joint-range kinds in both arms and the side-only kinds by
// the walker, on both sides, with ids of its own.
import { describe, expect, it } from 'vitest';
import { asymmetryCohort, calibrationCohort, heldOutCohort, JOINT_RANGE_KINDS, jointOfKind, jointProfileCohort, jointProfileControls, normativeCohort, SIDE_ONLY_KINDS, trainingCohort } from '../../src/synth/cohort.js';

describe('cohorts', () => {
  const seeds = {
    training: trainingCohort().map((s) => s.options.seed),
    calibration: calibrationCohort().map((s) => s.options.seed),
    normative: normativeCohort().map((s) => s.options.seed),
    heldOut: heldOutCohort().map((s) => s.options.seed),
    validation: asymmetryCohort().map((s) => s.options.seed),
    development: jointProfileCohort().map((s) => s.options.seed),
    developmentControls: jointProfileControls().map((s) => s.options.seed),
  };

  it('never share a walker seed', () => {
    const entries = Object.entries(seeds);
    for (const [a, xs] of entries)
      for (const [b, ys] of entries) {
        if (a >= b) continue;
        const set = new Set(xs);
        expect(ys.filter((y) => set.has(y)), `${a} and ${b}`).toEqual([]);
      }
  });

  it('continue the training sequence for the spread calibration subjects, every group of its mix among them', () => {
    const cal = calibrationCohort(32, 16), longer = trainingCohort(48);
    expect(cal.map((s) => s.id)).toEqual(Array.from({ length: 16 }, (_, i) => `CA${String(i + 1).padStart(3, '0')}`));
    // The same walkers as training subjects 33-48 would be, under their own ids.
    expect(cal.map((s) => [s.group, s.options])).toEqual(longer.slice(32).map((s) => [s.group, s.options]));
    expect(new Set(cal.map((s) => s.group))).toEqual(new Set(['normal', 'impaired', 'variable']));
  });

  it('add noisy captures to the held-out cohort after every other group, which keep their seeds', () => {
    const ho = heldOutCohort(5);
    expect(ho.map((s) => s.group)).toEqual(['normal', 'impaired', 'variable', 'other', 'stumble', 'noisy'].flatMap((g) => Array(5).fill(g)));
    // Seeds 70000 + position: the first 25 subjects are those scored before the noisy group was added.
    expect(ho.map((s) => s.options.seed)).toEqual(Array.from({ length: 30 }, (_, i) => 70000 + i));
    const noisy = ho.filter((s) => s.group === 'noisy').map((s) => s.options.noise!);
    expect(noisy[0]).toEqual({ rotationDeg: 0.3, positionMm: 1 });
    expect(noisy[4]).toEqual({ rotationDeg: 1, positionMm: 3 });
    expect(ho.filter((s) => s.group !== 'noisy').every((s) => s.options.noise === undefined)).toBe(true);
  });

  it('give the joint-profile development cohort 16 subjects per kind and stratum in each arm', () => {
    const dev = jointProfileCohort();
    // 4 walker-made joint kinds × 3 strata × 16 + 4 edited joints × 3 strata × 16 + 2 side-only kinds × 3 strata × 16.
    expect(dev).toHaveLength(480);
    expect(new Set(dev.filter((s) => s.arm === 'synth').map((s) => s.kind))).toEqual(new Set([...JOINT_RANGE_KINDS, ...SIDE_ONLY_KINDS]));
    expect(new Set(dev.map((s) => s.id)).size).toBe(480);
    expect(new Set(dev.filter((s) => s.arm === 'edit').map((s) => s.kind))).toEqual(new Set(['hip', 'knee', 'ankle', 'shoulder']));
    expect(dev.some((s) => s.side === 'left') && dev.some((s) => s.side === 'right')).toBe(true);
    expect(dev.every((s) => s.arm !== 'control' && s.id.startsWith('D'))).toBe(true);
    const controls = jointProfileControls();
    expect(controls).toHaveLength(48);
    expect(controls.every((s) => s.arm === 'control' && s.kind === null && s.id.startsWith('DC'))).toBe(true);
    expect(new Set([...dev, ...controls].map((s) => s.id)).size).toBe(528);
  });

  it('maps each impairment kind to the joint it narrows (arm swing and the edited shoulder to the shoulder/arm)', () => {
    expect(['hip', 'knee', 'ankle', 'arm', 'shoulder', 'stance', 'step', null].map(jointOfKind)).toEqual(['hip', 'knee', 'ankle', 'shoulder/arm', 'shoulder/arm', null, null, null]);
  });

  it('keeps the validation cohort as before (ids and seeds of its first and last subjects)', () => {
    const v = asymmetryCohort();
    expect(v).toHaveLength(320);
    expect([v[0]!.id, v[0]!.options.seed]).toEqual(['VC001', 40000]);
    expect([v[80]!.id, v[80]!.options.seed]).toEqual(['VI081', 40080]);
    expect([v[319]!.id, v[319]!.options.seed]).toEqual(['VE320', 50095]);
  });
});
