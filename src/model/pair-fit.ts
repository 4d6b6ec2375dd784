// Fitting the coupling model and its no-coupling twin on the same takes and budget, then fitting the pair
// readout and calibrating the spread of each on the held-out subjects' windows (post-fit.ts, the twin's on
// a second thread), as `jointloom fit` stores them.
import type { TrainingTake } from './batch.js';
import type { CouplingModel } from './model.js';
import { modelFromJson, modelToJson, saveModel, type LoadedModel } from './modelfile.js';
import { postFit, type PostFitInput } from './post-fit.js';
import type { ReadoutOutcome } from './readout-fit.js';
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

/**
 * Returns what the post-fit phase reads: the split's training and held-out takes for the readout, and for
 * the spread calibration the held-out takes followed by `extra` takes (subjects never trained on, e.g. the
 * shipped model's calibration cohort), windows every `calibrationStride(summary)` steps.
 */
export function postFitInput(split: HeldOutSplit, options: TrainOptions, summary: TrainingSummary | null, extra: readonly TrainingTake[] = [], readout = true): PostFitInput {
  return { train: split.train, valid: split.valid, calibration: [...split.valid, ...extra], stride: options.windowStride ?? 3, validStride: calibrationStride(summary), readout };
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
  /** Phases: training the model, training the twin, then the readouts and spread calibration of both. */
  onPhase?: (phase: 'model' | 'twin' | 'post-fit') => void;
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
  options.onPhase?.('post-fit');
  const post = await postFit(model, twin, postFitInput(split, options, summary, options.calibrationTakes), options.threads ?? 1);
  const spread = { model: model.spreadScale, twin: twin ? twin.spreadScale : null };
  return { model, summary, twin, twinSummary, spread, readout: { model: post.model.readout, twin: post.twin?.readout ?? null } };
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
