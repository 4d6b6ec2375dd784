// The practical limit for reading frame values: one pass over the MOTION bytes turning each number
// token into a float64, with no validation, no line structure and no exponent handling.

const POW10 = new Float64Array(23).map((_, k) => 10 ** k);

/** Returns the byte offset just after the "Frame Time:" line, where the frame values start. */
export function motionStart(buf: Uint8Array): number {
  const key = Buffer.from('Frame Time:');
  const at = Buffer.from(buf.buffer, buf.byteOffset, buf.byteLength).indexOf(key);
  if (at < 0) return buf.length;
  let i = at + key.length;
  while (i < buf.length && buf[i] !== 10) i++;
  return i + 1;
}

/** Returns how many numbers were scanned from `buf[start..]` into `out` (digits, one point, a minus sign). */
export function bareScan(buf: Uint8Array, start: number, out: Float64Array): number {
  const end = buf.length;
  let n = 0;
  let i = start;
  while (i < end) {
    let c = buf[i]!;
    if (c <= 32) {
      i++;
      continue;
    }
    const from = i;
    let neg = false;
    if (c === 45) {
      neg = true;
      c = ++i < end ? buf[i]! : 32;
    }
    let m = 0;
    let d = 0;
    while (c >= 48 && c <= 57) {
      m = m * 10 + (c - 48);
      c = ++i < end ? buf[i]! : 32;
    }
    if (c === 46) {
      c = ++i < end ? buf[i]! : 32;
      while (c >= 48 && c <= 57) {
        m = m * 10 + (c - 48);
        d++;
        c = ++i < end ? buf[i]! : 32;
      }
    }
    if (i === from) {
      i++;
      continue;
    }
    const v = m / POW10[d]!;
    out[n++] = neg ? -v : v;
  }
  return n;
}
