// `jointloom gait <take>`: events, spatiotemporal parameters, joint angles and symmetry of a walking take.
import { existsSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Command } from 'commander';
import { InvalidArgumentError } from 'commander';
import { ANGLE_LABELS, analyzeGait, gaitResultJson } from '../gait/analyze.js';
import { eventsFormatOf, readEvents, writeEvents } from '../gait/events-io.js';
import { readNormsFile, SYNTHETIC_LABEL } from '../norms/format.js';
import { scoreAgainstNorms } from '../norms/score.js';
import { importTake } from '../skeleton/import.js';
import { gaitReportHtml, type GaitReportData } from '../report/gait-html.js';
import { gaitText, stridesCsv } from '../report/gait-text.js';
import { writeFilesAtomic, type FileToWrite } from '../util/atomic.js';
import { CAUTION } from './caution.js';
import { VERSION, emit, newCommand } from './program.js';
import { importOptionsFrom, withImportOptions, type ImportFlags } from './import-options.js';

interface GaitFlags extends ImportFlags {
  json?: boolean;
  csv?: string;
  html?: string;
  events?: string;
  eventsOut?: string;
  lowpass: number | 'off';
  allSteps?: boolean;
  /** A norms file, false for --no-norms, undefined for the shipped reference. */
  norms?: string | false;
}

/** The shipped synthetic reference (two folders up from src/cli and dist/cli alike). */
export const SHIPPED_NORMS = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'demo-takes', 'reference', 'synthetic-norms.json');

/** Parses --lowpass: a cutoff in Hz or "off" (kept as the word: commander turns a null result into ''). */
function lowpassOption(v: string): number | 'off' {
  if (v === 'off') return 'off';
  const n = Number(v);
  if (!Number.isFinite(n) || n <= 0) throw new InvalidArgumentError(`expected a cutoff in Hz or "off", got "${v}".`);
  return n;
}

/** Registers `gait` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('gait')
    .description('gait events, cadence, speed, step and stride figures, stance/swing/double support, joint angles over the gait cycle and symmetry indices')
    .argument('<take>', 'BVH file of walking')
    .option('--json', 'machine-readable output on stdout')
    .option('--csv <file>', 'write the stride table as CSV')
    .option('--html <file>', 'write a self-contained HTML report')
    .option('--events <file>', 'use reviewed events from this CSV or JSON file instead of detecting them')
    .option('--events-out <file>', 'write the events (CSV or JSON, by extension) for review and editing')
    .option('--lowpass <hz|off>', 'low-pass cutoff for joint positions, or off', lowpassOption, 6)
    .option('--all-steps', 'keep the first and last steps of each walking pass (left out by default as not steady state)')
    .option('--norms <file>', `reference built by \`jointloom norms build\` to draw bands from and score against (default: the shipped ${SYNTHETIC_LABEL})`)
    .option('--no-norms', 'no reference bands and no scores');
  withImportOptions(cmd).action((path: string, flags: GaitFlags) => {
    if (flags.eventsOut) eventsFormatOf(flags.eventsOut);
    const imported = importTake(path, importOptionsFrom(flags));
    const fps = 1 / imported.take.frameTime;
    const events = flags.events ? readEvents(flags.events, fps, imported.take.frameCount) : undefined;
    const analysis = analyzeGait(imported, { lowpassHz: flags.lowpass === 'off' ? null : flags.lowpass, steadyOnly: !flags.allSteps, events });
    const result = gaitResultJson(analysis, { tool: 'jointloom', version: VERSION, file: path }) as unknown as GaitReportData;
    if (flags.norms !== false) {
      const file = flags.norms ?? SHIPPED_NORMS;
      if (flags.norms === undefined && !existsSync(file)) {
        result.norms = null;
        result.warnings.push(`the shipped reference (${file}) is missing, so no bands or scores are shown; give one with --norms.`);
      } else {
        const shown = flags.norms ?? relative(process.cwd(), file);
        result.norms = scoreAgainstNorms(analysis, readNormsFile(file), shown.startsWith('..') ? file : shown);
      }
    }
    // All or none: a bad --html folder must not leave the events and CSV written.
    const files: FileToWrite[] = [];
    if (flags.eventsOut) files.push({ path: flags.eventsOut, data: writeEvents(analysis.detection.events, fps, eventsFormatOf(flags.eventsOut)) });
    if (flags.csv) files.push({ path: flags.csv, data: stridesCsv(result) });
    if (flags.html) files.push({ path: flags.html, data: gaitReportHtml(result, ANGLE_LABELS, CAUTION) });
    writeFilesAtomic(files);
    emit(flags.json ? JSON.stringify(result) : gaitText(result));
  });
  program.addCommand(cmd);
}
