// Content hashes: the SHA-256 that identifies a take (and a model file) in the ledger.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';

/** Returns the lowercase hex SHA-256 of the bytes or UTF-8 text. */
export function sha256Hex(data: string | Uint8Array): string {
  return createHash('sha256').update(data).digest('hex');
}

/** Returns the lowercase hex SHA-256 of a file's content. */
export function fileSha256(path: string): string {
  return sha256Hex(readFileSync(path));
}
