// The shipped synthetic reference at work: a take with a 30 % smaller right knee range (kneeRange 0.7) leaves
// the knee band in swing and scores a larger profile score than the 95th percentile of held-out controls
// (seeds 7600-7619, drawn from the same cohort design as the reference but not part of it).
import { existsSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { COHORT_SEEDS, REFERENCE_FILE, controlOptions } from '../../scripts/make-reference.js';
import { DEMO_TAKES } from '../../scripts/demo-clinic.js';
import { analyzeGait, type GaitAnalysis } from '../../src/gait/analyze.js';
import { SYNTHETIC_LABEL, readNormsFile, type NormsFile } from '../../src/norms/format.js';
import { quantile } from '../../src/norms/profile.js';
import { scoreAgainstNorms, type NormsScore } from '../../src/norms/score.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake, type SynthOptions } from '../../src/synth/index.js';

const HELD_OUT = Array.from({ length: 20 }, (_, i) => 7600 + i);
const analyse = (o: Partial<SynthOptions> & { seed: number }): GaitAnalysis => analyzeGait(resolveImported(`take-${o.seed}.bvh`, synthesizeTake({ ...o, duration: 14 }).take));

let norms: NormsFile;
let controls: NormsScore[];
let impaired: NormsScore;
beforeAll(() => {
  norms = readNormsFile(REFERENCE_FILE);
  controls = HELD_OUT.map((seed) => scoreAgainstNorms(analyse(controlOptions(seed, 1)), norms, 'shipped'));
  impaired = scoreAgainstNorms(analyse({ seed: 7620, impairments: { right: { kneeRange: 0.7 } } }), norms, 'shipped');
});

describe('shipped reference', () => {
  it('exists, is synthetic and labelled so, from seeds 30000-30059 disjoint from the demo and the held-out seeds', () => {
    expect(existsSync(REFERENCE_FILE)).toBe(true);
    expect(norms.provenance.synthetic).toBe(true);
    expect(norms.provenance.label).toBe(SYNTHETIC_LABEL);
    expect(norms.provenance.date).toBeNull(); // no clock date inside: the file rebuilds byte for byte
    expect(norms.provenance.takes.map((t) => t.file)).toEqual(COHORT_SEEDS.map((s) => `synthetic-control-${s}.bvh`));
    const others = new Set([...DEMO_TAKES.map((t) => t.options.seed), ...HELD_OUT, 7620]);
    expect(COHORT_SEEDS.filter((s) => others.has(s))).toEqual([]);
    expect(Object.keys(norms.bands).sort()).toEqual(['all', 'fast', 'self_selected', 'slow']);
    for (const b of Object.values(norms.bands)) expect(b!.deviation).not.toBeNull();
  });
});

describe('a right knee with 30 % less range against the shipped reference', () => {
  it('held-out controls are scored against the self-selected band, as is the impaired take', () => {
    expect(controls.every((c) => c.reference.band === 'self_selected')).toBe(true);
    expect(impaired.reference.band).toBe('self_selected');
    expect(impaired.reference.label).toBe(SYNTHETIC_LABEL);
  });

  it('lies outside mean ± 2 SD in swing on the right knee, not on the left', () => {
    const right = impaired.outside.knee_flexion!.right;
    // Peak swing knee flexion sits near 70-75 % of the cycle (common practice).
    expect(right.some(([a, b]) => a <= 72 && b >= 75)).toBe(true);
    const span = (runs: [number, number][]) => runs.reduce((s, [a, b]) => s + b - a + 1, 0);
    expect(span(right)).toBeGreaterThan(30);
    expect(span(impaired.outside.knee_flexion!.left)).toBeLessThan(10);
    expect(impaired.parameters.knee_flexion_rom_deg!.outside).toEqual(['right']);
  });

  it('has a profile score above the held-out controls\' 95th percentile, and its right GDI is the lower', () => {
    const p95 = quantile(controls.map((c) => c.gps.overall!), 0.95);
    expect(impaired.gps.overall!).toBeGreaterThan(p95);
    const sideP95 = quantile(controls.flatMap((c) => [c.gps.left!, c.gps.right!]), 0.95);
    expect(impaired.gps.right!).toBeGreaterThan(sideP95);
    expect(impaired.gvs.knee_flexion!.right!).toBeGreaterThan(3 * impaired.gvs.knee_flexion!.left!);
    expect(impaired.gdi!.right.gdi!).toBeLessThan(impaired.gdi!.left.gdi! - 5);
    console.log(`held-out controls GPS 95th percentile ${p95.toFixed(3)} (side ${sideP95.toFixed(3)}); impaired GPS ${impaired.gps.overall} (right ${impaired.gps.right}); GDI left ${impaired.gdi!.left.gdi} right ${impaired.gdi!.right.gdi}`);
  });
});
