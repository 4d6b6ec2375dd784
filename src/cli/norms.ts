// `jointloom norms build|show`: a reference of angle curves, parameters and scores from a clinic's own control
// takes, and a summary of one.
import { createHash } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { findTakes } from '../util/takes.js';
import { type Command, InvalidArgumentError } from 'commander';
import { analyzeGait } from '../gait/analyze.js';
import { DEFAULT_LOWPASS_HZ } from '../gait/input.js';
import { UsageError } from '../errors/index.js';
import { buildNorms, type ControlTake } from '../norms/build.js';
import { sampleTake } from '../norms/collect.js';
import { normsJson, readNormsFile, SYNTHETIC_LABEL, type NormsFile } from '../norms/format.js';
import { STRATUM_LABELS } from '../norms/strata.js';
import { importTake } from '../skeleton/import.js';
import { VERSION, emit, newCommand } from './program.js';
import { importOptionsFrom, withImportOptions, type ImportFlags } from './import-options.js';
import { progressBar } from './progress.js';

interface BuildFlags extends ImportFlags {
  out: string;
  speedBands?: boolean;
  date?: string;
  synthetic?: boolean;
  description?: string;
  json?: boolean;
  quiet?: boolean;
}

/** Parses --date: an ISO calendar date. */
function dateOption(v: string): string {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(v) || Number.isNaN(Date.parse(`${v}T00:00:00Z`))) throw new InvalidArgumentError(`expected a date YYYY-MM-DD, got "${v}".`);
  return v;
}

/** Returns the BVH files named by the arguments: files as given, folders searched recursively; a folder with none is a usage error. */
export function expandTakes(inputs: readonly string[]): string[] {
  const found = new Set<string>();
  for (const p of inputs) {
    const takes = findTakes([p]);
    if (takes.length === 0 && statSync(p).isDirectory()) throw new UsageError(`${p}: the folder holds no .bvh file.`);
    for (const t of takes) found.add(t);
  }
  return [...found].sort();
}

/** Returns the one-screen summary of a reference. */
export function normsSummary(n: NormsFile, file: string): string {
  const p = n.provenance;
  const lines = [`${file}: jointloom reference (format ${n.format} ${n.version}), ${p.takes.length} control takes${p.synthetic ? ` — ${SYNTHETIC_LABEL}` : ''}`];
  lines.push(`  built ${p.date ?? p.build ?? 'undated'} by jointloom ${p.tool_version}; low-pass ${p.analysis.lowpass_hz ?? 'off'}, ${p.analysis.steady_state_only ? 'steady-state strides' : 'every step'}`);
  lines.push(`  speed bands by v / sqrt(g L): slow < ${n.speed_strata.slow_below}, fast > ${n.speed_strata.fast_above}`);
  for (const [name, b] of Object.entries(n.bands)) {
    if (!b) continue;
    const gdi = b.deviation ? `deviation index from ${b.deviation.strides} strides, ${b.deviation.features} features` : `no deviation index (${b.deviation_note})`;
    lines.push(`  ${STRATUM_LABELS[name as keyof typeof STRATUM_LABELS].padEnd(28)} ${String(b.takes).padStart(3)} takes ${String(b.strides).padStart(5)} strides; profile score of its takes: median ${b.profile?.gps_median ?? '–'}°, 95th percentile ${b.profile?.gps_p95 ?? '–'}°; ${gdi}`);
  }
  for (const s of n.skipped_bands) lines.push(`  ${s.band} band left out: ${s.reason}`);
  return lines.join('\n');
}

/** Returns a reference's provenance, speed strata and per-band counts (the JSON of `show` and `build`). */
function bandsJson(n: NormsFile) {
  const bands = Object.fromEntries(Object.entries(n.bands).map(([k, b]) => [k, { takes: b!.takes, strides: b!.strides, profile: b!.profile, deviation: b!.deviation ? { features: b!.deviation.features, strides: b!.deviation.strides } : null }]));
  return { provenance: n.provenance, speed_strata: n.speed_strata, bands, skipped_bands: n.skipped_bands };
}

/** Registers `norms` (with `build` and `show`) on the program. */
export function register(program: Command): void {
  const cmd = newCommand('norms').description('build a normative reference from control takes, or show one (bands for `gait --norms`)');
  const build = newCommand('build')
    .description('build a reference (norms JSON) from control takes of healthy walking: curve and parameter means and SDs, speed bands, profile and deviation scores')
    .argument('<takes...>', 'control BVH files or folders of them')
    .requiredOption('-o, --out <file>', 'norms JSON file to write')
    .option('--speed-bands', `also build bands by dimensionless speed: ${STRATUM_LABELS.slow}, ${STRATUM_LABELS.self_selected}, ${STRATUM_LABELS.fast}`)
    .option('--date <YYYY-MM-DD>', 'date recorded in the provenance (default: today)', dateOption)
    .option('--synthetic', `mark the reference as synthetic (its scores are then labelled "${SYNTHETIC_LABEL}")`)
    .option('--description <text>', 'free text recorded in the provenance (who the controls are; no names)')
    .option('--json', 'print the provenance, band counts and notes as JSON')
    .option('--quiet', 'no progress bar');
  withImportOptions(build).action((inputs: string[], flags: BuildFlags) => {
    const files = expandTakes(inputs);
    const opts = importOptionsFrom(flags);
    const bar = progressBar('norms', Boolean(flags.quiet || flags.json));
    const controls: ControlTake[] = [];
    try {
      for (const file of files) {
        const sha256 = createHash('sha256').update(readFileSync(file)).digest('hex');
        const a = analyzeGait(importTake(file, opts));
        controls.push({ sample: sampleTake(a, file), sha256 });
        bar.update(controls.length, files.length, basename(file));
      }
    } finally { bar.stop(); }
    const { norms, notes } = buildNorms(controls, {
      speedBands: !!flags.speedBands,
      synthetic: !!flags.synthetic,
      tool_version: VERSION,
      date: flags.date ?? new Date().toISOString().slice(0, 10),
      build: null,
      description: flags.description ?? `${files.length} control takes given to \`jointloom norms build\`.`,
      analysis: { lowpass_hz: DEFAULT_LOWPASS_HZ, steady_state_only: true },
    });
    emit(normsJson(norms), flags.out);
    if (flags.json) emit(JSON.stringify({ out: flags.out, ...bandsJson(norms), notes }));
    else {
      for (const n of notes) process.stderr.write(`jointloom: note: ${n}\n`);
      emit(normsSummary(norms, flags.out));
    }
  });
  const show = newCommand('show')
    .description('summarise a reference: its takes, bands, stride counts and scores')
    .argument('<file>', 'norms JSON file')
    .option('--json', 'print the provenance and band counts as JSON');
  show.action((file: string, flags: { json?: boolean }) => {
    const n = readNormsFile(file);
    emit(flags.json ? JSON.stringify(bandsJson(n)) : normsSummary(n, file));
  });
  build.exitOverride();
  show.exitOverride();
  cmd.addCommand(build);
  cmd.addCommand(show);
  program.addCommand(cmd);
}
