// Writes demo-takes/reference/synthetic-norms.json: the demo's reference, built from a synthetic control
// cohort of 60 healthy walkers (seeds 30000-30059, disjoint from every other cohort of the project), 20 each at
// slow, self-selected and fast dimensionless speeds. Deterministic: no clock date inside (pass --date to
// record one). Run: npx tsx scripts/make-reference.ts [--date YYYY-MM-DD] [--out FILE]
import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { analyzeGait } from '../src/gait/analyze.js';
import { DEFAULT_LOWPASS_HZ } from '../src/gait/input.js';
import { GRAVITY } from '../src/gait/params.js';
import { buildNorms, type ControlTake } from '../src/norms/build.js';
import { sampleTake } from '../src/norms/collect.js';
import { normsJson } from '../src/norms/format.js';
import { resolveImported } from '../src/skeleton/import.js';
import { type SynthOptions, synthesizeTake } from '../src/synth/index.js';
import { Mulberry32 } from '../src/synth/prng.js';
import { writeFileAtomic } from '../src/util/atomic.js';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
/** Where the shipped reference lives. */
export const REFERENCE_FILE = join(ROOT, 'demo-takes', 'reference', 'synthetic-norms.json');
/** Seeds of the shipped cohort. */
export const COHORT_SEEDS: readonly number[] = Array.from({ length: 60 }, (_, i) => 30000 + i);
/** Fixed build label written instead of a date. */
export const BUILD_LABEL = 'demo reference 1 (synthetic control cohort, seeds 30000-30059)';

/** Target dimensionless speed ranges of the three cohort groups (inside slow < 0.35, 0.35-0.55, fast > 0.55). */
const GROUPS = [
  { name: 'slow', lo: 0.26, hi: 0.33 },
  { name: 'self-selected', lo: 0.40, hi: 0.50 },
  { name: 'fast', lo: 0.58, hi: 0.66 },
] as const;

/** Returns the walker options of the control with this seed; group 0, 1, 2 = slow, self-selected, fast. */
export function controlOptions(seed: number, group: number): Partial<SynthOptions> & { seed: number } {
  const rng = new Mulberry32(seed * 7919 + 17);
  const u = () => rng.next();
  const g = GROUPS[group]!;
  const height = 1.55 + 0.4 * u();
  const leg = 0.491 * height; // hip to ankle over height for the walker's anthropometry (Winter's table: 0.245 + 0.246)
  const beta = g.lo + (g.hi - g.lo) * u();
  const speed = beta * Math.sqrt(GRAVITY * leg);
  // Step length grows about as the square root of speed (common practice); 0.825 L at β = 0.45.
  const step = leg * 0.825 * Math.sqrt(beta / 0.45) * (0.97 + 0.06 * u());
  const cadence = Math.min(145, Math.max(70, (60 * speed) / step));
  return {
    seed, subjectSeed: seed, height: round(height, 3), speed: round(speed, 3), cadence: round(cadence, 1),
    duration: 20, frameRate: 100, toeOutDeg: round(3 + 7 * u(), 1), stepWidth: round(0.07 + 0.06 * u(), 3),
  };
}

/** Returns a control take synthesised and analysed as `jointloom norms build` would analyse its file. */
export function controlTake(seed: number, group: number): ControlTake {
  const r = synthesizeTake(controlOptions(seed, group));
  const file = `synthetic-control-${seed}.bvh`;
  const a = analyzeGait(resolveImported(file, r.take));
  return { sample: sampleTake(a, file), sha256: createHash('sha256').update(r.bvhText).digest('hex') };
}

function round(v: number, d: number): number {
  return Math.round(v * 10 ** d) / 10 ** d;
}

function main(argv: string[]): void {
  const arg = (name: string) => { const i = argv.indexOf(name); return i >= 0 ? argv[i + 1] ?? null : null; };
  const date = arg('--date');
  if (date !== null && !/^\d{4}-\d{2}-\d{2}$/.test(date)) throw new Error(`--date expects YYYY-MM-DD, got ${date}`);
  const out = arg('--out') ?? REFERENCE_FILE;
  const version = (JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as { version: string }).version;
  const controls = COHORT_SEEDS.map((seed, i) => controlTake(seed, i % 3));
  const { norms, notes } = buildNorms(controls, {
    speedBands: true, synthetic: true, tool_version: version, date, build: BUILD_LABEL,
    description: 'Synthetic control cohort from jointloom\'s parametric walker (healthy adults 1.55-1.95 m, 20 s at 100 Hz each, 20 slow, 20 self-selected, 20 fast); rebuilt byte for byte by scripts/make-reference.ts. Not clinical data: a clinic builds its own reference from its own control takes with `jointloom norms build`.',
    analysis: { lowpass_hz: DEFAULT_LOWPASS_HZ, steady_state_only: true },
  });
  mkdirSync(dirname(out), { recursive: true });
  const text = normsJson(norms);
  writeFileAtomic(out, text);
  for (const n of notes) console.log(`note: ${n}`);
  for (const [name, b] of Object.entries(norms.bands))
    console.log(`${name.padEnd(14)} takes ${String(b!.takes).padStart(3)}  strides ${String(b!.strides).padStart(5)}  speed ${b!.speed_dimensionless.min}-${b!.speed_dimensionless.max}  GPS median ${b!.profile?.gps_median} p95 ${b!.profile?.gps_p95}  GDI features ${b!.deviation?.features ?? '-'} retained ${b!.deviation?.retained ?? '-'}`);
  console.log(`${(text.length / 1e3).toFixed(1)} kB  ${out}`);
}

const isMain = process.argv[1] !== undefined && import.meta.url === new URL(`file://${process.argv[1]}`).href;
if (isMain) main(process.argv.slice(2));
