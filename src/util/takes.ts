// Finding BVH takes: files named directly, and folders searched recursively, in a stable order.
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { UsageError } from '../errors/index.js';

/** Returns the BVH files among `paths` (files as given, folders searched recursively), sorted, without repeats. */
export function findTakes(paths: readonly string[]): string[] {
  const out = new Set<string>();
  const walk = (dir: string) => {
    for (const name of readdirSync(dir).sort()) {
      if (name.startsWith('.')) continue;
      const p = join(dir, name);
      const st = statSync(p);
      if (st.isDirectory()) walk(p);
      else if (name.toLowerCase().endsWith('.bvh')) out.add(p);
    }
  };
  for (const p of paths) {
    let st;
    try {
      st = statSync(p);
    } catch {
      throw new UsageError(`${p}: no such file or folder.`);
    }
    if (st.isDirectory()) walk(p);
    else out.add(p);
  }
  return [...out].sort();
}
