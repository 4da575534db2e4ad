import { normalQuantile } from "./distributions";
import { StatsInputError, requireLevel } from "./errors";

export type ProportionInterval = { p: number; lower: number; upper: number };

/**
 * Wilson score interval for a proportion, e.g. the contamination rate: contaminated
 * blocks out of blocks made. Unlike the plain ± interval it stays inside [0, 1] and
 * behaves at 0 of n, which is common for a clean farm.
 */
export function wilsonInterval(successes: number, n: number, level = 0.95): ProportionInterval {
  requireLevel(level);
  if (!Number.isInteger(n) || n < 1) {
    throw new StatsInputError("invalid_argument", `The number of blocks must be a whole number of at least 1; got ${n}.`);
  }
  if (!Number.isInteger(successes) || successes < 0 || successes > n) {
    throw new StatsInputError("invalid_argument", `The count must be a whole number from 0 to ${n}; got ${successes}.`);
  }
  const z = normalQuantile((1 + level) / 2);
  const z2 = z * z;
  const p = successes / n;
  const denominator = n + z2;
  const centre = (successes + z2 / 2) / denominator;
  const half = (z * Math.sqrt((successes * (n - successes)) / n + z2 / 4)) / denominator;
  // At 0 and n the exact bound is 0 or 1; rounding would leave ±1e-17.
  return {
    p,
    lower: successes === 0 ? 0 : centre - half,
    upper: successes === n ? 1 : centre + half,
  };
}
