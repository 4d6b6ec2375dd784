// Shared helpers of the motion tests: synthetic takes imported as a user's file would be.
import type { Take } from '../../src/bvh/take.js';
import { type ImportedTake, resolveImported } from '../../src/skeleton/import.js';
import { type SynthOptions, synthesizeTake } from '../../src/synth/index.js';
import { type Track, trackFromImported } from '../../src/motion/track.js';

/** Returns a synthetic take imported under `name` (roles, units and up detected as for a user's file). */
export function importSynth(name: string, options: Partial<SynthOptions> & { seed: number }): ImportedTake {
  return resolveImported(name, synthesizeTake(options).take);
}

/** Returns the track of a synthetic take at the default 30 Hz. */
export function synthTrack(name: string, options: Partial<SynthOptions> & { seed: number }): Track {
  return trackFromImported(importSynth(name, options));
}

/** Returns a copy of a take with only its first `frames` frames. */
export function truncateTake(take: Take, frames: number): Take {
  return { ...take, frameCount: frames, headerFrameCount: frames, values: take.values.slice(0, frames * take.channelCount), warnings: [] };
}

/** Returns true when two typed arrays hold the same bytes (bit-for-bit equality, -0 and NaN payloads included). */
export function sameBits(a: Float64Array, b: Float64Array): boolean {
  return a.length === b.length && Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength));
}

/** Offset of node n at step t in a state array (steps × nodes × 6). */
export function at(nodeCount: number, t: number, n: number): number {
  return (t * nodeCount + n) * 6;
}
