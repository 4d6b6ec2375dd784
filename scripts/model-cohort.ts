// Tracks of the fixed synthetic cohorts (src/synth/cohort.ts) for the model scripts: each subject's take
// is synthesized, imported as a user's file would be (roles, units and up axis detected from the file)
// and turned into a model-rate track.
import { trackFromImported, type Track } from '../src/motion/track.js';
import { resolveImported } from '../src/skeleton/import.js';
import type { CohortSubject } from '../src/synth/cohort.js';
import { synthesizeTake, type SynthTruth } from '../src/synth/index.js';

/** One cohort subject's take as a track, with the walker's truth. */
export interface CohortTrack {
  subject: CohortSubject;
  track: Track;
  truth: SynthTruth;
}

/** Returns the track of a cohort subject (file name `<id>.bvh` in messages). */
export function cohortTrack(subject: CohortSubject): CohortTrack {
  const r = synthesizeTake(subject.options);
  return { subject, track: trackFromImported(resolveImported(`${subject.id}.bvh`, r.take)), truth: r.truth };
}
