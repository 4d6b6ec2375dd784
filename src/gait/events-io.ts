// Events files for review: written as CSV or JSON (by the file's extension), edited by hand, read back.
// Only side, kind and frame (or time) are needed on reading; pass, steady, check_frame and disagree are
// written for the reader's benefit and recomputed from the take when the events are used.
import { readFileSync } from 'node:fs';
import { extname } from 'node:path';
import { InputError, UsageError } from '../errors/index.js';
import { type RawRow, rowToEvent } from './events-row.js';
import type { GaitEvent } from './types.js';

export type EventsFormat = 'csv' | 'json';

/** Format tag of the JSON events file. */
export const EVENTS_FORMAT_TAG = 'jointloom-events';

const CSV_COLUMNS = ['side', 'kind', 'frame', 'time', 'pass', 'steady', 'check_frame', 'disagree', 'source'] as const;

/** Returns the events format a path asks for by its extension (.csv or .json); UsageError otherwise. */
export function eventsFormatOf(path: string): EventsFormat {
  const ext = extname(path).toLowerCase();
  if (ext === '.csv') return 'csv';
  if (ext === '.json') return 'json';
  throw new UsageError(`${path}: events files end in .csv or .json (got "${ext || 'no extension'}")`);
}

/** Returns the events as the text of an events file in `format` (times to the microsecond). */
export function writeEvents(events: readonly GaitEvent[], fps: number, format: EventsFormat): string {
  const t6 = (t: number) => t.toFixed(6);
  if (format === 'json') {
    const rows = events.map((e) => '    ' + JSON.stringify({
      side: e.side, kind: e.kind, frame: e.frame, time: Number(t6(e.time)), pass: e.pass, steady: e.steady,
      checkFrame: e.checkFrame, disagree: e.disagree, source: e.source,
    }));
    return `{\n  "format": "${EVENTS_FORMAT_TAG}",\n  "version": 1,\n  "fps": ${fps},\n  "events": [\n${rows.join(',\n')}\n  ]\n}\n`;
  }
  const lines = [
    `# jointloom gait events at ${fps} fps. Edit frame (or time), add or delete rows; side, kind and frame or time are read back,`,
    '# the other columns are recomputed. Research aid, not a diagnosis: results are for review by a qualified clinician.',
    CSV_COLUMNS.join(','),
  ];
  for (const e of events)
    lines.push([e.side, e.kind, e.frame, t6(e.time), e.pass, e.steady, e.checkFrame ?? '', e.disagree, e.source].join(','));
  return lines.join('\n') + '\n';
}

/** Returns the events of the file at `path` (CSV or JSON by extension) checked against the take's rate and length. */
export function readEvents(path: string, fps: number, frameCount: number): GaitEvent[] {
  const format = eventsFormatOf(path);
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (err) {
    throw new InputError(`${path}: cannot read the events file (${(err as NodeJS.ErrnoException).code ?? String(err)})`);
  }
  return parseEvents(text, path, format, fps, frameCount);
}

/** Returns the events in `text` (an events file named `path`), sorted by time; InputError `path:line: ...` for bad rows. */
export function parseEvents(text: string, path: string, format: EventsFormat, fps: number, frameCount: number): GaitEvent[] {
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const rows = format === 'csv' ? csvRows(text, path) : jsonRows(text, path, fps);
  if (rows.length === 0) throw new InputError(`${path}: the events file holds no events`);
  const seen = new Map<string, number>();
  const events = rows.map(({ row, line }) => {
    const e = rowToEvent(row, `${path}:${line}`, fps, frameCount);
    const key = `${e.side} ${e.kind} ${e.frame}`;
    const first = seen.get(key);
    if (first !== undefined) throw new InputError(`${path}:${line}: ${e.side} ${e.kind} at frame ${e.frame} is already given on line ${first}`);
    seen.set(key, line);
    return e;
  });
  return events.sort((a, b) => a.time - b.time || (a.side < b.side ? -1 : 1));
}

/** Splits one CSV line into cells (double quotes may wrap a cell; "" inside is a quote). */
function csvCells(line: string): string[] {
  const out: string[] = [];
  let cur = '', quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i]!;
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') { cur += '"'; i++; } else if (c === '"') quoted = false; else cur += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') { out.push(cur); cur = ''; } else cur += c;
  }
  out.push(cur);
  return out.map((s) => s.trim());
}

/** Returns the data rows of a CSV events file with their 1-based line numbers. */
function csvRows(text: string, path: string): { row: RawRow; line: number }[] {
  const lines = text.split(/\r?\n/);
  let header: string[] | null = null;
  const out: { row: RawRow; line: number }[] = [];
  lines.forEach((raw, i) => {
    const line = i + 1;
    if (raw.trim() === '' || raw.trimStart().startsWith('#')) return;
    const cells = csvCells(raw);
    if (!header) {
      header = cells.map((c) => c.toLowerCase());
      for (const need of ['side', 'kind'])
        if (!header.includes(need)) throw new InputError(`${path}:${line}: the header lacks the ${need} column (expected a header such as ${CSV_COLUMNS.join(',')})`);
      if (!header.includes('frame') && !header.includes('time')) throw new InputError(`${path}:${line}: the header needs a frame or a time column`);
      return;
    }
    if (cells.length > header.length) throw new InputError(`${path}:${line}: ${cells.length} cells but the header names ${header.length} columns`);
    const row: RawRow = {};
    header.forEach((h, k) => { row[h] = cells[k]; });
    out.push({ row, line });
  });
  if (!header) throw new InputError(`${path}: the events file is empty (expected a header line such as ${CSV_COLUMNS.join(',')})`);
  return out;
}

/** Returns the rows of a JSON events file with the line each event starts on. */
function jsonRows(text: string, path: string, fps: number): { row: RawRow; line: number }[] {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (err) {
    const m = /position (\d+)/.exec((err as Error).message);
    const at = m ? lineColumn(text, Number(m[1])) : null;
    throw new InputError(`${path}${at ? `:${at.line}:${at.column}` : ''}: not valid JSON (${(err as Error).message})`);
  }
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc) || !Array.isArray((doc as Record<string, unknown>).events))
    throw new InputError(`${path}:1: expected an object with an "events" array (format "${EVENTS_FORMAT_TAG}")`);
  const d = doc as Record<string, unknown>;
  if (d.format !== undefined && d.format !== EVENTS_FORMAT_TAG) throw new InputError(`${path}:1: format "${String(d.format)}" is not "${EVENTS_FORMAT_TAG}"`);
  if (d.fps !== undefined && (typeof d.fps !== 'number' || Math.abs(d.fps - fps) > 1e-6 * fps))
    throw new InputError(`${path}: the events were written for a take at ${String(d.fps)} fps, but this take runs at ${fps} fps`);
  const lines = elementLines(text, 'events');
  return (d.events as unknown[]).map((e, i) => {
    const line = lines[i] ?? 1;
    if (typeof e !== 'object' || e === null || Array.isArray(e)) throw new InputError(`${path}:${line}: event ${i + 1} is not an object`);
    return { row: e as RawRow, line };
  });
}

/** Returns the 1-based line and column of character offset `pos` in `text`. */
function lineColumn(text: string, pos: number): { line: number; column: number } {
  let line = 1, start = 0;
  for (let i = 0; i < pos && i < text.length; i++) if (text.charCodeAt(i) === 10) { line++; start = i + 1; }
  return { line, column: pos - start + 1 };
}

/** Returns the line on which each element of the array under top-level `key` starts (JSON text already known to parse). */
function elementLines(text: string, key: string): number[] {
  const out: number[] = [];
  let depth = 0, line = 1, inStr = false, esc = false, str = '', lastKey = '', inTarget = false, expect = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (c === '\n') line++;
    if (inStr) {
      if (esc) esc = false;
      else if (c === '\\') esc = true;
      else if (c === '"') { inStr = false; if (depth === 1) lastKey = str; } else str += c;
      continue;
    }
    if (inTarget && depth === 2 && expect && c !== ']' && !/\s/.test(c)) { out.push(line); expect = false; }
    if (c === '"') { inStr = true; str = ''; } else if (c === '{' || c === '[') {
      depth++;
      if (depth === 2 && c === '[' && lastKey === key) { inTarget = true; expect = true; }
    } else if (c === '}' || c === ']') {
      if (depth === 2) inTarget = false;
      depth--;
    } else if (c === ',' && inTarget && depth === 2) expect = true;
  }
  return out;
}
