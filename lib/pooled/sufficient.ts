/** n, Σx and Σx² of a set of values: enough to pool means and variances without the values. */
export interface Summary {
  n: number;
  sum: number;
  squares: number;
}

export const emptySummary: Summary = { n: 0, sum: 0, squares: 0 };

export function addSummaries(a: Summary, b: Summary): Summary {
  return { n: a.n + b.n, sum: a.sum + b.sum, squares: a.squares + b.squares };
}

export function summaryMean(s: Summary): number {
  return s.sum / s.n;
}

/** Sum of squared deviations from the mean, never below 0 (rounding can push it under). */
export function summarySumOfSquares(s: Summary): number {
  if (s.n < 2) return 0;
  return Math.max(0, s.squares - (s.sum * s.sum) / s.n);
}

/** Sample variance (n − 1). */
export function summaryVariance(s: Summary): number {
  return summarySumOfSquares(s) / (s.n - 1);
}
