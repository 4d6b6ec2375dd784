// Tracks of the fixed synthetic cohorts (src/synth/cohort.ts) for the model scripts: each subject's take
// is synthesized, imported as a user's file would be (roles, units and up axis detected from the file)
// and turned into a model-rate track; walkerFactors reads their factor summaries under a model.
import { takeFactors, type TakeFactors } from '../src/analysis/factors.js';
import type { CouplingModel } from '../src/model/model.js';
import { trackFromImported, type Track } from '../src/motion/track.js';
import { analyzeGait } from '../src/gait/analyze.js';
import { DEFAULT_LOWPASS_HZ } from '../src/gait/input.js';
import { causalPhase } from '../src/motion/phase.js';
import { resolveImported } from '../src/skeleton/import.js';
import type { CohortSubject } from '../src/synth/cohort.js';
import { synthesizeTake, type SynthTruth } from '../src/synth/index.js';

/** One cohort subject's take as a track, with the walker's truth. */
export interface CohortTrack {
  subject: CohortSubject;
  track: Track;
  truth: SynthTruth;
  /** Causal left gait phase per track step from the detected initial contacts (restricted labeling), or null. */
  phase: Float64Array | null;
}

/** Returns the track of a cohort subject (file name `<id>.bvh` in messages); `phase: false` skips the gait analysis. */
export function cohortTrack(subject: CohortSubject, options: { phase?: boolean } = {}): CohortTrack {
  const r = synthesizeTake(subject.options);
  const imported = resolveImported(`${subject.id}.bvh`, r.take);
  const track = trackFromImported(imported);
  let phase: Float64Array | null = null;
  if (options.phase === false) return { subject, track, truth: r.truth, phase };
  try {
    const contacts = analyzeGait(imported, { lowpassHz: DEFAULT_LOWPASS_HZ, steadyOnly: false }).detection.events
      .filter((e) => e.side === 'left' && e.kind === 'initial_contact').map((e) => e.time).sort((a, b) => a - b);
    if (contacts.length >= 2) phase = causalPhase(contacts, track.steps, track.rate);
  } catch {
    phase = null;
  }
  return { subject, track, truth: r.truth, phase };
}

/** Returns the factor summaries of walkers under a model (no phase labels: the model reads none), as the normative figures take them. */
export function walkerFactors(model: CouplingModel, walkers: readonly CohortSubject[]): TakeFactors[] {
  return walkers.map((s) => takeFactors(model, cohortTrack(s, { phase: false }).track));
}
