import { noncentralTLowerTail, normalQuantile, studentTQuantile, studentizedRangeQuantile } from "./distributions";
import { StatsInputError, requireFinite } from "./errors";
import { brentRoot } from "./root-finding";

export type SampleSize = {
  /** Exact (fractional) blocks per arm at which the power is reached. */
  nPerGroup: number;
  /** Blocks per arm to actually run: nPerGroup rounded up. */
  nPerGroupCeil: number;
};

const LARGEST_ARM = 1e9;

export type PairwiseDesign = {
  /** Smallest difference worth finding, in the outcome's unit (e.g. BE points). */
  delta: number;
  /** Spread between blocks of one arm on one farm, same unit (farm-to-farm differences are blocked out). */
  sd: number;
  /** Number of arms the analysis compares pair by pair (2 or more). */
  arms: number;
  /** Farms, the blocks of the analysis (1 or more). */
  farms: number;
  /** Two-sided significance level of each Tukey-adjusted comparison. */
  alpha: number;
};

/** Residual degrees of freedom of outcome ~ arm + farm with n blocks per arm. */
function residualDf(n: number, arms: number, farms: number): number {
  return arms * n - arms - farms + 1;
}

/**
 * Power to find one pair of arms different when the analysis compares every pair of `arms` arms
 * with Tukey's adjustment on the model outcome ~ arm + farm (as the trial report does): n blocks per
 * arm spread over the farms, residual df = arms·n − arms − farms + 1, critical value
 * q(1 − α; arms, df)/√2 (for two arms the t quantile), noncentrality δ/(σ·√(2/n)), upper tail only
 * as R's power.t.test (strict = FALSE). With two arms on one farm it is power.t.test exactly.
 */
export function powerPairwiseBlocked(n: number, design: PairwiseDesign): number {
  const df = residualDf(n, design.arms, design.farms);
  const critical =
    design.arms === 2
      ? studentTQuantile(1 - design.alpha / 2, df)
      : studentizedRangeQuantile(1 - design.alpha, design.arms, df) / Math.SQRT2;
  const ncp = Math.sqrt(n / 2) * (Math.abs(design.delta) / design.sd);
  return 1 - noncentralTLowerTail(critical, df, ncp);
}

/** Power of the two-sided two-sample t test with n per arm, as R's power.t.test (strict = FALSE). */
export function powerTwoMeans(n: number, delta: number, sd: number, alpha: number): number {
  return powerPairwiseBlocked(n, { delta, sd, arms: 2, farms: 1, alpha });
}

/**
 * Blocks per arm needed for a two-arm trial to detect a difference `delta` in the outcome
 * (e.g. 10 BE percentage points) when blocks vary with standard deviation `sd`, using the
 * noncentral t as R's power.t.test does. The root is found exactly (to ~1e-10), not only
 * to R's uniroot tolerance. If two blocks per arm already give the power, 2 is returned:
 * fewer cannot estimate a spread.
 */
export function sampleSizeTwoMeans(options: { delta: number; sd: number; power?: number; alpha?: number }): SampleSize {
  return sampleSizePairwiseBlocked({ ...options, arms: 2, farms: 1 });
}

/**
 * Blocks per arm so that each pair of arms is found different with the given power when the
 * analysis is outcome ~ arm + farm with Tukey-adjusted pairwise comparisons (powerPairwiseBlocked).
 * More arms mean a larger critical value (Tukey over all arms·(arms − 1)/2 pairs); more farms cost
 * one error degree of freedom each, while the farm-to-farm spread no longer counts in `sd`. Returns
 * the smallest size that leaves an error estimate (2 per arm, and 3 error df for three or more arms)
 * when that already gives the power.
 */
export function sampleSizePairwiseBlocked(options: {
  delta: number;
  sd: number;
  power?: number;
  alpha?: number;
  arms?: number;
  farms?: number;
}): SampleSize {
  const { delta, sd, power = 0.8, alpha = 0.05, arms = 2, farms = 1 } = options;
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
  if (!(Number.isInteger(arms) && arms >= 2)) {
    throw new StatsInputError("invalid_argument", `The number of arms ${arms} must be a whole number, 2 or more.`);
  }
  if (!(Number.isInteger(farms) && farms >= 1)) {
    throw new StatsInputError("invalid_argument", `The number of farms ${farms} must be a whole number, 1 or more.`);
  }
  const design: PairwiseDesign = { delta, sd, arms, farms, alpha };
  // The studentized range is unreliable below 3 error df, and two blocks per arm is the least that shows a spread.
  const smallest = Math.max(2, ((arms > 2 ? 3 : 1) + arms + farms - 1) / arms);
  if (powerPairwiseBlocked(smallest, design) >= power) return { nPerGroup: smallest, nPerGroupCeil: Math.ceil(smallest - 1e-9) };
  let nPerGroup: number;
  if (arms === 2) {
    nPerGroup = increasingRoot((n) => powerPairwiseBlocked(n, design) - power, smallest);
  } else {
    // Each Tukey critical value integrates numerically, and it barely moves with the error df: solve for n with
    // the critical value held, recompute it at the new df, and repeat until n stays put (three or four rounds).
    const ncp = (n: number) => Math.sqrt(n / 2) * (Math.abs(delta) / sd);
    let last = studentizedRangeQuantile(1 - alpha, arms, 1e6);
    const critical = (n: number) => (last = studentizedRangeQuantile(1 - alpha, arms, residualDf(n, arms, farms), last)) / Math.SQRT2;
    // Start where the large-sample answer puts it: 2·((q∞/√2 + z_power)·sd/δ)².
    nPerGroup = Math.max(smallest, 2 * ((last / Math.SQRT2 + normalQuantile(power)) * (sd / delta)) ** 2);
    for (let round = 0; round < 50; round++) {
      const held = critical(nPerGroup);
      const next = increasingRoot((n) => 1 - noncentralTLowerTail(held, residualDf(n, arms, farms), ncp(n)) - power, smallest);
      const settled = Math.abs(next - nPerGroup) <= 1e-11 * next;
      nPerGroup = next;
      if (settled) break;
    }
  }
  return { nPerGroup, nPerGroupCeil: Math.ceil(nPerGroup - 1e-9) };
}

export type CrossedDesign = {
  /** Smallest difference worth finding between two levels of the factor compared, in the outcome's unit. */
  delta: number;
  /** Spread between blocks of one combination on one farm, same unit. */
  sd: number;
  /** Levels of the factor compared (2 or more), e.g. fruiting methods: Tukey over these. */
  levels: number;
  /** Levels of the other factor (2 or more), e.g. strains: every combination is an arm. */
  otherLevels: number;
  /** Farms, the blocks of the analysis (1 or more). */
  farms: number;
  /** Two-sided significance level of each Tukey-adjusted comparison. */
  alpha: number;
  /**
   * "averaged": two levels compared over all of the other factor's levels with equal weight (a
   * main effect, when the interaction is not material); "within": compared within one level of
   * the other factor (a simple effect, as the report gives when it is).
   */
  comparison: "averaged" | "within";
};

/**
 * Power to find two levels of one factor different in a crossed trial analysed as outcome ~ a + b
 * + a × b + farm with n blocks per combination: residual df = a·b·n − a·b − farms + 1, critical
 * value q(1 − α; levels, df)/√2 (the t quantile for two levels), noncentrality δ/(σ·√(2/(n·m)))
 * where m is the other factor's levels for a comparison averaged over them and 1 within one of
 * them. With one level of the other factor it is powerPairwiseBlocked over `levels` arms.
 */
export function powerCrossedBlocked(n: number, design: CrossedDesign): number {
  const cells = design.levels * design.otherLevels;
  const df = cells * n - cells - design.farms + 1;
  const critical =
    design.levels === 2
      ? studentTQuantile(1 - design.alpha / 2, df)
      : studentizedRangeQuantile(1 - design.alpha, design.levels, df) / Math.SQRT2;
  const replication = design.comparison === "averaged" ? design.otherLevels : 1;
  const ncp = Math.sqrt((n * replication) / 2) * (Math.abs(design.delta) / design.sd);
  return 1 - noncentralTLowerTail(critical, df, ncp);
}

/**
 * Blocks per combination (arm) of a crossed trial so that two levels of the factor compared are
 * found different with the given power (powerCrossedBlocked). Solved as sampleSizePairwiseBlocked
 * is, with the same smallest size that leaves an error estimate.
 */
export function sampleSizeCrossedBlocked(options: Omit<CrossedDesign, "alpha"> & { power?: number; alpha?: number }): SampleSize {
  const { power = 0.8, alpha = 0.05, ...rest } = options;
  const design: CrossedDesign = { ...rest, alpha };
  requireFinite(design.delta, "The difference to detect");
  requireFinite(design.sd, "The standard deviation");
  if (design.delta === 0) {
    throw new StatsInputError("invalid_argument", "The difference to detect is 0; give the smallest difference worth finding.");
  }
  if (!(design.sd > 0)) {
    throw new StatsInputError(
      "invalid_argument",
      `The standard deviation ${design.sd} must be above 0; use the spread seen between blocks.`,
    );
  }
  if (!(alpha > 0 && alpha < 1)) {
    throw new StatsInputError("invalid_level", `The significance level ${alpha} must be between 0 and 1, e.g. 0.05.`);
  }
  if (!(power > alpha && power < 1)) {
    throw new StatsInputError("invalid_level", `The power ${power} must be above the significance level and below 1, e.g. 0.8.`);
  }
  for (const [count, what] of [
    [design.levels, "levels of the factor compared"],
    [design.otherLevels, "levels of the other factor"],
  ] as const) {
    if (!(Number.isInteger(count) && count >= 2)) {
      throw new StatsInputError("invalid_argument", `The number of ${what} ${count} must be a whole number, 2 or more.`);
    }
  }
  if (!(Number.isInteger(design.farms) && design.farms >= 1)) {
    throw new StatsInputError("invalid_argument", `The number of farms ${design.farms} must be a whole number, 1 or more.`);
  }
  const cells = design.levels * design.otherLevels;
  const residualDfAt = (n: number) => cells * n - cells - design.farms + 1;
  const smallest = Math.max(2, ((design.levels > 2 ? 3 : 1) + cells + design.farms - 1) / cells);
  if (powerCrossedBlocked(smallest, design) >= power) return { nPerGroup: smallest, nPerGroupCeil: Math.ceil(smallest - 1e-9) };
  let nPerGroup: number;
  if (design.levels === 2) {
    nPerGroup = increasingRoot((n) => powerCrossedBlocked(n, design) - power, smallest);
  } else {
    // As sampleSizePairwiseBlocked: hold the Tukey critical value, solve, recompute it at the new df, repeat.
    const replication = design.comparison === "averaged" ? design.otherLevels : 1;
    const ncp = (n: number) => Math.sqrt((n * replication) / 2) * (Math.abs(design.delta) / design.sd);
    let last = studentizedRangeQuantile(1 - alpha, design.levels, 1e6);
    const critical = (n: number) => (last = studentizedRangeQuantile(1 - alpha, design.levels, residualDfAt(n), last)) / Math.SQRT2;
    nPerGroup = Math.max(smallest, (2 * ((last / Math.SQRT2 + normalQuantile(power)) * (design.sd / design.delta)) ** 2) / replication);
    for (let round = 0; round < 50; round++) {
      const held = critical(nPerGroup);
      const next = increasingRoot((n) => 1 - noncentralTLowerTail(held, residualDfAt(n), ncp(n)) - power, smallest);
      const settled = Math.abs(next - nPerGroup) <= 1e-11 * next;
      nPerGroup = next;
      if (settled) break;
    }
  }
  return { nPerGroup, nPerGroupCeil: Math.ceil(nPerGroup - 1e-9) };
}

/** The root above `from` of an increasing f that is negative at `from`: doubling for a bracket, then Brent. */
function increasingRoot(f: (n: number) => number, from: number): number {
  let lower = from;
  let upper = 2 * from;
  while (f(upper) < 0) {
    lower = upper;
    upper *= 2;
    if (upper > LARGEST_ARM) {
      throw new StatsInputError(
        "not_estimable",
        "The difference is too small compared with the spread to detect with any practical number of blocks; aim for a larger difference.",
      );
    }
  }
  return brentRoot(f, lower, upper, 1e-10);
}
