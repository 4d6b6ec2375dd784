// The benchmark's input: a long take written to a temporary BVH file, from src/synth's walker when it
// loads, else from the programmatic smooth take of test/reference (the output says which).
import { mkdtempSync, writeFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeBvh, type Take } from '../../src/bvh/index.js';
import { smoothTake } from '../reference/smooth-take.js';

export interface BenchInput {
  path: string;
  bytes: number;
  take: Take;
  /** Where the motion came from, for the report. */
  source: string;
}

const RATE = 120;

/** Returns the synthesized take and its text, or the reason src/synth could not be used. */
async function fromSynth(seconds: number): Promise<{ take: Take; text: string } | { reason: string }> {
  try {
    const { synthesizeTake } = await import('../../src/synth/index.js');
    const r = synthesizeTake({ seed: 1, duration: seconds, frameRate: RATE, decimals: 4 });
    return { take: r.take, text: r.bvhText };
  } catch (e) {
    return { reason: `src/synth unavailable (${(e as Error).message})` };
  }
}

/** Returns a take of `seconds` at 120 Hz with 4-decimal frame values, written to a temporary file. */
export async function buildBenchInput(seconds: number): Promise<BenchInput> {
  const synth = await fromSynth(seconds);
  let take: Take;
  let text: string;
  let source: string;
  if ('take' in synth) {
    ({ take, text } = synth);
    source = 'src/synth synthesizeTake({ seed: 1, frameRate: 120, decimals: 4 }), its own BVH text';
  } else {
    take = smoothTake({ seed: 1, seconds, rate: RATE, order: 'ZXY' });
    text = writeBvh(take, { decimals: 4 });
    source = `programmatic smooth take (test/reference/smooth-take.ts) written by writeBvh with decimals 4; ${synth.reason}`;
  }
  const dir = mkdtempSync(join(tmpdir(), 'jointloom-bench-'));
  const path = join(dir, 'bench-take.bvh');
  writeFileSync(path, text);
  return { path, bytes: statSync(path).size, take, source };
}
