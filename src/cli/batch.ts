// `jointloom batch <folders or files...>`: score every take into the ledger, resumably, in a worker pool.
import { existsSync } from 'node:fs';
import { relative } from 'node:path';
import type { Command } from 'commander';
import { DEFAULT_LOWPASS_HZ } from '../gait/input.js';
import { InputError } from '../errors/index.js';
import { cohortData, writeCohortReport } from '../ledger/cohort.js';
import { checkOutputFolder, runBatch, type BatchSummary } from '../ledger/batch.js';
import { DEFAULT_LEDGER, openLedger } from '../ledger/open.js';
import { cachedNorms, type ScoreOptions } from '../score/compose.js';
import { defaultModelPath } from '../model/default-model.js';
import { loadModel } from '../model/modelfile.js';
import { fileSha256 } from '../score/hash.js';
import { defaultWorkers } from '../score/pool.js';
import { parseShard, type Shard } from '../score/shard.js';
import { CAUTION } from './caution.js';
import { SHIPPED_NORMS } from './gait.js';
import { VERSION, emit, newCommand, numberOption } from './program.js';
import { progressBar } from './progress.js';

/** Returns a path relative to the current folder when it lies below it, else as given. */
function shown(p: string): string {
  const r = relative(process.cwd(), p);
  return r && !r.startsWith('..') ? r : p;
}

interface BatchFlags {
  model?: string | false;
  ledger: string;
  out?: string;
  workers?: number;
  shard?: Shard;
  norms?: string | false;
  json?: boolean;
  quiet?: boolean;
}

/** Exit status when some takes failed and the others were scored. */
export const EXIT_SOME_FAILED = 3;

/** Returns the exit status of a batch: 0 all scored, 3 some failed, 1 none could be scored. */
export function batchExitCode(s: BatchSummary): number {
  if (!s.failed.length) return 0;
  return s.scored + s.skipped + s.already > 0 ? EXIT_SOME_FAILED : 1;
}

/** Returns the option values resolved to what scoring records (files read and hashed before any work). */
function scoreOptions(flags: BatchFlags): ScoreOptions {
  let normsFile: string | null = null;
  if (flags.norms !== false) {
    normsFile = flags.norms ?? SHIPPED_NORMS;
    if (!existsSync(normsFile)) throw new InputError(`${normsFile}: no such norms file${flags.norms === undefined ? ' (the shipped reference); give one with --norms or pass --no-norms' : ''}.`);
    cachedNorms(normsFile); // refuses a corrupt reference before any work
  }
  let model: ScoreOptions['model'] = { file: null, file_sha256: null, used: false };
  if (flags.model !== false) {
    const file = flags.model ?? defaultModelPath();
    if (!existsSync(file)) throw new InputError(`${file}: no such model file${flags.model === undefined ? ' (the shipped default model); give one with --model or pass --no-model' : ''}.`);
    loadModel(file); // refuses a corrupt or mismatched model before any work
    model = { file, file_sha256: fileSha256(file), used: false };
  }
  return {
    tool: 'jointloom', toolVersion: VERSION, lowpassHz: DEFAULT_LOWPASS_HZ, steadyOnly: true,
    normsFile, normsSha256: normsFile ? fileSha256(normsFile) : null, model,
  };
}

/** Registers `batch` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('batch')
    .description('score every BVH take under the given folders into the ledger (gait parameters, symmetry, norm scores, forecast surprise timeline with irregular steps, coupling asymmetry); resumable, in a worker pool')
    .argument('<paths...>', 'folders (searched recursively) or BVH files')
    .option('--model <file>', 'coupling model for the forecast surprise timeline and the coupling asymmetry (default: the shipped model); recorded by SHA-256 in every row')
    .option('--no-model', 'no model-based stage (no forecast timeline, no coupling asymmetry)')
    .option('--ledger <file>', 'SQLite ledger to write (created when missing)', DEFAULT_LEDGER)
    .option('--out <dir>', 'write the cohort report (cohort-report.html, cohort.csv) here; checked before any work')
    .option('--workers <n>', `worker threads (default: one per core, here ${defaultWorkers()})`, numberOption(1, 256, true))
    .option('--shard <K/N>', 'score only shard K of N (by a hash of each take\'s path relative to the folder given); merge shard ledgers with `ledger merge`', parseShard)
    .option('--norms <file>', 'reference to score against (default: the shipped synthetic reference)')
    .option('--no-norms', 'no norm scores')
    .option('--json', 'summary as JSON on stdout')
    .option('--quiet', 'no progress bar')
    .addHelpText('after', `
Subject and session come from a sidecar <take>.json beside each take ({"subject": "S01", "session": 1,
"date": "2031-03-04"}), or else from the folders: <subject>/<session>/<take>.bvh below the folder given.
A take without either is recorded as failed.

A take is identified by the SHA-256 of its content; one already scored with the same model (the model
file's SHA-256, or none) is skipped, so running the same batch again after an interruption resumes it.
Each take is committed in its own transaction. Every row carries the tool version, the model hash
(null when no model is given), the take hash and the options.

Exit status: 0 every take scored (or already scored), 3 some takes failed (each recorded with its
reason) and the others were scored, 1 nothing could be scored (no takes, every take failed, an
unwritable output folder or an unusable ledger), 2 usage error.`);
  cmd.action(async (paths: string[], flags: BatchFlags) => {
    if (flags.out) checkOutputFolder(flags.out);
    const score = scoreOptions(flags);
    const bar = progressBar('batch', flags.quiet === true || flags.json === true);
    let summary: BatchSummary;
    try {
      summary = await runBatch({ paths, ledger: flags.ledger, workers: flags.workers ?? defaultWorkers(), shard: flags.shard ?? null, score, onProgress: (d, t, s) => bar.update(d, t, s) });
    } finally {
      bar.stop();
    }
    let report: { html: string; csv: string } | null = null;
    if (flags.out) {
      const db = openLedger(flags.ledger);
      try { report = writeCohortReport(cohortData(db, flags.ledger, summary.modelKey, VERSION), flags.out, CAUTION); } finally { db.close(); }
    }
    process.exitCode = batchExitCode(summary);
    if (flags.json) {
      emit(JSON.stringify({
        tool: 'jointloom', version: VERSION, ledger: flags.ledger, shard: flags.shard ? `${flags.shard.k}/${flags.shard.n}` : null,
        provenance: { tool_version: VERSION, model: score.model, options: { lowpass_hz: score.lowpassHz, steady_only: score.steadyOnly, norms_file: score.normsFile, norms_sha256: score.normsSha256 } },
        found: summary.found, in_shard: summary.inShard, scored: summary.scored, skipped: summary.skipped, already: summary.already,
        failed: summary.failed, workers: summary.workers, elapsed_s: Math.round(summary.elapsedS * 1000) / 1000, model_key: summary.modelKey, report,
      }));
      return;
    }
    for (const f of summary.failed) process.stderr.write(`jointloom: ${f.path}: not scored: ${f.reason}\n`);
    const lines = [
      `batch: ${summary.found} takes found${flags.shard ? `, ${summary.inShard} in shard ${flags.shard.k}/${flags.shard.n}` : ''}: ${summary.scored} scored, ${summary.skipped} already in the ledger, ` +
        `${summary.already ? `${summary.already} scored meanwhile by another run, ` : ''}${summary.failed.length} failed; ${summary.workers} workers, ${summary.elapsedS.toFixed(1)} s`,
      `ledger: ${flags.ledger} (model ${summary.modelKey === 'none' ? 'none: no model hash' : summary.modelKey.slice(0, 16) + '…'})`,
    ];
    if (report) lines.push(`cohort report: ${shown(report.html)}; CSV: ${shown(report.csv)}`);
    emit(lines.join('\n'));
  });
  program.addCommand(cmd);
}
