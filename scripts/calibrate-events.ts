// Fits the bias corrections of the gait-event detectors on a fixed synthetic cohort and prints them;
// with --write it rewrites src/gait/calibration.ts. Run: npx tsx scripts/calibrate-events.ts [--write]
//
// Cohort: seeds 1000-1039 of the src/synth walker, straight walking, 20 s at 120 Hz each, heights
// 1.55-1.95 m, speeds 0.8-1.6 m/s with cadence to match, every fifth take with a one-sided impairment,
// mixed units and up axes, light sensor noise on half. The evaluation seeds (5000 and up, in
// test/gait/events-accuracy.test.ts) are never used here.
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { type EventBias, detectEvents } from '../src/gait/events.js';
import { type EventComparison, type ReferenceEvent, compareEvents, quantile } from '../src/gait/events-compare.js';
import { prepareGait } from '../src/gait/input.js';
import type { EventDetection, EventKind, SideName } from '../src/gait/types.js';
import { resolveImported } from '../src/skeleton/import.js';
import { type SynthOptions, type SynthTruth, synthesizeTake } from '../src/synth/index.js';
import { Mulberry32 } from '../src/synth/prng.js';
import { writeFileAtomic } from '../src/util/atomic.js';

/** Seeds of the calibration cohort. */
export const CALIBRATION_SEEDS = Array.from({ length: 40 }, (_, i) => 1000 + i);

export type CohortKind = 'straight' | 'turns' | 'stumble';

/** Returns the walker options of cohort member `seed`: a person, a speed and, by kind, a path or a stumble. */
export function cohortOptions(seed: number, kind: CohortKind, duration = 20): Partial<SynthOptions> & { seed: number } {
  const r = new Mulberry32(seed * 7919 + 17);
  const u = (a: number, b: number) => a + (b - a) * r.next();
  const height = u(1.55, 1.95);
  const speed = u(0.8, 1.6);
  // Cadence rises with speed and falls with stature (common practice: step length ~ speed^0.45, leg length).
  const cadence = Math.min(135, Math.max(80, 110 * (speed / 1.3) ** 0.55 * (1.75 / height) ** 0.5));
  const o: Partial<SynthOptions> & { seed: number } = {
    seed, height, speed, cadence, duration, frameRate: 120,
    units: seed % 2 ? 'cm' : 'm', upAxis: seed % 3 ? 'Y' : 'Z',
    noise: seed % 2 ? { rotationDeg: 0.3, positionMm: 1 } : { rotationDeg: 0, positionMm: 0 },
  };
  if (seed % 5 === 0) {
    const side = r.next() < 0.5 ? 'left' : 'right';
    const pick = Math.floor(r.next() * 4);
    o.impairments = { [side]: [{ kneeRange: 0.5 }, { stanceShortening: 0.6 }, { stepShortening: 0.5 }, { ankleRange: 0.4 }][pick]!, };
    o.impairments[side]!.compensate = true;
  }
  if (kind === 'turns') {
    const which = seed % 3;
    o.path = which === 0 ? { kind: 'walkway', radius: u(1, 1.5), length: u(5, 8), turn: r.next() < 0.5 ? 'left' : 'right' }
      : which === 1 ? { kind: 'circle', radius: u(3, 5), turn: r.next() < 0.5 ? 'left' : 'right' }
        : { kind: 'serpentine', amplitudeDeg: u(15, 30), wavelength: u(6, 10) };
  }
  if (kind === 'stumble') o.stumbles = [{ time: duration / 2, side: r.next() < 0.5 ? 'left' : 'right', severity: 1 }];
  return o;
}

/** Returns the truth events of a synthetic take as reference events (time = frame / rate). */
export function truthEvents(truth: SynthTruth): ReferenceEvent[] {
  const out: ReferenceEvent[] = [];
  for (const side of ['left', 'right'] as SideName[]) {
    const e = truth.events[side];
    const add = (kind: EventKind, frames: number[]) => { for (const f of frames) out.push({ side, kind, time: f / truth.frameRate }); };
    add('initial_contact', e.initialContactFrames);
    add('toe_off', e.toeOffFrames);
  }
  return out;
}

/** One cohort take run through detection and compared with its truth. */
export interface TakeEvaluation {
  seed: number;
  options: Partial<SynthOptions>;
  truth: SynthTruth;
  detection: EventDetection;
  comparison: EventComparison;
  /** |detected frame − truth frame| of every pair. */
  frameErrors: number[];
  /** Signed errors (frames) of the velocity cross-check against the truth, by kind. */
  checkErrors: { initial_contact: number[]; toe_off: number[] };
}

/** Returns the evaluation of one synthetic take: detect with `bias`, pair with the truth within 0.2 s. */
export function evaluateTake(options: Partial<SynthOptions> & { seed: number }, bias?: Partial<EventBias>, steadyOnly = true): TakeEvaluation {
  const { take, truth } = synthesizeTake(options);
  const input = prepareGait(resolveImported(`synth-${options.seed}.bvh`, take));
  const detection = detectEvents(input, { bias, steadyOnly });
  const fps = truth.frameRate;
  // A truth event counts as missed only inside a pass and clear of its edges by a quarter second.
  const inside = (t: number) => detection.passes.some((p) => t * fps >= p.startFrame + 0.25 * fps && t * fps < p.endFrame - 0.25 * fps);
  const comparison = compareEvents(detection.events, truthEvents(truth), 0.2, inside);
  const frameErrors = comparison.pairs.map((p) => Math.abs(Math.round(p.time * fps) - Math.round(p.referenceTime * fps)));
  const checkErrors = { initial_contact: [] as number[], toe_off: [] as number[] };
  for (const e of detection.events) {
    if (e.checkFrame === null) continue;
    const pair = comparison.pairs.find((p) => p.side === e.side && p.kind === e.kind && p.time === e.time);
    if (pair) checkErrors[e.kind].push(e.checkFrame - Math.round(pair.referenceTime * fps));
  }
  return { seed: options.seed, options, truth, detection, comparison, frameErrors, checkErrors };
}

/** Returns the mean of the central 80 % of the values (a robust centre with sub-frame resolution). */
export function trimmedMean(values: readonly number[]): number {
  const lo = quantile(values, 0.1), hi = quantile(values, 0.9);
  const mid = values.filter((v) => v >= lo && v <= hi);
  return mid.reduce((a, b) => a + b, 0) / mid.length;
}

/** Returns the fitted bias (seconds) from uncorrected runs over the calibration cohort, with a summary. */
export function fitBias(seeds: readonly number[] = CALIBRATION_SEEDS): { bias: EventBias; counts: Record<string, number> } {
  const zero: EventBias = { contact: 0, toeOff: 0, contactCheck: 0, toeOffCheck: 0 };
  const err = { ic: [] as number[], to: [] as number[], icc: [] as number[], toc: [] as number[] };
  for (const seed of seeds) {
    const ev = evaluateTake(cohortOptions(seed, 'straight'), zero, false);
    const fps = ev.truth.frameRate;
    for (const p of ev.comparison.pairs) (p.kind === 'initial_contact' ? err.ic : err.to).push(p.errorS);
    for (const x of ev.checkErrors.initial_contact) err.icc.push(x / fps);
    for (const x of ev.checkErrors.toe_off) err.toc.push(x / fps);
  }
  const r4 = (x: number) => Math.round(x * 1e4) / 1e4;
  return {
    bias: { contact: r4(-trimmedMean(err.ic)), toeOff: r4(-trimmedMean(err.to)), contactCheck: r4(-trimmedMean(err.icc)), toeOffCheck: r4(-trimmedMean(err.toc)) },
    counts: { contact: err.ic.length, toeOff: err.to.length, contactCheck: err.icc.length, toeOffCheck: err.toc.length },
  };
}

/** Returns the text of src/gait/calibration.ts with the given bias written in. */
export function calibrationSource(current: string, bias: EventBias): string {
  const set = (text: string, name: string, v: number) => text.replace(new RegExp(`(export const ${name} = )[^;]+;`), `$1${v};`);
  let t = set(current, 'CONTACT_BIAS_S', bias.contact);
  t = set(t, 'TOE_OFF_BIAS_S', bias.toeOff);
  t = set(t, 'CONTACT_CHECK_BIAS_S', bias.contactCheck);
  return set(t, 'TOE_OFF_CHECK_BIAS_S', bias.toeOffCheck);
}

function main(): void {
  const { bias, counts } = fitBias();
  console.log(`calibration cohort: seeds ${CALIBRATION_SEEDS[0]}-${CALIBRATION_SEEDS[CALIBRATION_SEEDS.length - 1]}, straight walking, 120 Hz`);
  console.log(`events paired: ${JSON.stringify(counts)}`);
  console.log(`bias (s, added to raw detections): ${JSON.stringify(bias)}`);
  console.log(`at 120 Hz, frames: contact ${(bias.contact * 120).toFixed(2)}, toe-off ${(bias.toeOff * 120).toFixed(2)}, contact check ${(bias.contactCheck * 120).toFixed(2)}, toe-off check ${(bias.toeOffCheck * 120).toFixed(2)}`);
  if (process.argv.includes('--write')) {
    const file = join(dirname(fileURLToPath(import.meta.url)), '..', 'src', 'gait', 'calibration.ts');
    writeFileAtomic(file, calibrationSource(readFileSync(file, 'utf8'), bias));
    console.log(`wrote ${file}`);
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
