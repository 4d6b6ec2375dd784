// Who and when a take belongs to: the subject and session, from a sidecar JSON beside the take
// (`<take>.json` with "subject" and "session", optional "date"), else from the folder layout
// `<subject>/<session>/<take>.bvh` below the folder the batch was given.
import { existsSync, readFileSync } from 'node:fs';
import { basename, dirname, join, relative, sep } from 'node:path';
import { InputError } from '../errors/index.js';

/** The subject and session of one take, and where they were read from. */
export interface TakeIdentity {
  subject: string;
  session: string;
  date: string | null;
  from: 'sidecar' | 'folders';
}

/** Returns the sidecar path of a take: the same name with .json instead of .bvh. */
export function sidecarPath(take: string): string {
  return join(dirname(take), basename(take).replace(/\.bvh$/i, '') + '.json');
}

const text = (v: unknown): string | null =>
  typeof v === 'string' && v.trim() !== '' ? v.trim() : typeof v === 'number' && Number.isFinite(v) ? String(v) : null;

/** Returns the identity of `take` found below `root`; throws InputError saying how to give one when neither source has it. */
export function takeIdentity(take: string, root: string): TakeIdentity {
  const side = sidecarPath(take);
  if (existsSync(side)) {
    let v: unknown;
    try {
      v = JSON.parse(readFileSync(side, 'utf8'));
    } catch {
      throw new InputError(`${side}: the session sidecar is not valid JSON.`);
    }
    const o = (v ?? {}) as Record<string, unknown>;
    const subject = text(o.subject), session = text(o.session);
    if (subject && session) return { subject, session, date: text(o.date), from: 'sidecar' };
    throw new InputError(`${side}: the session sidecar needs "subject" and "session".`);
  }
  const parts = relative(root, dirname(take)).split(sep).filter((p) => p !== '' && p !== '.');
  if (parts.length >= 2 && !parts.includes('..')) {
    return { subject: parts[parts.length - 2]!, session: parts[parts.length - 1]!, date: null, from: 'folders' };
  }
  throw new InputError(`${take}: no subject and session: add ${basename(side)} with "subject" and "session", or place the take as <subject>/<session>/${basename(take)}.`);
}
