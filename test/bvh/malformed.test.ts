// Malformed input: every case raises BvhParseError naming the exact line and column (1-based,
// columns in bytes) and what was expected there; reading the same bytes from a file gives the same error.
import { afterAll, describe, expect, it } from 'vitest';
import { parseBvh, readBvhFile } from '../../src/bvh/parse.js';
import { BvhParseError, UserError } from '../../src/errors/index.js';
import { CASES } from './malformed-cases.js';
import { catchParseError, tempDir } from './support.js';

const tmp = tempDir();
afterAll(() => tmp.cleanup());

describe('malformed BVH raises BvhParseError at the exact place', () => {
  it('has at least 15 named cases, at least 15 of them currently exact', () => {
    expect(CASES.length).toBeGreaterThanOrEqual(15);
    expect(new Set(CASES.map((c) => c.name)).size).toBe(CASES.length);
  });

  CASES.forEach((c, i) => {
    it(c.name, () => {
      const e = catchParseError(() => parseBvh(c.input, { file: 'case.bvh' }));
      expect(e).toBeInstanceOf(BvhParseError);
      expect(e).toBeInstanceOf(UserError);
      expect(e.exitCode).toBe(1);
      expect(e.file).toBe('case.bvh');
      expect(e.line).toBe(c.line);
      if (c.found) expect(e.found).toContain(c.found);
      if (c.hint) expect(e.hint ?? '').toContain(c.hint);
      expect(e.column).toBe(c.column);
      expect(e.expected).toContain(c.expected);
      // The message has the compiler-style "file:line:column: " prefix, then the expectation.
      expect(e.message.startsWith(`case.bvh:${c.line}:${c.column}: expected ${e.expected}, found ${e.found}`)).toBe(true);
      expect(e.message).toMatch(/^[^:]+:\d+:\d+: expected .+, found .+/);
      // The same bytes read through the chunked file reader fail identically.
      const path = tmp.file(`case-${i}.bvh`, c.input);
      const f = catchParseError(() => readBvhFile(path, { file: 'case.bvh' }));
      expect(f.message).toBe(e.message);
    });
  });

  it('without a file option the message names <input>; readBvhFile names the path', () => {
    const e = catchParseError(() => parseBvh(''));
    expect(e.message).toBe('<input>:1:1: expected HIERARCHY, found end of file');
    const path = tmp.file('unnamed.bvh', 'HIERARCHY\n');
    const f = catchParseError(() => readBvhFile(path));
    expect(f.file).toBe(path);
    expect(f.message.startsWith(`${path}:2:1: expected ROOT after HIERARCHY`)).toBe(true);
  });
});
