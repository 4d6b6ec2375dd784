// Small synthesized takes with session sidecars in a temp folder, for the score, ledger and batch tests.
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { synthesizeTake } from '../../src/synth/index.js';

/** One take to write: its path below the folder, subject, session and synth seed. */
export interface TakeSpec { file: string; subject: string; session: string; date: string; seed: number; sidecar?: boolean }

/** Writes the takes (8 s at 100 Hz, fictional subjects) with sidecars; returns their full paths. */
export function writeTakes(root: string, specs: readonly TakeSpec[]): string[] {
  return specs.map((s) => {
    const path = join(root, s.file);
    mkdirSync(dirname(path), { recursive: true });
    writeFileSync(path, synthesizeTake({ seed: s.seed, subjectSeed: s.seed % 7, duration: 8, frameRate: 100 }).bvhText);
    if (s.sidecar !== false)
      writeFileSync(path.replace(/\.bvh$/, '.json'), JSON.stringify({ clinic: 'Test Hollow Gait Room', subject: s.subject, session: s.session, date: s.date, invented: true }));
    return path;
  });
}

/** Returns `n` take specs over subjects T01, T02, … with two sessions each. */
export function cohortSpecs(n: number, seed0 = 4100): TakeSpec[] {
  return Array.from({ length: n }, (_, i) => {
    const subject = `T0${1 + Math.floor(i / 4)}`, session = String(1 + (Math.floor(i / 2) % 2));
    return { file: `${subject}-${session}-${i}.bvh`, subject, session, date: `2031-0${session}-1${subject.slice(-1)}`, seed: seed0 + i };
  });
}
