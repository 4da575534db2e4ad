import { meanCIFromSummary } from "@/lib/stats";
import { publishedSteps, roundTo } from "./rounding";
import type { Interval, Published } from "./results";
import { addSummaries, emptySummary, summaryMean, summaryVariance, type Summary } from "./sufficient";
import type { SeasonStatisticsRow } from "./types";

/** A strain's BE in one season: mean block BE with its 95 % interval, over the farms and blocks behind it. */
export type SeasonEfficiency = Interval & { farms: number; blocks: number };

export interface StrainSeasons {
  strainId: string;
  strainName: string;
  /** Why the strain's seasons are withheld, said once for the row; null when they are published. */
  withheld: string | null;
  /** One entry per season of `SeasonBreakdown.seasons`: published, or no farm of the strain had a BE in that season. */
  seasons: { seasonYear: number; efficiency: Published<SeasonEfficiency> | null }[];
}

export interface SeasonBreakdown {
  minimumFarms: number;
  /** Seasons with a published figure for at least one strain, oldest first. */
  seasons: number[];
  strains: StrainSeasons[];
}

export const seasonsWithheldMessage = (minimumFarms: number) =>
  `withheld: in one of its seasons (or recipes or fruiting methods within a season) fewer than ${minimumFarms} farms had a BE, and the other seasons would give that figure away by subtraction from the all-seasons BE`;

const cellOf = (row: SeasonStatisticsRow) =>
  `${row.substrateRecipeId ?? "none"}|${row.fruitingMethodId ?? "none"}|${row.seasonYear ?? "none"}`;

/**
 * The differencing guard for BE season by season. The all-seasons BE of a strain (and of each of
 * its recipe × fruiting-method filters) and its seasons can be subtracted from one another, so
 * the seasons are published only when every cell of the strain's recipe × fruiting method ×
 * season cross-classification (blocks with no season being a season of their own) has no farm or
 * at least the minimum with a BE. Then every published BE is a union of such cells and any
 * difference of two is too. Checking seasons alone would not do: with one farm alone in recipe 1
 * in 2026, "recipe 1, all seasons" minus "2025" would be that farm's 2026 BE.
 */
export function seasonsAreSafe(strainRows: readonly SeasonStatisticsRow[], minimumFarms: number): boolean {
  const farmsByCell = new Map<string, Set<string>>();
  for (const row of strainRows) {
    if (row.efficiencyBlocks <= 0) continue;
    const key = cellOf(row);
    const farms = farmsByCell.get(key) ?? new Set<string>();
    farms.add(row.farmId);
    farmsByCell.set(key, farms);
  }
  return [...farmsByCell.values()].every((farms) => farms.size >= minimumFarms);
}

const be = (value: number) => roundTo(value, publishedSteps.efficiencyPoints);

/**
 * Each strain's BE season by season, every recipe and fruiting method together, from one flush
 * window's season rows of a release (one species). Published at the page's step (0.1 BE point).
 * The interval treats blocks as independent, as the unadjusted strain mean does.
 */
export function seasonBySeason(input: {
  rows: readonly SeasonStatisticsRow[];
  strains: readonly { id: string; name: string }[];
  minimumFarms: number;
  level?: number;
}): SeasonBreakdown {
  const { minimumFarms } = input;
  const level = input.level ?? 0.95;
  const names = new Map(input.strains.map((strain) => [strain.id, strain.name]));
  const byStrain = new Map<string, SeasonStatisticsRow[]>();
  for (const row of input.rows) byStrain.set(row.strainId, [...(byStrain.get(row.strainId) ?? []), row]);

  const computed = [...byStrain.entries()].map(([strainId, rows]) => {
    const safe = seasonsAreSafe(rows, minimumFarms);
    const bySeason = new Map<number, { summary: Summary; farms: Set<string> }>();
    for (const row of rows) {
      if (row.seasonYear === null || row.efficiencyBlocks <= 0) continue;
      const entry = bySeason.get(row.seasonYear) ?? { summary: emptySummary, farms: new Set<string>() };
      entry.summary = addSummaries(entry.summary, { n: row.efficiencyBlocks, sum: row.efficiencySum, squares: row.efficiencySquares });
      entry.farms.add(row.farmId);
      bySeason.set(row.seasonYear, entry);
    }
    const figures = new Map<number, SeasonEfficiency>();
    if (safe) {
      for (const [seasonYear, { summary, farms }] of bySeason) {
        // Every cell has the minimum, so every season does; the check stays so a lone season can never slip through.
        if (farms.size < minimumFarms || summary.n < 2) continue;
        const interval = meanCIFromSummary({ n: summary.n, mean: summaryMean(summary), sd: Math.sqrt(summaryVariance(summary)) }, level);
        figures.set(seasonYear, {
          estimate: be(interval.mean),
          lower: be(interval.lower),
          upper: be(interval.upper),
          farms: farms.size,
          blocks: summary.n,
        });
      }
    }
    return { strainId, strainName: names.get(strainId) ?? "Unnamed strain", safe, figures };
  });

  const seasons = [...new Set(computed.flatMap((strain) => [...strain.figures.keys()]))].sort((a, b) => a - b);
  const strains = computed
    .filter((strain) => !strain.safe || strain.figures.size > 0)
    .sort((a, b) => a.strainName.localeCompare(b.strainName) || a.strainId.localeCompare(b.strainId))
    .map((strain): StrainSeasons => ({
      strainId: strain.strainId,
      strainName: strain.strainName,
      withheld: strain.safe ? null : seasonsWithheldMessage(minimumFarms),
      seasons: seasons.map((seasonYear) => {
        const figure = strain.figures.get(seasonYear);
        return {
          seasonYear,
          efficiency: figure ? { status: "published", value: figure } : strain.safe ? null : { status: "suppressed", message: "withheld" },
        };
      }),
    }));
  return { minimumFarms, seasons, strains };
}

const one = (value: number) => value.toFixed(1);

/**
 * A strain's row of "BE season by season", keyed "strain" and `season-<year>`. A withheld row
 * says why in its first season cell and only "withheld" in the others, so the reason is read once.
 */
export function seasonTableRow(strain: StrainSeasons): Record<string, string> {
  const row: Record<string, string> = { strain: strain.strainName };
  let reasonGiven = false;
  for (const { seasonYear, efficiency } of strain.seasons) {
    row[`season-${seasonYear}`] =
      efficiency === null
        ? "no blocks with a BE"
        : efficiency.status === "published"
          ? `${one(efficiency.value.estimate)} % (${one(efficiency.value.lower)} to ${one(efficiency.value.upper)}), ${efficiency.value.farms} farms`
          : reasonGiven || !strain.withheld
            ? "withheld"
            : ((reasonGiven = true), strain.withheld);
  }
  return row;
}
