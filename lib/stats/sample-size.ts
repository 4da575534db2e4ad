import { noncentralTLowerTail, studentTQuantile } from "./distributions";
import { StatsInputError, requireFinite } from "./errors";
import { brentRoot } from "./root-finding";

export type SampleSize = {
  /** Exact (fractional) blocks per arm at which the power is reached. */
  nPerGroup: number;
  /** Blocks per arm to actually run: nPerGroup rounded up. */
  nPerGroupCeil: number;
};

const SMALLEST_ARM = 2;
const LARGEST_ARM = 1e9;

/** Power of the two-sided two-sample t test with n per arm, as R's power.t.test (strict = FALSE). */
export function powerTwoMeans(n: number, delta: number, sd: number, alpha: number): number {
  const df = 2 * (n - 1);
  const critical = studentTQuantile(1 - alpha / 2, df);
  const ncp = Math.sqrt(n / 2) * (Math.abs(delta) / sd);
  return 1 - noncentralTLowerTail(critical, df, ncp);
}

/**
 * Blocks per arm needed for a two-arm trial to detect a difference `delta` in the outcome
 * (e.g. 10 BE percentage points) when blocks vary with standard deviation `sd`, using the
 * noncentral t as R's power.t.test does. The root is found exactly (to ~1e-10), not only
 * to R's uniroot tolerance. If two blocks per arm already give the power, 2 is returned:
 * fewer cannot estimate a spread.
 */
export function sampleSizeTwoMeans(options: { delta: number; sd: number; power?: number; alpha?: number }): SampleSize {
  const { delta, sd, power = 0.8, alpha = 0.05 } = options;
  requireFinite(delta, "The difference to detect");
  requireFinite(sd, "The standard deviation");
  if (delta === 0) {
    throw new StatsInputError("invalid_argument", "The difference to detect is 0; give the smallest difference worth finding.");
  }
  if (!(sd > 0)) {
    throw new StatsInputError("invalid_argument", `The standard deviation ${sd} must be above 0; use the spread seen between blocks.`);
  }
  if (!(alpha > 0 && alpha < 1)) {
    throw new StatsInputError("invalid_level", `The significance level ${alpha} must be between 0 and 1, e.g. 0.05.`);
  }
  if (!(power > alpha && power < 1)) {
    throw new StatsInputError("invalid_level", `The power ${power} must be above the significance level and below 1, e.g. 0.8.`);
  }
  const shortfall = (n: number) => powerTwoMeans(n, delta, sd, alpha) - power;
  if (shortfall(SMALLEST_ARM) >= 0) return { nPerGroup: SMALLEST_ARM, nPerGroupCeil: SMALLEST_ARM };
  let lower = SMALLEST_ARM;
  let upper = 2 * SMALLEST_ARM;
  while (shortfall(upper) < 0) {
    lower = upper;
    upper *= 2;
    if (upper > LARGEST_ARM) {
      throw new StatsInputError(
        "not_estimable",
        "The difference is too small compared with the spread to detect with any practical number of blocks; aim for a larger difference.",
      );
    }
  }
  const nPerGroup = brentRoot(shortfall, lower, upper, 1e-10);
  return { nPerGroup, nPerGroupCeil: Math.ceil(nPerGroup - 1e-9) };
}
