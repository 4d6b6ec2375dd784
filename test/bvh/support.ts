// Shared helpers of the BVH tests: fixture paths, temp files, and bit-exact comparison of takes.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';
import { parseBvh } from '../../src/bvh/parse.js';
import type { Take } from '../../src/bvh/take.js';
import { BvhParseError } from '../../src/errors/index.js';

/** Absolute path of the BVH fixture folder. */
export const FIXTURE_DIR = fileURLToPath(new URL('../fixtures/bvh/', import.meta.url));

/** Returns the absolute path of a fixture file. */
export function fixturePath(name: string): string {
  return join(FIXTURE_DIR, name);
}

/** Returns the raw bytes of a fixture file. */
export function fixtureBytes(name: string): Uint8Array {
  return readFileSync(fixturePath(name));
}

/** Returns the take parsed in memory from a fixture, labelled with its file name. */
export function parseFixture(name: string): Take {
  return parseBvh(fixtureBytes(name), { file: name });
}

/** Returns a fresh temp directory and a function that removes it. */
export function tempDir(prefix = 'jointloom-bvh-'): { dir: string; file: (name: string, text: string | Uint8Array) => string; cleanup: () => void } {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  return {
    dir,
    file: (name, text) => {
      const p = join(dir, name);
      writeFileSync(p, text);
      return p;
    },
    cleanup: () => rmSync(dir, { recursive: true, force: true }),
  };
}

/** Returns the 64-bit patterns of a float array as hex strings (so -0, 0 and NaN payloads differ). */
export function bitPatterns(values: ArrayLike<number>): string[] {
  const f = new Float64Array(1);
  const u = new BigUint64Array(f.buffer);
  const out: string[] = [];
  for (let i = 0; i < values.length; i++) {
    f[0] = values[i]!;
    out.push(u[0]!.toString(16));
  }
  return out;
}

/** Returns the index of the first value whose bits differ, or -1 when the arrays are bit-identical. */
export function firstBitDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) return Math.min(a.length, b.length);
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return i;
  return -1;
}

/** Returns the joints without their source line numbers, offsets as bit patterns, for deep equality. */
export function jointShapes(take: Take): unknown[] {
  return take.joints.map((j) => ({
    name: j.name,
    parent: j.parent,
    offset: bitPatterns(j.offset),
    channels: [...j.channels],
    channelStart: j.channelStart,
    endSite: j.endSite,
  }));
}

/**
 * Asserts two takes hold the same skeleton, timing and bit-identical values. Source line numbers,
 * warnings and the header's claim are left out unless `strict` (they describe the text, not the take).
 */
export function expectSameTake(actual: Take, expected: Take, strict = false): void {
  expect(jointShapes(actual)).toEqual(jointShapes(expected));
  expect(Object.is(actual.frameTime, expected.frameTime)).toBe(true);
  expect(actual.frameCount).toBe(expected.frameCount);
  expect(actual.channelCount).toBe(expected.channelCount);
  expect(actual.values.length).toBe(expected.values.length);
  const diff = firstBitDifference(actual.values, expected.values);
  expect(diff, diff < 0 ? '' : `value ${diff}: ${actual.values[diff]} vs ${expected.values[diff]}`).toBe(-1);
  if (strict) {
    expect(actual.joints.map((j) => j.line)).toEqual(expected.joints.map((j) => j.line));
    expect(actual.warnings).toEqual(expected.warnings);
    expect(actual.headerFrameCount).toBe(expected.headerFrameCount);
  }
}

/** Returns the BvhParseError thrown by `fn`; fails the test when it returns or throws anything else. */
export function catchParseError(fn: () => unknown): BvhParseError {
  let caught: unknown;
  try {
    fn();
  } catch (e) {
    caught = e;
  }
  if (caught === undefined) throw new Error('expected a BvhParseError, but parsing succeeded');
  if (!(caught instanceof BvhParseError)) throw new Error(`expected a BvhParseError, got ${String(caught)}`);
  return caught;
}
