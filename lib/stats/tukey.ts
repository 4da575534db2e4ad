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
  requireLevel(level);
  const names = Object.keys(groups);
  if (names.length < 2) {
    throw new StatsInputError("too_few_values", `Pairwise comparison needs at least 2 groups; got ${names.length}.`);
  }
  const means = new Map<string, number>();
  let ssWithin = 0;
  let total = 0;
  for (const name of names) {
    const values = groups[name];
    requireAtLeast(values, 1, `Group "${name}"`);
    requireAllFinite(values, `Group "${name}"`);
    const m = accurateMean(values);
    means.set(name, m);
    ssWithin += sumOfSquares(values, m);
    total += values.length;
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
      const diff = (means.get(a) as number) - (means.get(b) as number);
      const se = Math.sqrt((msWithin / 2) * (1 / groups[a].length + 1 / groups[b].length));
      const half = critical * se;
      const pAdj = 1 - studentizedRangeLowerTail(Math.abs(diff) / se, names.length, df);
      out.push({ a, b, diff, lower: diff - half, upper: diff + half, pAdj: Math.min(1, Math.max(0, pAdj)) });
    }
  }
  return out;
}
