// Seeded pseudo-random numbers for the walker: Mulberry32 (a public-domain 32-bit generator by Tommy Ettinger).

/** A small deterministic generator; the same seed yields the same sequence on every run. */
export class Mulberry32 {
  private state: number;
  private spare = NaN;

  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** Returns the next uniform number in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Returns a standard normal deviate (Box-Muller, the second value of each pair kept for the next call). */
  gauss(): number {
    if (!Number.isNaN(this.spare)) {
      const s = this.spare;
      this.spare = NaN;
      return s;
    }
    const u1 = 1 - this.next();
    const u2 = this.next();
    const r = Math.sqrt(-2 * Math.log(u1));
    this.spare = r * Math.sin(2 * Math.PI * u2);
    return r * Math.cos(2 * Math.PI * u2);
  }

  /** Returns a normal deviate clipped to ±limit standard deviations. */
  gaussClipped(limit = 3): number {
    const g = this.gauss();
    return g > limit ? limit : g < -limit ? -limit : g;
  }
}

/** Returns a 32-bit seed for an independent stream derived from a base seed and a stream number. */
export function streamSeed(seed: number, stream: number): number {
  let h = (seed ^ Math.imul(stream + 1, 0x9e3779b9)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b) >>> 0;
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35) >>> 0;
  return (h ^ (h >>> 16)) >>> 0;
}
