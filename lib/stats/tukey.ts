import { accurateMean, sumOfSquares } from "./describe";
import { studentizedRangeLowerTail, studentizedRangeQuantile } from "./distributions";
import { StatsInputError, requireAllFinite, requireAtLeast, requireLevel } from "./errors";

export type TukeyComparison = {
  a: string;
  b: string;
  /** mean(a) − mean(b) */
  diff: number;
  lower: number;
  upper: number;
  /** p-value adjusted for all pairwise comparisons. */
  pAdj: number;
};

/**
 * All pairwise differences between groups (e.g. strains) with Tukey–Kramer intervals,
 * which allow unequal group sizes, as R's TukeyHSD on a one-way model.
 * Pairs follow the groups' key order: for keys [x, y, z] the pairs are y−x, z−x, z−y.
 * (JavaScript orders integer-like keys such as "2" numerically before other keys.)
 */
export function tukeyHsd(groups: Record<string, number[]>, level = 0.95): TukeyComparison[] {
  const summaries: Record<string, GroupSummary> = {};
  for (const [name, values] of Object.entries(groups)) {
    requireAtLeast(values, 1, `Group "${name}"`);
    requireAllFinite(values, `Group "${name}"`);
    const mean = accurateMean(values);
    summaries[name] = { n: values.length, mean, sumOfSquares: sumOfSquares(values, mean) };
  }
  return tukeyFromGroupSummaries(summaries, level);
}

/** A group described by its size, mean and sum of squared deviations from that mean. */
export type GroupSummary = { n: number; mean: number; sumOfSquares: number };

/**
 * tukeyHsd from each group's summary alone, so pooled results can compare strains without
 * the blocks' values leaving the database. Same pair order as tukeyHsd.
 */
export function tukeyFromGroupSummaries(groups: Record<string, GroupSummary>, level = 0.95): TukeyComparison[] {
  requireLevel(level);
  const names = Object.keys(groups);
  if (names.length < 2) {
    throw new StatsInputError("too_few_values", `Pairwise comparison needs at least 2 groups; got ${names.length}.`);
  }
  let ssWithin = 0;
  let total = 0;
  for (const name of names) {
    if (!(groups[name].n >= 1)) throw new StatsInputError("empty_group", `Group "${name}" has no values; leave it out or add its blocks.`);
    ssWithin += groups[name].sumOfSquares;
    total += groups[name].n;
  }
  const df = total - names.length;
  if (df < 1) {
    throw new StatsInputError(
      "too_few_values",
      "Every group has a single value, so there is no within-group spread; add repeat blocks to at least one group.",
    );
  }
  const msWithin = ssWithin / df;
  if (msWithin === 0) {
    throw new StatsInputError(
      "no_variation",
      "All values within each group are identical, so pairwise intervals are undefined; check the data.",
    );
  }
  const critical = studentizedRangeQuantile(level, names.length, df);
  const out: TukeyComparison[] = [];
  for (let i = 0; i < names.length; i++) {
    for (let j = i + 1; j < names.length; j++) {
      const a = names[j];
      const b = names[i];
      const diff = groups[a].mean - groups[b].mean;
      const se = Math.sqrt((msWithin / 2) * (1 / groups[a].n + 1 / groups[b].n));
      const half = critical * se;
      const pAdj = 1 - studentizedRangeLowerTail(Math.abs(diff) / se, names.length, df);
      out.push({ a, b, diff, lower: diff - half, upper: diff + half, pAdj: Math.min(1, Math.max(0, pAdj)) });
    }
  }
  return out;
}
