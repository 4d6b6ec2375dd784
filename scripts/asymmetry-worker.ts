// Worker thread of scripts/eval-asymmetry.ts (piscina): one validation subject per task.
import type { AsymmetrySubject } from '../src/synth/cohort.js';
import { evaluateAsymmetryTake, type AsymmetryTakeResult } from './asymmetry-take.js';

export default function run(task: { subject: AsymmetrySubject; modelPath: string; mirror: boolean; useProfiles?: boolean }): AsymmetryTakeResult {
  return evaluateAsymmetryTake(task.subject, task.modelPath, task.mirror, task.useProfiles ?? true);
}
