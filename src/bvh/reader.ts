// A byte reader over a chunked source that tracks line and column, for the BVH parser.
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { BvhParseError } from '../errors/index.js';

/** Reads up to `length` bytes into `dst` at `offset`; returns the count, 0 at end of input. */
export type ChunkSource = (dst: Uint8Array, offset: number, length: number) => number;

const CHUNK = 1 << 20;
const DECODER = new TextDecoder('utf-8');

/** Byte cursor over a whole in-memory input or a file read in chunks; positions are bytes. */
export class ByteReader {
  buf: Uint8Array;
  pos = 0;
  end: number;
  eof: boolean;
  /** Absolute offset of buf[0] in the input. */
  base = 0;
  /** 1-based current line and the absolute offset where it starts. */
  line = 1;
  lineStart = 0;
  /** Total input size in bytes when known, else -1. */
  readonly size: number;
  readonly file: string;
  private readonly source: ChunkSource | null;

  constructor(file: string, input: Uint8Array | null, source: ChunkSource | null, size: number) {
    this.file = file;
    this.source = source;
    this.size = size;
    if (input) {
      this.buf = input;
      this.end = input.length;
      this.eof = true;
    } else {
      this.buf = new Uint8Array(CHUNK);
      this.end = 0;
      this.eof = false;
    }
  }

  /** Ensures at least `n` unread bytes are buffered unless the input ends first; returns the count. */
  ensure(n: number): number {
    if (this.end - this.pos >= n || this.eof) return this.end - this.pos;
    const keep = this.end - this.pos;
    if (keep + n > this.buf.length) {
      const bigger = new Uint8Array(Math.max(this.buf.length * 2, keep + n + CHUNK));
      bigger.set(this.buf.subarray(this.pos, this.end));
      this.buf = bigger;
    } else {
      this.buf.copyWithin(0, this.pos, this.end);
    }
    this.base += this.pos;
    this.pos = 0;
    this.end = keep;
    while (this.end - this.pos < n && !this.eof) {
      const got = this.source!(this.buf, this.end, this.buf.length - this.end);
      if (got <= 0) this.eof = true;
      else this.end += got;
    }
    return this.end - this.pos;
  }

  /** Returns the 1-based column of buffer position `p` on the current line. */
  column(p = this.pos): number {
    return this.base + p - this.lineStart + 1;
  }

  /** Returns bytes [a, b) of the buffer decoded as UTF-8. */
  text(a: number, b: number): string {
    return DECODER.decode(this.buf.subarray(a, b));
  }

  /** Returns up to 24 characters of the token at `p`, or "end of file", for messages. */
  describeAt(p = this.pos): string {
    this.ensure(32);
    if (p >= this.end) return 'end of file';
    let q = p;
    while (q < this.end && q - p < 24 && !isSpace(this.buf[q]!)) q++;
    if (q === p) return this.buf[p] === 10 || this.buf[p] === 13 ? 'end of line' : 'white space';
    return `"${this.text(p, q)}"`;
  }

  /** Returns a parse error at buffer position `p`. */
  fail(expected: string, found?: string, hint?: string, p = this.pos): BvhParseError {
    return new BvhParseError(this.file, this.line, this.column(p), expected, found ?? this.describeAt(p), hint);
  }
}

/** Returns true for space, tab, CR, LF, vertical tab and form feed. */
export function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 10 || c === 13 || c === 11 || c === 12;
}

/** Returns a reader over an in-memory input. */
export function memoryReader(file: string, input: Uint8Array): ByteReader {
  return new ByteReader(file, input, null, input.length);
}

/** Runs `body` with a reader over a file read in 1 MiB chunks, closing the file afterwards. */
export function withFileReader<T>(path: string, body: (r: ByteReader) => T, label = path): T {
  const fd = openSync(path, 'r');
  try {
    const size = fstatSync(fd).size;
    const source: ChunkSource = (dst, offset, length) => readSync(fd, dst, offset, length, null);
    return body(new ByteReader(label, null, source, size));
  } finally {
    closeSync(fd);
  }
}
