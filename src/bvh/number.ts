// Decimal number scanning on bytes, exact (correctly rounded) like Number(), without making strings.

const POW10 = [1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];
const LATIN1 = new TextDecoder('latin1');

/** The value of the last successful scanNumber call (module scratch, so scanning allocates nothing). */
export let scannedValue = 0;

/**
 * Scans a decimal number (optional sign, digits with optional point, optional exponent) starting at
 * `p`; returns the position after it, or -1 when no number starts there. The value is left in
 * `scannedValue`. Up to 15 significant digits and |exponent| <= 22 take the exact fast path of
 * Clinger (1990): one correctly rounded multiply or divide of two exact doubles; longer forms go
 * through Number().
 */
export function scanNumber(buf: Uint8Array, p: number, end: number): number {
  let i = p;
  let neg = false;
  if (i < end) {
    const s = buf[i]!;
    if (s === 45) { neg = true; i++; } else if (s === 43) i++;
  }
  let mant = 0;
  let sig = 0;
  let exp = 0;
  let any = false;
  let slow = false;
  while (i < end) {
    const d = buf[i]! - 48;
    if (d < 0 || d > 9) break;
    any = true;
    if (mant !== 0 || d !== 0) {
      if (sig < 15) { mant = mant * 10 + d; sig++; } else { slow = true; }
    }
    i++;
  }
  if (i < end && buf[i] === 46) {
    i++;
    while (i < end) {
      const d = buf[i]! - 48;
      if (d < 0 || d > 9) break;
      any = true;
      if (mant === 0 && d === 0) exp--;
      else if (sig < 15) { mant = mant * 10 + d; sig++; exp--; } else { slow = true; }
      i++;
    }
  }
  if (!any) return -1;
  if (i < end && (buf[i] === 101 || buf[i] === 69)) {
    let j = i + 1;
    let eneg = false;
    if (j < end && (buf[j] === 45 || buf[j] === 43)) { eneg = buf[j] === 45; j++; }
    let e = 0;
    let edigits = 0;
    while (j < end) {
      const d = buf[j]! - 48;
      if (d < 0 || d > 9) break;
      if (e < 100000) e = e * 10 + d;
      edigits++;
      j++;
    }
    if (edigits === 0) return -1;
    exp += eneg ? -e : e;
    i = j;
  }
  let v: number;
  if (mant === 0 && !slow) v = 0;
  else if (!slow && exp >= 0 && exp <= 22) v = mant * POW10[exp]!;
  else if (!slow && exp < 0 && exp >= -22) v = mant / POW10[-exp]!;
  else v = Math.abs(Number(LATIN1.decode(buf.subarray(p, i))));
  scannedValue = neg ? -v : v;
  return i;
}

/** Returns the number a whole string spells in BVH's decimal syntax, or NaN when it is not one. */
export function parseDecimal(text: string): number {
  const bytes = Buffer.from(text, 'latin1');
  const q = scanNumber(bytes, 0, bytes.length);
  return q === bytes.length && q > 0 ? scannedValue : NaN;
}
