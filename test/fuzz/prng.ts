// Seeded pseudo-random numbers for tests and fuzzing: xoshiro128** seeded through SplitMix64.
//
// Generator: xoshiro128** 1.1 of Blackman & Vigna, "Scrambled linear pseudorandom number
// generators", ACM TOMS 47(4), 2021 (reference C at prng.di.unimi.it). State seeding: SplitMix64 of
// Steele, Lea & Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014.

/** A seeded generator of uniform 32-bit words with small helpers on top. */
export class Prng {
  private s0 = 0;
  private s1 = 0;
  private s2 = 0;
  private s3 = 0;

  constructor(seed: number) {
    let x = BigInt.asUintN(64, BigInt(Math.trunc(seed)));
    const next = (): bigint => {
      x = BigInt.asUintN(64, x + 0x9e3779b97f4a7c15n);
      let z = x;
      z = BigInt.asUintN(64, (z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n);
      z = BigInt.asUintN(64, (z ^ (z >> 27n)) * 0x94d049bb133111ebn);
      return z ^ (z >> 31n);
    };
    const a = next();
    const b = next();
    this.s0 = Number(a & 0xffffffffn);
    this.s1 = Number(a >> 32n);
    this.s2 = Number(b & 0xffffffffn);
    this.s3 = Number(b >> 32n);
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** Returns a generator whose xoshiro128** state is exactly (a, b, c, d), for checks against the reference. */
  static fromState(a: number, b: number, c: number, d: number): Prng {
    const g = new Prng(0);
    g.s0 = a >>> 0;
    g.s1 = b >>> 0;
    g.s2 = c >>> 0;
    g.s3 = d >>> 0;
    return g;
  }

  /** Returns the next uniform unsigned 32-bit integer. */
  nextU32(): number {
    const s1 = this.s1;
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0;
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** Returns a uniform double in [0, 1) with 53 random bits. */
  next(): number {
    const hi = this.nextU32() >>> 5;
    const lo = this.nextU32() >>> 6;
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Returns a uniform integer in [lo, hi] (inclusive). */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.next() * (hi - lo + 1));
  }

  /** Returns true with probability p. */
  chance(p: number): boolean {
    return this.next() < p;
  }

  /** Returns a uniformly chosen element of a non-empty list. */
  pick<T>(list: readonly T[]): T {
    return list[Math.floor(this.next() * list.length)]!;
  }

  /** Shuffles a list in place (Fisher–Yates, Durstenfeld's variant) and returns it. */
  shuffle<T>(list: T[]): T[] {
    for (let i = list.length - 1; i > 0; i--) {
      const j = Math.floor(this.next() * (i + 1));
      const t = list[i]!;
      list[i] = list[j]!;
      list[j] = t;
    }
    return list;
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
