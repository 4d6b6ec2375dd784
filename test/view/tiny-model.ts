// A tiny coupling model for the viewer's forecast tests: one short epoch on three synthesized 6 s
// takes of invented subjects (no twin), saved to a model file, in a few seconds.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { synthesizeTake } from '../../src/synth/index.js';
import { importTake } from '../../src/skeleton/import.js';
import { trackFromImported } from '../../src/motion/track.js';
import { fitPair, savePair } from '../../src/model/pair-fit.js';

/** Returns the path of a tiny model file written into `dir`. */
export async function writeTinyModel(dir: string): Promise<string> {
  const takes = ['V1', 'V2', 'V3'].map((subject, i) => {
    const path = join(dir, `${subject}.bvh`);
    writeFileSync(path, synthesizeTake({ seed: 5300 + i, duration: 6, frameRate: 60 }).bvhText);
    return { track: trackFromImported(importTake(path)), subject, phase: null };
  });
  const pair = await fitPair(takes, { twin: false, epochs: 1, maxStepsPerEpoch: 3, batchSize: 4, seed: 7, config: { hidden: 12, pairHidden: 8, messageHidden: 8, updateHidden: 16 } });
  return savePair(join(dir, 'tiny-model.json'), pair);
}
