// PLACEHOLDER: the streaming parser is being written; signatures are final.
import type { Take } from './take.js';

export interface ParseOptions {
  /** Name used in error messages. */
  file?: string;
}

/** Returns the take parsed from BVH text or bytes; throws BvhParseError on bad input. */
export function parseBvh(input: string | Uint8Array, options: ParseOptions = {}): Take {
  void input; void options;
  throw new Error('parser not written yet');
}

/** Returns the take read from a BVH file in chunks (no whole-file line split). */
export function readBvhFile(path: string, options: ParseOptions = {}): Take {
  void path; void options;
  throw new Error('parser not written yet');
}
