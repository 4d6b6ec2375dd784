// Synthetic takes for the model tests: short walks of fictional subjects, imported as a user's file
// would be (roles, units and up axis detected), as training takes with their subject.
import type { TrainingTake } from '../../src/model/batch.js';
import type { ModelConfig } from '../../src/model/config.js';
import { trackFromImported } from '../../src/motion/track.js';
import { resolveImported } from '../../src/skeleton/import.js';
import { synthesizeTake } from '../../src/synth/index.js';

/** Returns a training take of `seconds` of walking for seed `s` (height and speed vary with the seed). */
export function synthTrainingTake(s: number, seconds = 12): TrainingTake {
  const take = synthesizeTake({ seed: s, duration: seconds, frameRate: 60, height: 1.6 + 0.05 * (s % 6), speed: 1.1 + 0.05 * (s % 5) }).take;
  return { track: trackFromImported(resolveImported(`walker-${s}.bvh`, take)), subject: `walker-${s}` };
}

/** A small configuration that trains in seconds (1 s observed, 0.5 s forecast at 30 Hz). */
export const SMALL: Partial<ModelConfig> = {
  observe: 30, forecast: 15, hidden: 12, pairHidden: 12, staticDims: 3, dynamicDims: 3, dynamicStride: 5,
  messageHidden: 12, updateHidden: 24, reconSteps: 10,
};
