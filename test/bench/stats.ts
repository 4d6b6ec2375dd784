// Timing helpers for the benchmark: warm-up, repetitions, median.

export interface Timing {
  /** Median wall time of the measured repetitions, in seconds. */
  median: number;
  min: number;
  max: number;
  reps: number;
}

/** Returns the median (and spread) of `reps` timed runs of `fn` after `warmup` untimed runs. */
export function measure(fn: () => unknown, warmup: number, reps: number): Timing {
  let sink = 0;
  for (let i = 0; i < warmup; i++) sink ^= touch(fn());
  const times: number[] = [];
  for (let i = 0; i < reps; i++) {
    const t0 = process.hrtime.bigint();
    sink ^= touch(fn());
    times.push(Number(process.hrtime.bigint() - t0) / 1e9);
  }
  if (sink === 0x7fffffff) console.log(''); // keeps results observable so no run is optimised away
  times.sort((a, b) => a - b);
  return { median: median(times), min: times[0]!, max: times[times.length - 1]!, reps };
}

/** Returns the median of sorted numbers. */
export function median(sorted: readonly number[]): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  return n % 2 ? sorted[(n - 1) / 2]! : (sorted[n / 2 - 1]! + sorted[n / 2]!) / 2;
}

function touch(v: unknown): number {
  if (typeof v === 'number') return v | 0;
  if (v && typeof v === 'object' && 'length' in v) return Number((v as { length: number }).length) | 0;
  return 1;
}

/**
 * Returns a timing per named function, measured round-robin (one run of each per round) so that drift
 * of the machine's speed during the run falls on all of them alike.
 */
export function measureInterleaved(fns: Record<string, () => unknown>, warmup: number, reps: number): Record<string, Timing> {
  const names = Object.keys(fns);
  const times: Record<string, number[]> = Object.fromEntries(names.map((n) => [n, []]));
  let sink = 0;
  for (let round = 0; round < warmup + reps; round++)
    for (const n of names) {
      const t0 = process.hrtime.bigint();
      sink ^= touch(fns[n]!());
      const dt = Number(process.hrtime.bigint() - t0) / 1e9;
      if (round >= warmup) times[n]!.push(dt);
    }
  if (sink === 0x7fffffff) console.log('');
  const out: Record<string, Timing> = {};
  for (const n of names) {
    const t = times[n]!.sort((a, b) => a - b);
    out[n] = { median: median(t), min: t[0]!, max: t[t.length - 1]!, reps };
  }
  return out;
}
