// `jointloom fit <takes...> -o model.json`: trains the coupling model and its no-coupling twin.
import type { Command } from 'commander';
import { basename, dirname } from 'node:path';
import { InputError } from '../errors/index.js';
import { trackFromImported } from '../motion/track.js';
import type { TrainingTake } from '../model/batch.js';
import { TAKE_SIGNATURE_WEIGHT } from '../model/config.js';
import { fitPair, savePair } from '../model/pair-fit.js';
import { readoutSummaryJson } from '../model/readout-fit.js';
import { takeIdentity } from '../score/identity.js';
import { analyzeGait } from '../gait/analyze.js';
import { DEFAULT_LOWPASS_HZ } from '../gait/input.js';
import { causalPhase } from '../motion/phase.js';
import { importTake, type ImportedTake } from '../skeleton/import.js';
import { findTakes } from '../util/takes.js';
import { emit, newCommand, numberOption } from './program.js';
import { importOptionsFrom, withImportOptions, type ImportFlags } from './import-options.js';
import { progressBar } from './progress.js';

interface FitFlags extends ImportFlags {
  output: string;
  epochs: number;
  seed: number;
  threads: number;
  twin: boolean;
  matchPairing: boolean;
  restrictedLabeling: boolean;
  takeSignature?: boolean;
  quiet?: boolean;
  json?: boolean;
}

/** Returns the subject of a take: its sidecar or folder layout, else its file name. */
function subjectOf(path: string, root: string): string {
  try {
    return takeIdentity(path, root).subject;
  } catch {
    return basename(path).replace(/\.bvh$/i, '');
  }
}

/** Registers `fit` on the program. */
export function register(program: Command): void {
  const cmd = newCommand('fit')
    .description('train the coupling model (and its retrained no-coupling twin, the fair baseline) on walking takes; subjects come from <take>.json sidecars or <subject>/<session>/ folders, and held-out subjects stop the training early')
    .argument('<takes...>', 'BVH files or folders (searched recursively)')
    .requiredOption('-o, --output <file>', 'model file to write')
    .option('--epochs <n>', 'most epochs', numberOption(1, 10_000, true), 20)
    .option('--seed <n>', 'seed: same seed, same machine, same weights', numberOption(0, 2 ** 31 - 1, true), 1)
    .option('--threads <n>', "threads for the training steps and, after them, the pair readouts and spread calibrations of the model and its twin (1 or 2; the results do not depend on it)", numberOption(1, 2, true), 2)
    .option('--no-twin', 'skip the no-coupling twin (forecast then reports no no_coupling figures)')
    .option('--no-match-pairing', 'ablation: windows drawn in pairs from one take no longer share their static factors')
    .option('--no-restricted-labeling', 'ablation: no dynamic dimensions tied to the gait phase')
    .option('--take-signature', "experiment: train the static factors to carry each pair's take-level signature (relative motion and velocity coupling over the whole take); off in the shipped model")
    .option('--quiet', 'no progress bar')
    .option('--json', 'print the training summary as JSON');
  withImportOptions(cmd).action(async (paths: string[], flags: FitFlags) => {
    const files = findTakes(paths);
    if (files.length === 0) throw new InputError(`${paths.join(', ')}: no .bvh takes found.`);
    const opts = importOptionsFrom(flags);
    const root = files.length === 1 ? dirname(files[0]!) : commonRoot(files);
    const takes: TrainingTake[] = files.map((f) => {
      const imported = importTake(f, opts);
      const track = trackFromImported(imported);
      return { track, subject: subjectOf(f, root), phase: gaitPhase(imported, track.steps, track.rate) };
    });
    const bar = progressBar('fit', Boolean(flags.quiet || flags.json));
    let phase = 'model';
    const pair = await fitPair(takes, {
      epochs: flags.epochs,
      threads: flags.threads,
      seed: flags.seed,
      twin: flags.twin,
      config: { matchPairing: flags.matchPairing, restrictedLabeling: flags.restrictedLabeling, signatureWeight: flags.takeSignature ? TAKE_SIGNATURE_WEIGHT : 0 },
      onPhase: (p) => { phase = p; },
      onProgress: (p) => bar.update(p.epoch * p.stepsPerEpoch + p.step, p.epochs * p.stepsPerEpoch, `${phase} epoch ${p.epoch + 1}/${p.epochs} loss ${p.trainLoss.toFixed(3)}${Number.isFinite(p.validLoss) ? ` held-out ${p.validLoss.toFixed(3)}` : ''}`),
    });
    bar.stop();
    savePair(flags.output, pair);
    const s = pair.summary;
    const summary = {
      output: flags.output, takes: files.length, subjects: [...new Set(takes.map((t) => t.subject))].length,
      train_subjects: s.trainSubjects, valid_subjects: s.validSubjects, epochs_run: s.epochs, best_epoch: s.bestEpoch, steps: s.steps,
      match_pairing: flags.matchPairing, restricted_labeling: flags.restrictedLabeling, take_signature: flags.takeSignature === true,
      valid_loss: s.validLoss[s.bestEpoch] ?? null, ms_per_step: s.msPerStep, spread_scale: pair.spread,
      twin: pair.twinSummary ? { best_epoch: pair.twinSummary.bestEpoch, valid_loss: pair.twinSummary.validLoss[pair.twinSummary.bestEpoch] ?? null } : null,
      readout: { model: readoutSummaryJson(pair.readout.model), twin: readoutSummaryJson(pair.readout.twin) },
    };
    const r = summary.readout.model, milli = (x: number | null) => (x === null ? '-' : (1000 * x).toFixed(1));
    const readoutText = !r ? '' : r.kept ? `; pair readout kept (held-out knot error ${milli(r.valid_knot_error_clean?.before ?? null)} -> ${milli(r.valid_knot_error_clean?.after ?? null)} milli-leg-lengths; with capture jitter ${milli(r.valid_knot_error_jittered?.before ?? null)} -> ${milli(r.valid_knot_error_jittered?.after ?? null)}${r.jitter_threshold !== null ? `, the robust readout above ${milli(r.jitter_threshold)}` : ', no robust readout'})` : `; no pair readout (${r.dropped})`;
    if (flags.json) emit(JSON.stringify(summary, null, 2));
    else emit(`wrote ${flags.output}: ${files.length} takes of ${summary.subjects} subjects, ${s.epochs} epochs (best ${s.bestEpoch + 1}), held-out loss ${summary.valid_loss?.toFixed(4) ?? '-'}, ${s.msPerStep.toFixed(0)} ms a step${pair.twin ? '; no-coupling twin trained on the same budget' : ''}${readoutText}`);
  });
  program.addCommand(cmd);
}

/**
 * Returns the causal left gait phase per track step from the take's detected initial contacts, for
 * restricted labeling (the labels only; the encoder never reads them), or null without walking.
 */
function gaitPhase(imported: ImportedTake, steps: number, rate: number): Float64Array | null {
  try {
    const events = analyzeGait(imported, { lowpassHz: DEFAULT_LOWPASS_HZ, steadyOnly: false }).detection.events;
    const contacts = events.filter((e) => e.side === 'left' && e.kind === 'initial_contact').map((e) => e.time).sort((a, b) => a - b);
    return contacts.length >= 2 ? causalPhase(contacts, steps, rate) : null;
  } catch {
    return null;
  }
}

/** Returns the deepest folder holding every file. */
function commonRoot(files: readonly string[]): string {
  let root = dirname(files[0]!);
  while (!files.every((f) => f.startsWith(root + '/')) && root !== dirname(root)) root = dirname(root);
  return root;
}
