// Summary statistics of per-stride values: mean, sample SD, coefficient of variation.

/** Mean, sample standard deviation (n - 1), coefficient of variation in percent, and count. */
export interface Summary {
  mean: number | null;
  sd: number | null;
  cv_pct: number | null;
  n: number;
}

/** Returns the summary of finite values (NaN entries are skipped); nulls where too few values. */
export function summarize(values: ArrayLike<number>): Summary {
  let n = 0;
  let sum = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) { n++; sum += v; }
  }
  if (n === 0) return { mean: null, sd: null, cv_pct: null, n: 0 };
  const mean = sum / n;
  if (n < 2) return { mean, sd: null, cv_pct: null, n };
  let ss = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (Number.isFinite(v)) ss += (v - mean) * (v - mean);
  }
  const sd = Math.sqrt(ss / (n - 1));
  return { mean, sd, cv_pct: mean !== 0 ? (100 * sd) / Math.abs(mean) : null, n };
}
