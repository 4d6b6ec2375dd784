// Deterministic partitioning of a take list into N shards, for job-array schedulers: a take belongs
// to shard K of N when the first four bytes of SHA-256 of its path relative to the given folder
// (forward slashes), read as an unsigned integer, equal K − 1 modulo N.
import { UsageError } from '../errors/index.js';
import { sha256Hex } from './hash.js';

/** One shard: index K (1-based) of N. */
export interface Shard { k: number; n: number }

/** Returns the shard named by "K/N"; throws UsageError unless 1 ≤ K ≤ N. */
export function parseShard(spec: string): Shard {
  const m = /^(\d+)\/(\d+)$/.exec(spec.trim());
  const k = m ? Number(m[1]) : NaN, n = m ? Number(m[2]) : NaN;
  if (!m || !(n >= 1) || !(k >= 1) || k > n) throw new UsageError(`--shard expects K/N with 1 ≤ K ≤ N (e.g. 2/4), got "${spec}".`);
  return { k, n };
}

/** Returns the 1-based shard of a relative path among n shards. */
export function shardOf(relPath: string, n: number): number {
  const h = sha256Hex(relPath.split('\\').join('/'));
  return (parseInt(h.slice(0, 8), 16) % n) + 1;
}
