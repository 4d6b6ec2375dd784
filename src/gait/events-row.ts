// One row of a reviewed events file, checked field by field into a GaitEvent; every fault names file and line.
import { InputError } from '../errors/index.js';
import type { EventKind, GaitEvent, SideName } from './types.js';

/** The fields of one row as text (CSV cell) or JSON value; absent fields are undefined. */
export type RawRow = Record<string, unknown>;

const SIDES: Record<string, SideName> = { left: 'left', l: 'left', right: 'right', r: 'right' };
const KINDS: Record<string, EventKind> = { initial_contact: 'initial_contact', ic: 'initial_contact', toe_off: 'toe_off', to: 'toe_off' };

const blank = (v: unknown) => v === undefined || v === null || (typeof v === 'string' && v.trim() === '');

/** Returns the row as a GaitEvent (source 'file'), or throws InputError `file:line: ...`. */
export function rowToEvent(row: RawRow, where: string, fps: number, frameCount: number): GaitEvent {
  const fail = (msg: string): never => { throw new InputError(`${where}: ${msg}`); };
  const word = (name: string, table: Record<string, string>, expected: string): string => {
    const v = row[name];
    if (blank(v)) fail(`missing ${name} (expected ${expected})`);
    const key = String(v).trim().toLowerCase().replace(/[\s-]+/g, '_');
    return table[key] ?? fail(`${name} "${String(v)}" is not one of ${expected}`);
  };
  const num = (name: string): number | undefined => {
    const v = row[name];
    if (blank(v)) return undefined;
    const x = typeof v === 'number' ? v : typeof v === 'string' && /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(v.trim()) ? Number(v) : NaN;
    if (!Number.isFinite(x)) fail(`${name} "${String(v)}" is not a number`);
    return x;
  };
  const bool = (name: string): boolean | undefined => {
    const v = row[name];
    if (blank(v)) return undefined;
    if (typeof v === 'boolean') return v;
    const s = String(v).trim().toLowerCase();
    if (['true', 'yes', '1'].includes(s)) return true;
    if (['false', 'no', '0'].includes(s)) return false;
    return fail(`${name} "${String(v)}" is not true or false`);
  };
  const int = (name: string, lo: number): number | undefined => {
    const x = num(name);
    if (x === undefined) return undefined;
    if (!Number.isInteger(x) || x < lo) fail(`${name} ${x} is not a whole number of at least ${lo}`);
    return x;
  };
  const side = word('side', SIDES, 'left, right') as SideName;
  const kind = word('kind', KINDS, 'initial_contact, toe_off') as EventKind;
  let frame = int('frame', 0);
  let time = num('time');
  if (frame === undefined && time === undefined) fail('give a frame or a time for the event');
  if (frame !== undefined && frame >= frameCount) fail(`frame ${frame} is past the take's last frame (${frameCount - 1})`);
  if (time !== undefined) {
    const f = time * fps;
    if (f < -0.5 || f > frameCount - 0.5) fail(`time ${time} s lies outside the take (0 to ${((frameCount - 1) / fps).toFixed(6)} s)`);
    if (frame !== undefined && Math.abs(f - frame) > 0.5 + 1e-6)
      fail(`frame ${frame} and time ${time} s disagree (frame ${frame} is at ${(frame / fps).toFixed(6)} s at ${fps} fps); change one or delete it`);
    frame ??= Math.min(frameCount - 1, Math.max(0, Math.round(f)));
  }
  time ??= frame! / fps;
  const checkFrame = int('check_frame', 0) ?? int('checkFrame', 0) ?? null;
  return {
    side, kind, frame: frame!, time,
    checkFrame, disagree: bool('disagree') ?? false, pass: int('pass', -1) ?? -1, steady: bool('steady') ?? true, source: 'file',
  };
}
