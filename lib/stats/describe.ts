import { requireAllFinite, requireAtLeast } from "./errors";

export type Description = {
  n: number;
  mean: number;
  /** Sample standard deviation (divisor n − 1). */
  sd: number;
  /** Standard error of the mean, sd / √n. */
  se: number;
  median: number;
  /** First quartile, R's default (type 7). */
  q1: number;
  /** Third quartile, R's default (type 7). */
  q3: number;
  min: number;
  max: number;
};

/** Mean by two passes: the second adds back the rounding left by the first. */
export function accurateMean(xs: readonly number[]): number {
  let sum = 0;
  for (const x of xs) sum += x;
  const first = sum / xs.length;
  let correction = 0;
  for (const x of xs) correction += x - first;
  return first + correction / xs.length;
}

/** Sum of squared deviations from the mean (centred, never Σx² − (Σx)²/n). */
export function sumOfSquares(xs: readonly number[], mean = accurateMean(xs)): number {
  let ss = 0;
  for (const x of xs) {
    const d = x - mean;
    ss += d * d;
  }
  return ss;
}

/**
 * True when a residual sum of squares is no bigger than rounding of the data would leave
 * behind, i.e. the model fits exactly and an F ratio would be noise divided by noise.
 */
export function isRoundingNoise(ss: number, xs: ArrayLike<number>): boolean {
  let largest = 0;
  for (let i = 0; i < xs.length; i++) largest = Math.max(largest, Math.abs(xs[i]));
  return isRoundingNoiseAt(ss, xs.length, largest);
}

/** isRoundingNoise for `count` values whose magnitude is at most `largest`. */
export function isRoundingNoiseAt(ss: number, count: number, largest: number): boolean {
  const floor = 64 * Number.EPSILON * largest;
  return ss <= count * floor * floor;
}

/** Quantile of sorted values by R's type 7: linear between order statistics at (n − 1)p. */
export function quantileSorted(sorted: readonly number[], p: number): number {
  const h = (sorted.length - 1) * p;
  const below = Math.floor(h);
  const above = Math.min(below + 1, sorted.length - 1);
  return sorted[below] + (h - below) * (sorted[above] - sorted[below]);
}

/**
 * Summary of one set of values, e.g. the biological efficiency of one strain's blocks.
 * Needs at least two values, because the spread of one value is unknown.
 */
export function describe(xs: number[]): Description {
  requireAtLeast(xs, 2, "The values to describe");
  requireAllFinite(xs, "The values to describe");
  const n = xs.length;
  const mean = accurateMean(xs);
  const sd = Math.sqrt(sumOfSquares(xs, mean) / (n - 1));
  const sorted = [...xs].sort((a, b) => a - b);
  return {
    n,
    mean,
    sd,
    se: sd / Math.sqrt(n),
    median: quantileSorted(sorted, 0.5),
    q1: quantileSorted(sorted, 0.25),
    q3: quantileSorted(sorted, 0.75),
    min: sorted[0],
    max: sorted[n - 1],
  };
}
