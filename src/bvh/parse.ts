// Strict, streaming BVH parser: hierarchy tokens, then frame lines scanned straight into a Float64Array.
import type { ChannelName, Joint, Take } from './take.js';
import { CHANNEL_NAMES } from './take.js';
import { ByteReader, isSpace, memoryReader, withFileReader } from './reader.js';
import { scanNumber, scannedValue } from './number.js';
import { BvhParseError } from '../errors/index.js';

export interface ParseOptions {
  /** Name used in error messages. */
  file?: string;
}

/** Limits beyond which a file is refused as absurd rather than read. */
export const LIMITS = {
  joints: 10_000,
  frames: 100_000_000,
  values: 2_000_000_000,
  minFrameTime: 1e-6,
  maxFrameTime: 60,
  nameBytes: 1024,
  depth: 1000,
};

const TOKEN_LOOKAHEAD = 4096;
const POW10 = [1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/** Returns the take parsed from BVH text or bytes; throws BvhParseError on bad input. */
export function parseBvh(input: string | Uint8Array, options: ParseOptions = {}): Take {
  const bytes = typeof input === 'string' ? Buffer.from(input, 'utf8') : input;
  return parseFrom(memoryReader(options.file ?? '<input>', bytes));
}

/** Returns the take read from a BVH file in chunks (no whole-file line split). */
export function readBvhFile(path: string, options: ParseOptions = {}): Take {
  return withFileReader(path, (r) => parseFrom(r), options.file);
}

function parseFrom(r: ByteReader): Take {
  const warnings: string[] = [];
  skipBom(r);
  expectKeyword(r, 'HIERARCHY');
  const joints: Joint[] = [];
  let channelCount = 0;
  let tok = nextToken(r);
  if (!tokenIs(r, tok, 'ROOT')) throw r.fail('ROOT after HIERARCHY');
  while (tokenIs(r, tok, 'ROOT')) {
    r.pos = tok;
    channelCount = parseJoint(r, joints, -1, channelCount, false, r.line);
    tok = nextToken(r);
  }
  if (!tokenIs(r, tok, 'MOTION')) throw r.fail('ROOT or MOTION after the hierarchy');
  checkNames(joints, warnings, r.file);

  const headerFrames = parseFramesHeader(r);
  const frameTime = parseFrameTime(r);
  const { values, frames } = parseMotion(r, channelCount, headerFrames);
  if (frames !== headerFrames) {
    const gap = headerFrames - frames;
    if (gap > 1)
      throw new BvhParseError(r.file, r.line, r.column(), `${headerFrames} frames as the header says`, `${frames} frame lines`, 'the file looks truncated');
    warnings.push(`${r.file}: header says ${headerFrames} frames but the file holds ${frames} frame lines; the data lines are used.`);
  }
  return { joints, frameTime, frameCount: frames, channelCount, values, headerFrameCount: headerFrames, warnings };
}

function skipBom(r: ByteReader): void {
  r.ensure(3);
  if (r.buf[r.pos] === 0xef && r.buf[r.pos + 1] === 0xbb && r.buf[r.pos + 2] === 0xbf) {
    r.pos += 3;
    r.lineStart += 3;
  }
}

/** Skips white space, counting lines; leaves r.pos at the next non-space byte or the end. */
function skipSpace(r: ByteReader): void {
  for (;;) {
    if (r.pos >= r.end) {
      if (r.eof) return;
      r.ensure(TOKEN_LOOKAHEAD);
      if (r.pos >= r.end) return;
    }
    const c = r.buf[r.pos]!;
    if (c === 10) {
      r.line++;
      r.lineStart = r.base + r.pos + 1;
    } else if (!isSpace(c)) return;
    r.pos++;
  }
}

/** Moves to the next token; returns its end position (exclusive); r.pos is its start. */
function nextToken(r: ByteReader): number {
  skipSpace(r);
  r.ensure(TOKEN_LOOKAHEAD);
  const start = r.pos;
  if (start >= r.end) return start;
  const c = r.buf[start]!;
  if (c === 123 || c === 125) return start + 1;
  let q = start;
  while (q < r.end && !isSpace(r.buf[q]!) && r.buf[q] !== 123 && r.buf[q] !== 125) q++;
  if (q - start >= TOKEN_LOOKAHEAD) throw r.fail('a keyword or number', `a token longer than ${TOKEN_LOOKAHEAD} bytes`);
  return q;
}

function tokenIs(r: ByteReader, end: number, word: string): boolean {
  if (end - r.pos !== word.length) return false;
  for (let k = 0; k < word.length; k++) if (r.buf[r.pos + k] !== word.charCodeAt(k)) return false;
  return true;
}

function expectKeyword(r: ByteReader, word: string, what = word): void {
  const end = nextToken(r);
  if (!tokenIs(r, end, word)) throw r.fail(what);
  r.pos = end;
}

function expectBrace(r: ByteReader, brace: '{' | '}', context: string): void {
  const end = nextToken(r);
  if (!tokenIs(r, end, brace)) throw r.fail(`"${brace}" ${context}`);
  r.pos = end;
}

/** Reads a joint name: the rest of the line up to "{" or the line end, trimmed. */
function readName(r: ByteReader, what: string): string {
  while (r.pos < r.end && (r.buf[r.pos] === 32 || r.buf[r.pos] === 9)) r.pos++;
  r.ensure(LIMITS.nameBytes + 2);
  const start = r.pos;
  let q = start;
  while (q < r.end && r.buf[q] !== 10 && r.buf[q] !== 13 && r.buf[q] !== 123 && q - start <= LIMITS.nameBytes) q++;
  if (q - start > LIMITS.nameBytes) throw r.fail(`${what} of at most ${LIMITS.nameBytes} bytes`, 'a longer name');
  const name = r.text(start, q).trim();
  r.pos = q;
  return name;
}

function readNumber(r: ByteReader, what: string): number {
  const end = nextToken(r);
  const q = scanNumber(r.buf, r.pos, end);
  if (q !== end || q === r.pos) throw r.fail(what);
  const v = scannedValue;
  if (!Number.isFinite(v)) throw r.fail(`a finite ${what.replace(/^an? /, '')}`);
  r.pos = end;
  return v;
}

function readInteger(r: ByteReader, what: string, max: number): number {
  skipSpace(r);
  const at = r.pos;
  const v = readNumber(r, what);
  if (!Number.isInteger(v) || v < 0) throw r.fail(what, String(v), undefined, at);
  if (v > max) throw r.fail(max > 6 ? `${what} of at most ${max}` : what, String(v), max > 6 ? 'the file is refused as absurdly large' : undefined, at);
  return v;
}

/** Parses a ROOT or JOINT block (keyword already consumed up to r.pos) and returns the running channel count. */
function parseJoint(r: ByteReader, joints: Joint[], parent: number, channelCount: number, endSite: boolean, line: number, depth = 0): number {
  if (depth > LIMITS.depth) throw r.fail(`joints nested at most ${LIMITS.depth} deep`, 'deeper nesting', 'the file is refused as absurd');
  if (joints.length >= LIMITS.joints) throw r.fail(`at most ${LIMITS.joints} joints`, 'more', 'the file is refused as absurdly large');
  let name = readName(r, endSite ? 'an End Site name' : 'a joint name');
  if (!endSite && name === '') throw r.fail('a joint name');
  if (endSite) name = name || `${joints[parent]!.name}_End`;
  const index = joints.length;
  const joint: Joint = { name, parent, offset: [0, 0, 0], channels: [], channelStart: channelCount, endSite, line };
  joints.push(joint);
  expectBrace(r, '{', `to open ${endSite ? 'the End Site' : `joint "${name}"`}`);
  let sawOffset = false;
  let sawChannels = false;
  for (;;) {
    const end = nextToken(r);
    if (r.pos >= r.end) throw r.fail(`"}" to close ${endSite ? 'the End Site' : `joint "${name}"`}`, 'end of file', 'the file looks truncated');
    if (tokenIs(r, end, '}')) {
      if (!sawOffset) throw r.fail(`an OFFSET in ${endSite ? 'the End Site' : `joint "${name}"`}`);
      r.pos = end;
      break;
    }
    const keyLine = r.line;
    if (tokenIs(r, end, 'OFFSET')) {
      if (sawOffset) throw r.fail('one OFFSET per joint', 'a second OFFSET');
      r.pos = end;
      sawOffset = true;
      joint.offset = [readNumber(r, 'an OFFSET number'), readNumber(r, 'an OFFSET number'), readNumber(r, 'an OFFSET number')];
    } else if (tokenIs(r, end, 'CHANNELS') && !endSite) {
      if (sawChannels) throw r.fail('one CHANNELS line per joint', 'a second CHANNELS');
      r.pos = end;
      sawChannels = true;
      const n = readInteger(r, 'a channel count from 0 to 6', 6);
      for (let k = 0; k < n; k++) {
        const e = nextToken(r);
        const found = r.text(r.pos, e);
        const ch = CHANNEL_NAMES.find((c) => c === found);
        if (!ch) throw r.fail(`a channel name (one of ${CHANNEL_NAMES.join(', ')})`, e > r.pos ? `"${found}"` : undefined, k > 0 ? `CHANNELS ${n} lists ${k} names` : undefined);
        if (joint.channels.includes(ch)) throw r.fail('each channel once per joint', `a second ${ch}`);
        joint.channels.push(ch as ChannelName);
        r.pos = e;
      }
      channelCount += n;
    } else if (tokenIs(r, end, 'JOINT') && !endSite) {
      r.pos = end;
      channelCount = parseJoint(r, joints, index, channelCount, false, keyLine, depth + 1);
    } else if (tokenIs(r, end, 'End') && !endSite) {
      r.pos = end;
      expectKeyword(r, 'Site', '"Site" after "End"');
      channelCount = parseJoint(r, joints, index, channelCount, true, keyLine, depth + 1);
    } else {
      throw r.fail(endSite ? 'OFFSET or "}" in an End Site' : 'OFFSET, CHANNELS, JOINT, End Site or "}"');
    }
  }
  return channelCount;
}

function checkNames(joints: Joint[], warnings: string[], file: string): void {
  const seen = new Map<string, number>();
  for (const j of joints) {
    if (j.endSite) continue;
    const first = seen.get(j.name);
    if (first !== undefined) warnings.push(`${file}:${j.line}: joint name "${j.name}" repeats the joint at line ${first}; roles will tell them apart by position in the tree.`);
    else seen.set(j.name, j.line);
  }
}

function parseFramesHeader(r: ByteReader): number {
  expectKeyword(r, 'MOTION');
  const end = nextToken(r);
  // "Frames:" or "Frames:123" or "Frames :"
  if (tokenIs(r, end, 'Frames:')) r.pos = end;
  else if (tokenIs(r, end, 'Frames')) {
    r.pos = end;
    expectKeyword(r, ':', '":" after "Frames"');
  } else if (end - r.pos > 7 && r.text(r.pos, r.pos + 7) === 'Frames:') r.pos += 7;
  else throw r.fail('"Frames:" after MOTION');
  return readInteger(r, 'a whole frame count', LIMITS.frames);
}

function parseFrameTime(r: ByteReader): number {
  expectKeyword(r, 'Frame', '"Frame Time:"');
  const end = nextToken(r);
  if (tokenIs(r, end, 'Time:')) r.pos = end;
  else if (tokenIs(r, end, 'Time')) {
    r.pos = end;
    expectKeyword(r, ':', '":" after "Frame Time"');
  } else if (end - r.pos > 5 && r.text(r.pos, r.pos + 5) === 'Time:') r.pos += 5;
  else throw r.fail('"Time:" after "Frame"');
  skipSpace(r);
  const at = r.pos;
  const ft = readNumber(r, 'a frame time in seconds');
  if (!(ft > 0)) throw r.fail('a positive frame time in seconds', String(ft), undefined, at);
  if (ft < LIMITS.minFrameTime || ft > LIMITS.maxFrameTime)
    throw r.fail(`a frame time between ${LIMITS.minFrameTime} and ${LIMITS.maxFrameTime} s`, String(ft), undefined, at);
  // The rest of the Frame Time line must be empty.
  while (r.pos < r.end && (r.buf[r.pos] === 32 || r.buf[r.pos] === 9 || r.buf[r.pos] === 13)) r.pos++;
  if (r.pos < r.end && r.buf[r.pos] !== 10) throw r.fail('the end of the Frame Time line');
  return ft;
}

/** Scans frame lines into one array; each line must hold exactly `C` numbers. */
function parseMotion(r: ByteReader, C: number, headerFrames: number): { values: Float64Array; frames: number } {
  // Capacity: the header's claim plus one frame, never more than the bytes left could spell (2 bytes a value).
  const bytesLeft = r.size >= 0 ? r.size - (r.base + r.pos) : Infinity;
  let cap = Math.max(C, Math.min((headerFrames + 1) * C, Math.floor(bytesLeft / 2) + C));
  if (cap > LIMITS.values) throw r.fail(`at most ${LIMITS.values} values`, `${cap}`, 'the file is refused as absurdly large');
  let values = new Float64Array(cap);
  let n = 0;
  let onLine = 0;
  let frames = 0;
  let buf = r.buf;
  let pos = r.pos;
  let end = r.end;
  for (;;) {
    if (end - pos < 64 && !r.eof) {
      r.pos = pos;
      r.ensure(TOKEN_LOOKAHEAD);
      buf = r.buf; pos = r.pos; end = r.end;
    }
    if (pos >= end) break;
    const c = buf[pos]!;
    if (c === 32 || c === 9 || c === 13) { pos++; continue; }
    if (c === 10) {
      if (onLine !== 0) {
        if (onLine !== C) { r.pos = pos; throw r.fail(`${C} values on frame ${frames + 1}`, `${onLine}`, 'each frame line holds one value per channel'); }
        frames++;
        onLine = 0;
      }
      r.line++;
      r.lineStart = r.base + pos + 1;
      pos++;
      continue;
    }
    // Fast path for the common "[-]digits[.digits]" with at most 15 digits, ending in white space:
    // the exact m / 10^k of Clinger (1990). Anything else goes through scanNumber below.
    if (onLine < C && n < cap) {
      let i = pos;
      const neg = c === 45;
      if (neg) i++;
      let m = 0, nd = 0, fd = 0, d = 0;
      while (i < end && (d = buf[i]! - 48) >= 0 && d <= 9) { m = m * 10 + d; nd++; i++; }
      if (i < end && buf[i] === 46) {
        i++;
        while (i < end && (d = buf[i]! - 48) >= 0 && d <= 9) { m = m * 10 + d; nd++; fd++; i++; }
      }
      const t = i < end ? buf[i]! : 0;
      if (nd > 0 && nd <= 15 && (t === 32 || t === 10 || t === 13 || t === 9)) {
        const v = fd === 0 ? m : m / POW10[fd]!;
        values[n++] = neg ? -v : v;
        onLine++;
        pos = i;
        continue;
      }
    }
    const q = scanNumber(buf, pos, end);
    if (q === end && !r.eof) {
      // A long number reaching the buffer's end: buffer more and scan it again.
      r.pos = pos;
      if (r.ensure(end - pos + TOKEN_LOOKAHEAD) <= end - pos) throw r.fail('a number', 'a token that does not end');
      buf = r.buf; pos = r.pos; end = r.end;
      continue;
    }
    if (q < 0 || (q < end && !isSpace(buf[q]!))) {
      r.pos = pos;
      throw r.fail(`a number (frame ${frames + 1}, value ${onLine + 1} of ${C})`);
    }
    const v = scannedValue;
    if (v !== v || v === Infinity || v === -Infinity) { r.pos = pos; throw r.fail('a finite number'); }
    if (onLine === C) { r.pos = pos; throw r.fail(`${C} values on frame ${frames + 1}`, 'more', 'each frame line holds one value per channel'); }
    if (n === cap) {
      cap = Math.min(LIMITS.values, cap * 2);
      if (n === cap) { r.pos = pos; throw r.fail(`at most ${LIMITS.values} values`, 'more', 'the file is refused as absurdly large'); }
      const bigger = new Float64Array(cap);
      bigger.set(values);
      values = bigger;
    }
    values[n++] = v;
    onLine++;
    pos = q;
  }
  r.pos = pos;
  if (onLine !== 0) {
    if (onLine !== C) throw r.fail(`${C} values on frame ${frames + 1}`, `${onLine} before the end of file`, 'the file looks truncated');
    frames++;
  }
  if (frames === 0) throw r.fail('at least one frame line after "Frame Time:"', 'end of file', 'the MOTION section is empty');
  return { values: values.length === n ? values : values.subarray(0, n), frames };
}
