// Seeded pseudo-random numbers for the model: PCG32 (the XSH-RR member of the PCG family, O'Neill 2014,
// "PCG: A Family of Simple Fast Space-Efficient Statistically Good Algorithms for Random Number
// Generation", Harvey Mudd College HMC-CS-2014-0905), with 64-bit state arithmetic done on 32-bit halves,
// and standard normal deviates by the Marsaglia polar method (Marsaglia and Bray 1964).

// The 64-bit LCG multiplier of PCG32, 6364136223846793005, as 32-bit halves.
const MUL_HI = 0x5851f42d;
const MUL_LO = 0x4c957f2d;

/** A PCG32 generator; a (seed, stream) pair gives the same sequence on every machine and run. */
export class Pcg32 {
  private hi = 0;
  private lo = 0;
  private incHi = 0;
  private incLo = 0;
  private spare = 0;
  private hasSpare = false;

  /** Seeds as the reference pcg32_srandom_r(initstate, initseq); both are non-negative integers below 2^53. */
  constructor(seed: number, stream = 0) {
    const sHi = Math.floor(seed / 4294967296) >>> 0, sLo = seed >>> 0;
    const qHi = Math.floor(stream / 4294967296) >>> 0, qLo = stream >>> 0;
    // inc = (initseq << 1) | 1
    this.incHi = ((qHi << 1) | (qLo >>> 31)) >>> 0;
    this.incLo = ((qLo << 1) | 1) >>> 0;
    this.hi = 0;
    this.lo = 0;
    this.nextU32();
    const lo = this.lo + sLo;
    this.lo = lo >>> 0;
    this.hi = (this.hi + sHi + (lo > 0xffffffff ? 1 : 0)) >>> 0;
    this.nextU32();
  }

  /** Returns the next 32-bit unsigned output. */
  nextU32(): number {
    const oldHi = this.hi, oldLo = this.lo;
    // state = state * MUL + inc (mod 2^64). The low product lo*MUL_LO needs all 64 bits: split into 16-bit parts.
    const a0 = oldLo & 0xffff, a1 = oldLo >>> 16;
    const b0 = MUL_LO & 0xffff, b1 = MUL_LO >>> 16;
    const p00 = a0 * b0;
    const mid = a1 * b0 + a0 * b1 + (p00 >>> 16); // < 2^34, exact in a double
    const prodLo = (((mid & 0xffff) << 16) | (p00 & 0xffff)) >>> 0;
    const carryHi = a1 * b1 + Math.floor(mid / 65536); // high 32 bits of oldLo*MUL_LO (< 2^32)
    let hi = (carryHi + Math.imul(oldLo, MUL_HI) + Math.imul(oldHi, MUL_LO)) >>> 0;
    const lo = prodLo + this.incLo;
    hi = (hi + this.incHi + (lo > 0xffffffff ? 1 : 0)) >>> 0;
    this.lo = lo >>> 0;
    this.hi = hi;
    // Output XSH-RR on the old state: xorshifted = ((old >> 18) ^ old) >> 27, rot = old >> 59.
    const sh18Lo = ((oldLo >>> 18) | (oldHi << 14)) >>> 0;
    const sh18Hi = oldHi >>> 18;
    const xLo = (sh18Lo ^ oldLo) >>> 0, xHi = (sh18Hi ^ oldHi) >>> 0;
    const xorshifted = ((xLo >>> 27) | (xHi << 5)) >>> 0;
    const rot = oldHi >>> 27;
    return ((xorshifted >>> rot) | (xorshifted << ((32 - rot) & 31))) >>> 0;
  }

  /** Returns a uniform number in [0, 1) with 32 random bits. */
  next(): number {
    return this.nextU32() / 4294967296;
  }

  /** Returns a uniform number in the open interval (-1, 1) with 32 random bits. */
  private nextSigned(): number {
    return (this.nextU32() + 0.5) / 2147483648 - 1;
  }

  /** Returns a standard normal deviate (Marsaglia polar method; the pair's second value serves the next call). */
  gauss(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    let u = 0, v = 0, s = 0;
    do {
      u = this.nextSigned();
      v = this.nextSigned();
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    this.spare = v * f;
    this.hasSpare = true;
    return u * f;
  }

  /** Returns `out` filled with standard normal deviates (first n entries, all by default). */
  fillGauss(out: Float32Array | Float64Array, n = out.length): Float32Array | Float64Array {
    for (let i = 0; i < n; i++) out[i] = this.gauss();
    return out;
  }

  /** Returns `out` filled with uniform numbers in [lo, hi). */
  fillUniform(out: Float32Array | Float64Array, lo: number, hi: number, n = out.length): Float32Array | Float64Array {
    const w = hi - lo;
    for (let i = 0; i < n; i++) out[i] = lo + w * this.next();
    return out;
  }

  /** Returns the generator's full state (for saving a training run), as four 32-bit words and the spare. */
  getState(): { hi: number; lo: number; incHi: number; incLo: number; spare: number; hasSpare: boolean } {
    return { hi: this.hi, lo: this.lo, incHi: this.incHi, incLo: this.incLo, spare: this.spare, hasSpare: this.hasSpare };
  }

  /** Restores a state from getState; returns this generator. */
  setState(s: { hi: number; lo: number; incHi: number; incLo: number; spare: number; hasSpare: boolean }): this {
    this.hi = s.hi >>> 0;
    this.lo = s.lo >>> 0;
    this.incHi = s.incHi >>> 0;
    this.incLo = s.incLo >>> 0;
    this.spare = s.spare;
    this.hasSpare = s.hasSpare;
    return this;
  }
}
