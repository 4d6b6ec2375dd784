// Building a reference from a few synthesized control takes, and reading norms files back (or refusing them).
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { InputError } from '../../src/errors/index.js';
import { analyzeGait } from '../../src/gait/analyze.js';
import { GDI_MIN_STRIDES, GPS_MIN_STRIDES, buildNorms, type BuildOptions, type ControlTake } from '../../src/norms/build.js';
import { sampleTake } from '../../src/norms/collect.js';
import { NORMS_FORMAT, normsJson, parseNorms, readNormsFile } from '../../src/norms/format.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake } from '../../src/synth/index.js';

const OPTS: BuildOptions = {
  speedBands: true, synthetic: true, tool_version: '0.0.0', date: '2031-01-01', build: null, description: 'test controls',
  analysis: { lowpass_hz: 6, steady_state_only: true },
};

function control(seed: number, duration: number): ControlTake {
  const file = `control-${seed}.bvh`;
  return { sample: sampleTake(analyzeGait(resolveImported(file, synthesizeTake({ seed, duration }).take)), file), sha256: `hash-${seed}` };
}

let controls: ControlTake[];
const tmp = mkdtempSync(join(tmpdir(), 'jointloom-norms-'));
beforeAll(() => { controls = [7501, 7502, 7503, 7504, 7505].map((s) => control(s, 16)); });
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('buildNorms', () => {
  it('per-sample mean and SD over every stride of both sides (simple-statistics as the reference)', () => {
    const { norms } = buildNorms(controls, OPTS);
    const all = norms.bands.all!;
    const strides = controls.reduce((n, c) => n + c.sample.left.cycles + c.sample.right.cycles, 0);
    expect(all.strides).toBe(strides);
    expect(all.takes).toBe(5);
    for (const i of [0, 37, 72, 100]) {
      const xs: number[] = [];
      for (const c of controls) for (const s of [c.sample.left, c.sample.right]) for (let k = 0; k < s.cycles; k++) xs.push(s.curves.knee_flexion[k * 101 + i]!);
      expect(all.curves.knee_flexion!.mean[i]).toBeCloseTo(ssMean(xs), 4);
      expect(all.curves.knee_flexion!.sd[i]).toBeCloseTo(sampleStandardDeviation(xs), 4);
    }
    const cad = controls.flatMap((c) => [...c.sample.left.parameters.cadence_steps_per_min!, ...c.sample.right.parameters.cadence_steps_per_min!]);
    expect(all.parameters.cadence_steps_per_min!.mean).toBeCloseTo(ssMean(cad), 5);
    expect(all.parameters.cadence_steps_per_min!.n).toBe(cad.length);
  });

  it('the deviation model needs about 90 strides; bands below 20 strides are left out with the reason', () => {
    expect([GPS_MIN_STRIDES, GDI_MIN_STRIDES]).toEqual([20, 90]);
    const { norms, notes } = buildNorms(controls, OPTS);
    expect(norms.bands.all!.deviation!.features).toBe(15);
    expect(norms.bands.all!.deviation!.strides).toBeGreaterThanOrEqual(90);
    // Default walkers (1.3 m/s, 1.75 m) are self-selected; no slow or fast controls.
    expect(Object.keys(norms.bands).sort()).toEqual(['all', 'self_selected']);
    expect(norms.skipped_bands.map((b) => b.band)).toEqual(['slow', 'fast']);
    expect(notes.join('\n')).toMatch(/speed band slow left out: 0 strides, fewer than the 20/);
    const small = buildNorms(controls.slice(0, 2), OPTS);
    expect(small.norms.bands.all!.deviation).toBeNull();
    expect(small.norms.bands.all!.deviation_note).toMatch(/fewer than the 90/);
  });

  it('refuses a reference from fewer strides than the profile score needs, with a clear message', () => {
    const short = control(7506, 7);
    expect(() => buildNorms([short], OPTS)).toThrow(InputError);
    expect(() => buildNorms([short], OPTS)).toThrow(/only \d+ strides .* at least 20 for the profile score/);
    expect(() => buildNorms([], OPTS)).toThrow(/no control takes/);
  });

  it('records the provenance: takes, hashes, version, date, synthetic flag and label', () => {
    const { norms } = buildNorms(controls, OPTS);
    const p = norms.provenance;
    expect(p.takes.map((t) => t.sha256)).toEqual(controls.map((c) => c.sha256));
    expect(p.takes[0]!.stratum).toBe('self_selected');
    expect(p).toMatchObject({ synthetic: true, label: 'synthetic reference, not clinical', tool_version: '0.0.0', date: '2031-01-01' });
    expect(normsJson(norms)).toBe(normsJson(buildNorms(controls, OPTS).norms)); // same input, same bytes
  });
});

describe('norms file', () => {
  it('reads back what was written', () => {
    const { norms } = buildNorms(controls, OPTS);
    const f = join(tmp, 'n.json');
    writeFileSync(f, normsJson(norms));
    expect(readNormsFile(f)).toEqual(JSON.parse(normsJson(norms)));
  });

  it('refuses a corrupt, foreign, newer or truncated file with an InputError naming the file and the fault', () => {
    const good = JSON.parse(normsJson(buildNorms(controls, OPTS).norms));
    const bad = (text: string) => () => parseNorms(text, 'x.json');
    expect(bad('{"format": ')).toThrow(/x\.json: not a norms file: the JSON does not parse/);
    expect(bad(JSON.stringify({ ...good, format: 'other' }))).toThrow(/"format" is "other", expected "jointloom-norms"/);
    expect(bad(JSON.stringify({ ...good, version: 2 }))).toThrow(/from a newer jointloom/);
    const cut = structuredClone(good);
    cut.bands.all.curves.knee_flexion.mean.pop();
    expect(bad(JSON.stringify(cut))).toThrow(/bands\.all\.curves\.knee_flexion\.mean" is not 101 numbers/);
    const gdi = structuredClone(good);
    gdi.bands.all.deviation.basis = [1, 2];
    expect(bad(JSON.stringify(gdi))).toThrow(/deviation\.basis/);
    expect(bad('[]')).toThrow(InputError);
    expect(() => readNormsFile(join(tmp, 'none.json'))).toThrow(/cannot read the norms file \(no such file\)/);
    expect(good.format).toBe(NORMS_FORMAT);
  });
});
