// Finding takes: files as given, folders recursively, sorted, no repeats; a missing path is a usage error.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { findTakes } from '../../src/util/takes.js';
import { UsageError } from '../../src/errors/index.js';

const root = mkdtempSync(join(tmpdir(), 'jointloom-takes-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('findTakes', () => {
  it('searches folders recursively for .bvh (any case), skips hidden entries and other files', () => {
    mkdirSync(join(root, 'b', 'deep'), { recursive: true });
    mkdirSync(join(root, '.hidden'));
    for (const f of ['a.bvh', 'b/c.BVH', 'b/deep/d.bvh', 'b/notes.txt', '.hidden/e.bvh']) writeFileSync(join(root, f), '');
    expect(findTakes([root])).toEqual([join(root, 'a.bvh'), join(root, 'b', 'c.BVH'), join(root, 'b', 'deep', 'd.bvh')]);
    expect(findTakes([join(root, 'a.bvh'), root]).length).toBe(3);
  });
  it('a missing path is a usage error naming it', () => {
    expect(() => findTakes([join(root, 'nope')])).toThrow(UsageError);
    expect(() => findTakes([join(root, 'nope')])).toThrow(/nope: no such file or folder/);
  });
});
