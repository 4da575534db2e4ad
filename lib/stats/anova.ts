import { accurateMean, isRoundingNoise, sumOfSquares } from "./describe";
import { fUpperTail } from "./distributions";
import { StatsInputError, requireAllFinite, requireAtLeast } from "./errors";

export type OneWayAnova = {
  dfBetween: number;
  dfWithin: number;
  ssBetween: number;
  ssWithin: number;
  msBetween: number;
  msWithin: number;
  f: number;
  p: number;
  /** Share of the total sum of squares explained by the groups. */
  r2: number;
};

/**
 * One-way analysis of variance, e.g. BE of several strains on one farm.
 * Sums of squares are centred on group means (two passes), so values with many
 * constant leading digits keep their precision.
 */
export function oneWayAnova(groups: number[][]): OneWayAnova {
  if (groups.length < 2) {
    throw new StatsInputError("too_few_values", `Comparing groups needs at least 2 groups; got ${groups.length}.`);
  }
  groups.forEach((g, i) => {
    requireAtLeast(g, 1, `Group ${i + 1}`);
    requireAllFinite(g, `Group ${i + 1}`);
  });
  const all = groups.flat();
  const grandMean = accurateMean(all);
  let ssBetween = 0;
  let ssWithin = 0;
  for (const g of groups) {
    const m = accurateMean(g);
    ssBetween += g.length * (m - grandMean) * (m - grandMean);
    ssWithin += sumOfSquares(g, m);
  }
  const dfBetween = groups.length - 1;
  const dfWithin = all.length - groups.length;
  if (dfWithin < 1) {
    throw new StatsInputError(
      "too_few_values",
      "Every group has a single value, so there is no within-group spread to test against; add repeat blocks to at least one group.",
    );
  }
  const msBetween = ssBetween / dfBetween;
  const msWithin = ssWithin / dfWithin;
  if (isRoundingNoise(ssWithin, all)) {
    throw new StatsInputError(
      "no_variation",
      "All values within each group are identical, so the F ratio is undefined; check that the values were not copied down a column.",
    );
  }
  const f = msBetween / msWithin;
  return {
    dfBetween,
    dfWithin,
    ssBetween,
    ssWithin,
    msBetween,
    msWithin,
    f,
    p: fUpperTail(f, dfBetween, dfWithin),
    r2: ssBetween / (ssBetween + ssWithin),
  };
}
