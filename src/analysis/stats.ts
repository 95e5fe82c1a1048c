/**
 * The one statistics module (analysis, and the records stage's batch statistics through the analysis
 * index): mean, sample standard deviation, median and the standard uncertainty of a mean
 * (JCGM 100:2008 §4.2.2–4.2.3, eqs. 4 and 5). The uncertainty of a
 * median uses the asymptotic efficiency factor √(π/2) ≈ 1.2533 for normal data (standard result of
 * order statistics, e.g. Kendall & Stuart; from memory).
 */

export function mean(xs: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < xs.length; i++) s += xs[i];
  return s / xs.length;
}

/**
 * Sample standard deviation s(q_k) with n − 1 in the denominator (GUM eq. 4); 0 for fewer than 2
 * values. Two passes (the mean first), so values far from zero lose no digits to cancellation.
 */
export function standardDeviation(xs: ArrayLike<number>): number {
  const n = xs.length;
  if (n < 2) return 0;
  const m = mean(xs);
  let s = 0;
  for (let i = 0; i < n; i++) s += (xs[i] - m) ** 2;
  return Math.sqrt(s / (n - 1));
}

/**
 * The same s from running sums (n, Σx, Σx²), where only the sums are kept (histogram bins): one pass,
 * so it cancels digits when the values sit far from zero against their spread (about ε·x̄²/s² of s²);
 * fine for state levels, where that is under 1e-6. Never negative; 0 for fewer than 2 values.
 */
export function standardDeviationFromSums(n: number, sum: number, sumSq: number): number {
  return n > 1 ? Math.sqrt(Math.max(0, (sumSq - (sum * sum) / n) / (n - 1))) : 0;
}

export function median(xs: ArrayLike<number>): number {
  const sorted = Float64Array.from(xs).sort();
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const h = n >> 1;
  return n % 2 === 1 ? sorted[h] : (sorted[h - 1] + sorted[h]) / 2;
}

/** s/√n, the standard uncertainty of a mean of n observations (GUM eq. 5). */
export function uncertaintyOfMean(xs: ArrayLike<number>): number {
  return xs.length < 2 ? 0 : standardDeviation(xs) / Math.sqrt(xs.length);
}

/** √(π/2)·s/√n: the standard uncertainty of the median of n roughly normal observations. */
export function uncertaintyOfMedian(xs: ArrayLike<number>): number {
  return Math.sqrt(Math.PI / 2) * uncertaintyOfMean(xs);
}

/** Root-sum-square of standard uncertainties (GUM eq. 10 with unit sensitivity coefficients). */
export function rss(...us: number[]): number {
  let s = 0;
  for (const u of us) s += u * u;
  return Math.sqrt(s);
}
