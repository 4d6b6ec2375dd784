// The straight-walking domain check of the model-based stages: invented takes from the project's own
// synthesizer (behaviour, not a reference figure): straight walks, with or without an impairment, stay far
// below the limit; a walkway with 180° turns and a serpentine lie far above it. Outside the domain the
// coupling stage keeps its score but raises no flag and warns; the forecast stage flags the take's domain.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { SHIPPED_NORMS } from '../../src/cli/gait.js';
import { defaultModelPath } from '../../src/model/default-model.js';
import { DOMAIN_LIMIT_MM, domainCheck } from '../../src/model/domain.js';
import { trackFromImported } from '../../src/motion/track.js';
import { scoreTake, type ScoreOptions } from '../../src/score/compose.js';
import { COUPLING_STAGE } from '../../src/score/coupling-stage.js';
import { FORECAST_STAGE } from '../../src/score/forecast-stage.js';
import { GAIT_STAGE } from '../../src/score/stages.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake } from '../../src/synth/index.js';
import type { SynthOptions } from '../../src/synth/options.js';

const work = mkdtempSync(join(tmpdir(), 'jointloom-domain-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const take = (o: Partial<SynthOptions>) => synthesizeTake({ seed: 8101, duration: 30, ...o });
const check = (o: Partial<SynthOptions>) => {
  const t = take(o);
  return domainCheck(trackFromImported(resolveImported('d.bvh', t.take), { rate: 30 }), 150, 30);
};

describe('straight-walking domain', () => {
  it('straight walks lie inside with a wide margin, turning and curving paths far outside', () => {
    const straight = check({}), impaired = check({ impairments: { right: { kneeRange: 0.6 } } });
    const walkway = check({ path: { kind: 'walkway' } }), serpentine = check({ path: { kind: 'serpentine' } });
    for (const d of [straight, impaired]) {
      expect(d.inside).toBe(true);
      expect(d.strideMeanMm!).toBeLessThan(DOMAIN_LIMIT_MM / 3);
    }
    for (const d of [walkway, serpentine]) {
      expect(d.inside).toBe(false);
      expect(d.strideMeanMm!).toBeGreaterThan(3 * DOMAIN_LIMIT_MM);
    }
  });

  it('a take too short for one forecast is not judged', () => {
    const t = trackFromImported(resolveImported('d.bvh', synthesizeTake({ seed: 8102, duration: 5 }).take), { rate: 30 });
    expect(domainCheck(t, 150, 30)).toEqual({ strideMeanMm: null, inside: true });
  });

  it('outside it the coupling stage keeps its score but raises no flag, the coupling stage warns and the forecast stage flags the reason', () => {
    const o: ScoreOptions = {
      tool: 'jointloom', toolVersion: '0.0.0-test', lowpassHz: 6, steadyOnly: true,
      normsFile: SHIPPED_NORMS, normsSha256: null, model: { file: defaultModelPath(), file_sha256: 'x', used: false },
    };
    const bytes = Buffer.from(take({ path: { kind: 'walkway' } }).bvhText, 'utf8');
    const r = scoreTake(bytes, join(work, 'walkway.bvh'), o, [GAIT_STAGE, FORECAST_STAGE, COUPLING_STAGE]);
    expect(r.metrics['coupling.asymmetry_score']).toEqual(expect.any(Number));
    expect(r.flags.filter((f) => f.stage === 'coupling')).toEqual([]);
    expect(r.warnings.some((w) => /straight-walking training/.test(w) && /coupling asymmetry .* is not flagged/.test(w))).toBe(true);
    // The forecast stage flags it, so the cohort report's flagged takes show why the figures are in doubt.
    const domainFlags = r.flags.filter((f) => f.stage === 'forecast' && f.measure === 'domain');
    expect(domainFlags).toHaveLength(1);
    expect(domainFlags[0]!.value).toBeGreaterThan(DOMAIN_LIMIT_MM);
    expect(domainFlags[0]!.text).toMatch(/straight-walking training, so its forecast, irregular-motion and coupling figures cannot be relied on/);
  }, 60_000);
});
