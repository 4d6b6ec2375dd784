// Statistics of the validation scripts: ROC AUC (the Mann-Whitney form), stratified bootstrap intervals,
// Spearman rank correlation, a cross-validated ridge probe (R² out of fold) and the one-way intraclass
// correlation ICC(1). Plain functions on number arrays; every one is checked in test/scripts.
import { choleskyFactor, choleskySolveFactored } from '../src/nn/cholesky.js';
import { quantile } from '../src/norms/profile.js';
import { Pcg32 } from '../src/nn/prng.js';

// The finite-value type-7 quantile of the norms module, re-exported for the validation scripts.
export { quantile };

/** Returns the ranks of xs (1-based), ties given their mean rank. */
export function ranks(xs: readonly number[]): number[] {
  const order = xs.map((x, i) => [x, i] as const).sort((a, b) => a[0] - b[0]);
  const out = new Array<number>(xs.length);
  for (let i = 0; i < order.length;) {
    let j = i;
    while (j + 1 < order.length && order[j + 1]![0] === order[i]![0]) j++;
    const r = (i + j) / 2 + 1;
    for (let k = i; k <= j; k++) out[order[k]![1]] = r;
    i = j + 1;
  }
  return out;
}

/** Returns the ROC area of scores of positives against negatives: P(pos > neg) + ½ P(tie) (Mann-Whitney U / n₁n₀). */
export function rocAuc(pos: readonly number[], neg: readonly number[]): number {
  if (!pos.length || !neg.length) return NaN;
  const r = ranks([...pos, ...neg]);
  let sum = 0;
  for (let i = 0; i < pos.length; i++) sum += r[i]!;
  return (sum - (pos.length * (pos.length + 1)) / 2) / (pos.length * neg.length);
}

/** Returns a 95 % percentile bootstrap interval of the AUC, positives and negatives resampled separately. */
export function aucInterval(pos: readonly number[], neg: readonly number[], replicates = 1000, seed = 1): [number, number] {
  if (!pos.length || !neg.length) return [NaN, NaN];
  const rng = new Pcg32(seed, 7);
  const draws: number[] = [];
  const p = new Array<number>(pos.length), n = new Array<number>(neg.length);
  for (let b = 0; b < replicates; b++) {
    for (let i = 0; i < p.length; i++) p[i] = pos[Math.floor(rng.next() * pos.length)]!;
    for (let i = 0; i < n.length; i++) n[i] = neg[Math.floor(rng.next() * neg.length)]!;
    draws.push(rocAuc(p, n));
  }
  return [quantile(draws, 0.025), quantile(draws, 0.975)];
}

/** Returns a 95 % percentile bootstrap interval of the mean of 0/1 outcomes (a proportion). */
export function proportionInterval(hits: readonly boolean[], replicates = 1000, seed = 1): [number, number] {
  if (!hits.length) return [NaN, NaN];
  const rng = new Pcg32(seed, 11);
  const draws: number[] = [];
  for (let b = 0; b < replicates; b++) {
    let k = 0;
    for (let i = 0; i < hits.length; i++) if (hits[Math.floor(rng.next() * hits.length)]) k++;
    draws.push(k / hits.length);
  }
  return [quantile(draws, 0.025), quantile(draws, 0.975)];
}

/** Returns Pearson's correlation of two equal-length arrays (NaN when either is constant). */
export function pearson(x: readonly number[], y: readonly number[]): number {
  const n = x.length;
  let mx = 0, my = 0;
  for (let i = 0; i < n; i++) { mx += x[i]!; my += y[i]!; }
  mx /= n; my /= n;
  let sxy = 0, sxx = 0, syy = 0;
  for (let i = 0; i < n; i++) { const a = x[i]! - mx, b = y[i]! - my; sxy += a * b; sxx += a * a; syy += b * b; }
  return sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : NaN;
}

/** Returns Spearman's rank correlation (Pearson's correlation of the tie-averaged ranks). */
export function spearman(x: readonly number[], y: readonly number[]): number {
  return pearson(ranks(x), ranks(y));
}

/** Solves the symmetric positive definite system A x = b (A n × n, row-major) by Cholesky; A is overwritten. */
function choleskySolve(A: Float64Array, b: Float64Array, n: number): Float64Array {
  return choleskySolveFactored(choleskyFactor(A, n, 'the ridge system'), n, b);
}

/**
 * Fits ridge regression on rows `train` of X (features standardised on the training rows, intercept
 * unpenalised) and returns the predictions for rows `test`. Solved in the dual, (K + λI)α = y − ȳ with
 * K = X Xᵀ, so the cost grows with the number of training rows, not of features.
 */
export function ridgePredict(X: readonly Float64Array[], y: readonly number[], train: readonly number[], test: readonly number[], lambda: number): number[] {
  const p = X[0]!.length, n = train.length;
  const mu = new Float64Array(p), sd = new Float64Array(p);
  for (const i of train) for (let j = 0; j < p; j++) mu[j]! += X[i]![j]! / n;
  for (const i of train) for (let j = 0; j < p; j++) sd[j]! += (X[i]![j]! - mu[j]!) ** 2 / n;
  for (let j = 0; j < p; j++) sd[j] = sd[j]! > 1e-24 ? Math.sqrt(sd[j]!) : 0;
  const z = (i: number) => Float64Array.from({ length: p }, (_, j) => (sd[j]! > 0 ? (X[i]![j]! - mu[j]!) / sd[j]! : 0));
  const Z = train.map(z);
  let ym = 0;
  for (const i of train) ym += y[i]! / n;
  const K = new Float64Array(n * n);
  for (let a = 0; a < n; a++) for (let b = a; b < n; b++) {
    let s = 0;
    const za = Z[a]!, zb = Z[b]!;
    for (let j = 0; j < p; j++) s += za[j]! * zb[j]!;
    K[a * n + b] = s; K[b * n + a] = s;
  }
  for (let a = 0; a < n; a++) K[a * n + a]! += lambda;
  const alpha = choleskySolve(K, Float64Array.from(train, (i) => y[i]! - ym), n);
  return test.map((i) => {
    const zt = z(i);
    let s = ym;
    for (let a = 0; a < n; a++) {
      let k = 0;
      const za = Z[a]!;
      for (let j = 0; j < p; j++) k += za[j]! * zt[j]!;
      s += alpha[a]! * k;
    }
    return s;
  });
}

/** Returns 1 − SSE/SST of predictions against the truth (can be negative: worse than the mean). */
export function rSquared(truth: readonly number[], pred: readonly number[]): number {
  let m = 0;
  for (const t of truth) m += t / truth.length;
  let sse = 0, sst = 0;
  for (let i = 0; i < truth.length; i++) { sse += (truth[i]! - pred[i]!) ** 2; sst += (truth[i]! - m) ** 2; }
  return sst > 0 ? 1 - sse / sst : NaN;
}

/** Splits indices 0..n-1 into `folds` folds by group (every row of a group in one fold), deterministically. */
export function groupFolds(groups: readonly string[], folds: number): number[][] {
  const names = [...new Set(groups)].sort();
  const foldOf = new Map(names.map((g, i) => [g, i % folds]));
  const out: number[][] = Array.from({ length: folds }, () => []);
  groups.forEach((g, i) => out[foldOf.get(g)!]!.push(i));
  return out.filter((f) => f.length);
}

/**
 * Returns the out-of-fold R² of a ridge probe from X to y, folds split by group, the ridge strength
 * chosen inside each training part by an inner grouped cross-validation over `lambdas`.
 */
export function ridgeProbeR2(X: readonly Float64Array[], y: readonly number[], groups: readonly string[], options: { folds?: number; lambdas?: readonly number[] } = {}): { r2: number; lambdas: number[] } {
  const folds = groupFolds(groups, options.folds ?? 5);
  const lambdas = options.lambdas ?? [1, 10, 100, 1000, 10000];
  const pred = new Array<number>(y.length).fill(NaN), chosen: number[] = [];
  for (const test of folds) {
    const testSet = new Set(test);
    const train = y.map((_, i) => i).filter((i) => !testSet.has(i));
    const inner = groupFolds(train.map((i) => groups[i]!), 4).map((f) => f.map((k) => train[k]!));
    let best = lambdas[0]!, bestR2 = -Infinity;
    for (const l of lambdas) {
      const t: number[] = [], p: number[] = [];
      for (const vt of inner) {
        const vs = new Set(vt);
        const tr = train.filter((i) => !vs.has(i));
        ridgePredict(X, y, tr, vt, l).forEach((v, k) => { p.push(v); t.push(y[vt[k]!]!); });
      }
      const r2 = rSquared(t, p);
      if (r2 > bestR2) { bestR2 = r2; best = l; }
    }
    chosen.push(best);
    ridgePredict(X, y, train, test, best).forEach((v, k) => (pred[test[k]!] = v));
  }
  return { r2: rSquared(y, pred), lambdas: chosen };
}

/**
 * Returns the one-way random-effects ICC(1) of groups of repeated measurements (Shrout and Fleiss 1979,
 * case 1), with the unbalanced-design group size k₀ = (N − Σnᵢ²/N)/(g − 1).
 */
export function icc1(groupsOfValues: readonly (readonly number[])[]): number {
  const gs = groupsOfValues.filter((g) => g.length > 0);
  const g = gs.length, N = gs.reduce((s, x) => s + x.length, 0);
  if (g < 2 || N <= g) return NaN;
  let grand = 0;
  for (const x of gs) for (const v of x) grand += v / N;
  let ssb = 0, ssw = 0, sumN2 = 0;
  for (const x of gs) {
    const m = x.reduce((s, v) => s + v, 0) / x.length;
    ssb += x.length * (m - grand) ** 2;
    for (const v of x) ssw += (v - m) ** 2;
    sumN2 += x.length ** 2;
  }
  const msb = ssb / (g - 1), msw = ssw / (N - g), k0 = (N - sumN2 / N) / (g - 1);
  const den = msb + (k0 - 1) * msw;
  return den > 0 ? (msb - msw) / den : NaN;
}
