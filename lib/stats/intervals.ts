import { accurateMean, sumOfSquares } from "./describe";
import { studentTQuantile, studentTTwoSidedP } from "./distributions";
import { StatsInputError, requireAllFinite, requireAtLeast, requireFinite, requireLevel } from "./errors";

export type MeanInterval = { mean: number; lower: number; upper: number; df: number };

/**
 * Student t interval for a mean from summary figures alone (n, mean, sample sd), for
 * when only a published summary or another farm's aggregate is available.
 */
export function meanCIFromSummary(summary: { n: number; mean: number; sd: number }, level = 0.95): MeanInterval {
  const { n, mean, sd } = summary;
  requireLevel(level);
  requireFinite(mean, "The mean");
  requireFinite(sd, "The standard deviation");
  if (!Number.isInteger(n) || n < 2) {
    throw new StatsInputError("too_few_values", `A t interval needs a whole number of at least 2 values; got n = ${n}.`);
  }
  if (sd < 0) {
    throw new StatsInputError("invalid_argument", `The standard deviation ${sd} is negative; it must be 0 or more.`);
  }
  const df = n - 1;
  const half = studentTQuantile((1 + level) / 2, df) * (sd / Math.sqrt(n));
  return { mean, lower: mean - half, upper: mean + half, df };
}

/** Student t interval for the mean of xs (at least two values). */
export function meanCI(xs: number[], level = 0.95): MeanInterval {
  requireAtLeast(xs, 2, "The values for a mean interval");
  requireAllFinite(xs, "The values for a mean interval");
  const mean = accurateMean(xs);
  const sd = Math.sqrt(sumOfSquares(xs, mean) / (xs.length - 1));
  return meanCIFromSummary({ n: xs.length, mean, sd }, level);
}

export type WelchResult = {
  /** mean(a) − mean(b) */
  diff: number;
  t: number;
  /** Welch–Satterthwaite degrees of freedom (fractional). */
  df: number;
  /** Two-sided p-value. */
  p: number;
  lower: number;
  upper: number;
};

/**
 * Welch's two-sample t test (unequal variances), two-sided, as R's t.test default:
 * e.g. one strain's BE against another's when their spreads differ.
 */
export function welchTest(a: number[], b: number[], level = 0.95): WelchResult {
  requireLevel(level);
  requireAtLeast(a, 2, "The first group");
  requireAtLeast(b, 2, "The second group");
  requireAllFinite(a, "The first group");
  requireAllFinite(b, "The second group");
  const meanA = accurateMean(a);
  const meanB = accurateMean(b);
  const varA = sumOfSquares(a, meanA) / (a.length - 1) / a.length;
  const varB = sumOfSquares(b, meanB) / (b.length - 1) / b.length;
  const se2 = varA + varB;
  if (se2 === 0) {
    throw new StatsInputError(
      "no_variation",
      "Both groups have no spread at all (every value equal within each group), so a t test is undefined; check that the values were not copied down a column.",
    );
  }
  const se = Math.sqrt(se2);
  const df = (se2 * se2) / ((varA * varA) / (a.length - 1) + (varB * varB) / (b.length - 1));
  const diff = meanA - meanB;
  const t = diff / se;
  const half = studentTQuantile((1 + level) / 2, df) * se;
  return { diff, t, df, p: studentTTwoSidedP(t, df), lower: diff - half, upper: diff + half };
}
