// Fitting the coupling model and its no-coupling twin on the same takes and budget, then calibrating
// the spread of each on the held-out subjects' windows, as `jointloom fit` stores them.
import { windowsOf, type Window } from '../motion/window.js';
import type { TrainingTake } from './batch.js';
import { calibrateSpread } from './calibrate.js';
import type { CouplingModel } from './model.js';
import { modelFromJson, modelToJson, saveModel, type LoadedModel } from './modelfile.js';
import { modelWindowOptions } from './config.js';
import { fitModelReadout, type ReadoutOutcome } from './readout-fit.js';
import { heldOutSplit, type HeldOutSplit } from './split.js';
import { trainParallel } from './parallel.js';
import { train, type TrainOptions, type TrainProgress, type TrainingSummary } from './train.js';

export interface FittedPair {
  model: CouplingModel;
  summary: TrainingSummary;
  twin: CouplingModel | null;
  twinSummary: TrainingSummary | null;
  /** Spread scales fitted so the 90 % band covers 90 % of held-out future positions. */
  spread: { model: number; twin: number | null };
  /** The pair readouts' fits (null without the stride prior, whose forecast they read). */
  readout: { model: ReadoutOutcome | null; twin: ReadoutOutcome | null };
}

/** Returns the run's split of takes into training and held-out ones (split.ts), as training makes it. */
export function runSplit(takes: readonly TrainingTake[], options: TrainOptions, model: CouplingModel): HeldOutSplit {
  return heldOutSplit(takes, model.config, options.validSubjects, options.batchSize ?? 16, options.windowStride ?? 3);
}

/** Returns the held-out windows (every `stride` steps, each with its full causal history) of the run's held-out takes. */
export function heldOutWindows(takes: readonly TrainingTake[], options: TrainOptions, model: CouplingModel, stride: number, split = runSplit(takes, options, model)): Window[] {
  return fullHistoryWindows(split.valid, model, stride);
}

/** Returns the windows of `takes` every `stride` steps that have their full causal history and future. */
function fullHistoryWindows(takes: readonly TrainingTake[], model: CouplingModel, stride: number): Window[] {
  const c = model.config, first = c.stridePrior ? c.priorHistory : c.observe;
  const out: Window[] = [];
  for (const t of takes)
    for (const w of windowsOf(t.track, stride, modelWindowOptions(c))) if (w.futureSteps === c.forecast && w.endObservedStep >= first) out.push(w);
  return out;
}

/**
 * Returns the windows the forecast spread is calibrated on: the held-out windows of the run, then those
 * of `extra` takes (subjects never trained on, e.g. the shipped model's calibration cohort), every
 * `stride` steps.
 */
export function spreadCalibrationWindows(takes: readonly TrainingTake[], options: TrainOptions, model: CouplingModel, stride: number, split: HeldOutSplit, extra: readonly TrainingTake[] = []): Window[] {
  return [...heldOutWindows(takes, options, model, stride, split), ...fullHistoryWindows(extra, model, stride)];
}

/** Returns the steps between calibration windows: every 15 (0.5 s) of held-out subjects, every 5 of a take's short tail. */
export function calibrationStride(summary: TrainingSummary | null): number {
  return summary?.heldOut === 'tail' ? 5 : 15;
}

/** Options of fitPair: training options, the twin switch, worker threads and progress hooks. */
export type FitPairOptions = TrainOptions & {
  twin?: boolean;
  /**
   * Run the shards of each step on this many threads (default 1: all on the calling thread). The weights
   * are the same for any thread count (train.ts reduces shard gradients in a fixed order).
   */
  threads?: number;
  /** Takes of subjects never trained on whose windows join the held-out ones for the spread calibration. */
  calibrationTakes?: readonly TrainingTake[];
  onPhase?: (phase: 'model' | 'twin' | 'readout' | 'calibrate') => void;
  onProgress?: (p: TrainProgress) => void;
};

/** Returns the model and (unless `twin` is false) its retrained no-coupling twin, spreads calibrated. */
export async function fitPair(takes: readonly TrainingTake[], options: FitPairOptions): Promise<FittedPair> {
  const run = (o: TrainOptions) => ((options.threads ?? 1) > 1 ? trainParallel(takes, { ...o, shards: o.shards ?? options.threads }) : Promise.resolve(train(takes, o)));
  options.onPhase?.('model');
  const { model, summary } = await run(options);
  let twin: CouplingModel | null = null, twinSummary: TrainingSummary | null = null;
  if (options.twin !== false) {
    options.onPhase?.('twin');
    const r = await run({ ...options, config: { ...options.config, noCoupling: true }, stats: model.stats });
    twin = r.model;
    twinSummary = r.summary;
  }
  const split = runSplit(takes, options, model);
  options.onPhase?.('readout');
  const readout = fitReadouts(model, twin, split, options.windowStride ?? 3, calibrationStride(summary));
  options.onPhase?.('calibrate');
  const wins = spreadCalibrationWindows(takes, options, model, calibrationStride(summary), split, options.calibrationTakes);
  const spread = { model: wins.length ? calibrateSpread(model, wins) : model.spreadScale, twin: twin && wins.length ? calibrateSpread(twin, wins) : null };
  return { model, summary, twin, twinSummary, spread, readout };
}

/**
 * Fits the pair readouts of the model (every node to every receiver) and its twin (each node to itself)
 * on the split's training takes, windows every `stride` steps, the ridge weight picked on the held-out
 * takes' windows every `validStride` steps; none without the stride prior.
 */
export function fitReadouts(model: CouplingModel, twin: CouplingModel | null, split: HeldOutSplit, stride: number, validStride: number): FittedPair['readout'] {
  if (!model.config.stridePrior) return { model: null, twin: null };
  return {
    model: fitModelReadout(model, split.train, split.valid, stride, validStride),
    twin: twin ? fitModelReadout(twin, split.train, split.valid, stride, validStride) : null,
  };
}

/** Writes the pair to one model file (the twin under extras.no_coupling) and returns the path. */
export function savePair(path: string, p: FittedPair, extras: Record<string, unknown> = {}): string {
  return saveModel(path, p.model, p.summary, { ...extras, ...(p.twin ? { no_coupling: modelToJson(p.twin, p.twinSummary) } : {}) });
}

/** Returns the twin stored beside a loaded model, or null when the file has none. */
export function twinOf(loaded: LoadedModel, source: string): CouplingModel | null {
  const t = loaded.extras.no_coupling;
  return t ? modelFromJson(t, `${source} (no-coupling twin)`).model : null;
}
