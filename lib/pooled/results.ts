import { holm, meanCIFromSummary, metaAnalysis, StatsInputError, wilsonInterval, type BlockedAnova } from "@/lib/stats";
import { normalLowerTail } from "@/lib/stats/distributions";
import type { Random } from "@/lib/random";
import { addBins, publishableSpread, type EfficiencyBins, type Spread } from "./bins";
import { pooledFlushProfile } from "./flush-profile";
import {
  contributingFarms,
  differencingMessage,
  farmCells,
  filterIsSafe,
  matchesFilters,
  suppressedMessage,
  type FarmStrainCell,
} from "./privacy";
import { comparisonSentence, strainSentence } from "./sentences";
import { blockedModelFromCells } from "./cell-models";
import { addSummaries, emptySummary, summaryMean, summaryVariance } from "./sufficient";
import type { DryingStatisticsRow, FlushStatisticsRow, PooledFilters, StrainStatisticsRow } from "./types";

/** A figure that is either published or replaced by the reason it is withheld. */
export type Published<T> = { status: "published"; value: T } | { status: "suppressed"; message: string };

export interface Interval {
  estimate: number;
  lower: number;
  upper: number;
}

export interface StrainResult {
  strainId: string;
  strainName: string;
  farms: Published<number>;
  blocks: Published<number>;
  efficiency: Published<Interval & { adjustedForFarm: boolean; farms: number; blocks: number }>;
  contamination: Published<Interval & { contaminated: number; blocks: number }>;
  firstHarvestDays: Published<{ mean: number; blocks: number }>;
  flushProfile: Published<{ flush: number; meanShare: number; lower: number; upper: number; cumulativeShare: number }[]>;
  /** 10th, 25th, 50th, 75th and 90th percentiles of block BE, each with enough blocks beyond it to be no single block's value. */
  spread: Published<Spread>;
  /** Mean of blocks' dry ÷ fresh mass (a fraction, 0.09 = 9 %), over blocks with a harvest weighed dried. */
  drying: Published<Interval & { farms: number; blocks: number }>;
  sentence: string;
}

/**
 * Farm-adjusted mean BE of strain B − that of strain A, in BE points, from the same model as the
 * strains' adjusted means (BE ~ strain + farm); interval and p-value Tukey-adjusted over all pairs.
 */
export interface PairwiseDifference extends Interval {
  strainA: string;
  strainB: string;
  pAdjusted: number;
  sentence: string;
}

export interface ForestRow extends Interval {
  label: string;
  own: boolean;
  pooled: boolean;
}

export interface HeterogeneityResult extends Interval {
  strainId: string;
  strainName: string;
  farms: number;
  blocks: number;
  i2: number;
  tau: number;
  pHolm: number;
  sentence: string;
  forest: ForestRow[];
}

export interface PooledResults {
  minimumFarms: number;
  filtered: boolean;
  strains: StrainResult[];
  pairwise: Published<PairwiseDifference[]>;
  heterogeneity: Published<{ referenceStrainId: string; referenceStrainName: string; strains: HeterogeneityResult[] }>;
}

export interface PooledResultsInput {
  /** Every row of the species for one flush window, unfiltered: the guard needs them all. */
  rows: readonly StrainStatisticsRow[];
  flushRows: readonly FlushStatisticsRow[];
  /** Drying ratio sums of the species, unfiltered; none when no farm dries its harvests. */
  dryingRows?: readonly DryingStatisticsRow[];
  strains: readonly { id: string; name: string }[];
  filters: PooledFilters;
  minimumFarms: number;
  showPerFarmEstimates: boolean;
  viewerFarmId: string | null;
  /** Shuffles other farms' anonymised rows in the forest chart. */
  random: Random;
  level?: number;
}

function suppressed<T>(message: string): Published<T> {
  return { status: "suppressed", message };
}

function published<T>(value: T): Published<T> {
  return { status: "published", value };
}

/**
 * The co-op's pooled results for one species and flush window. Takes per-farm sufficient
 * statistics and returns only aggregates over at least `minimumFarms` farms: no farm id, no
 * per-farm figure except the viewer's own (and anonymised ones when the co-op allows them).
 */
export function buildPooledResults(input: PooledResultsInput): PooledResults {
  const { minimumFarms, filters } = input;
  const level = input.level ?? 0.95;
  const cells = farmCells(input.rows, filters);
  const few = suppressedMessage(minimumFarms);
  const strainNames = new Map(input.strains.map((strain) => [strain.id, strain.name]));

  // Each kind of figure is guarded by the farms that contribute to it (see filterIsSafe).
  const dryingRows = input.dryingRows ?? [];
  const safety = new Map<string, Record<"counts" | "efficiency" | "firstHarvest" | "flushProfile" | "drying", boolean>>();
  for (const strainId of cells.keys()) {
    const strainRows = input.rows.filter((row) => row.strainId === strainId);
    const strainFlushRows = input.flushRows.filter((row) => row.strainId === strainId);
    safety.set(strainId, {
      counts: filterIsSafe(strainRows, filters, minimumFarms, (row) => row.blocks),
      efficiency: filterIsSafe(strainRows, filters, minimumFarms, (row) => row.efficiencyBlocks),
      firstHarvest: filterIsSafe(strainRows, filters, minimumFarms, (row) => row.firstHarvestBlocks),
      flushProfile: filterIsSafe(strainFlushRows, filters, minimumFarms, (row) => row.finishedBlocks),
      drying: filterIsSafe(
        dryingRows.filter((row) => row.strainId === strainId),
        filters,
        minimumFarms,
        (row) => row.driedBlocks,
      ),
    });
  }

  // Strains whose BE is published take part in the blocked model and the comparisons, in name
  // order: a release must read the same whatever order its rows come back in.
  const comparable = [...cells.entries()]
    .filter(
      ([strainId, farms]) =>
        safety.get(strainId)!.efficiency && contributingFarms(farms.values(), (cell) => cell.efficiency.n) >= minimumFarms,
    )
    .sort(([a], [b]) => (strainNames.get(a) ?? "").localeCompare(strainNames.get(b) ?? "") || a.localeCompare(b));
  const model = farmBlockedModel(comparable, strainNames, level);
  const adjusted = adjustedMeans(model);

  const strains: StrainResult[] = [...cells.entries()]
    .map(([strainId, farms]) => {
      const name = strainNames.get(strainId) ?? "Unnamed strain";
      const farmList = [...farms.values()];
      const safe = safety.get(strainId)!;
      const withhold = (kind: keyof typeof safe, count: number) => (!safe[kind] ? differencingMessage : count < minimumFarms ? few : null);

      const blockFarms = contributingFarms(farmList, (cell) => cell.blocks);
      const totalBlocks = farmList.reduce((sum, cell) => sum + cell.blocks, 0);
      const contaminated = farmList.reduce((sum, cell) => sum + cell.blocksContaminated, 0);
      const blockReason = withhold("counts", blockFarms);

      const efficiencyFarms = contributingFarms(farmList, (cell) => cell.efficiency.n);
      const efficiency = farmList.reduce((sum, cell) => addSummaries(sum, cell.efficiency), emptySummary);
      const efficiencyReason = withhold("efficiency", efficiencyFarms);
      let efficiencyFigure: StrainResult["efficiency"] = suppressed(efficiencyReason ?? few);
      if (!efficiencyReason) {
        const fromModel = adjusted.get(strainId);
        if (fromModel) {
          efficiencyFigure = published({ ...fromModel, adjustedForFarm: true, farms: efficiencyFarms, blocks: efficiency.n });
        } else if (efficiency.n >= 2) {
          const plain = meanCIFromSummary(
            { n: efficiency.n, mean: summaryMean(efficiency), sd: Math.sqrt(summaryVariance(efficiency)) },
            level,
          );
          efficiencyFigure = published({
            estimate: plain.mean,
            lower: plain.lower,
            upper: plain.upper,
            adjustedForFarm: false,
            farms: efficiencyFarms,
            blocks: efficiency.n,
          });
        }
      }

      const firstFarms = contributingFarms(farmList, (cell) => cell.firstHarvestBlocks);
      const firstBlocks = farmList.reduce((sum, cell) => sum + cell.firstHarvestBlocks, 0);
      const firstDays = farmList.reduce((sum, cell) => sum + cell.firstHarvestDaysSum, 0);
      const firstReason = withhold("firstHarvest", firstFarms);

      const flushRows = input.flushRows.filter((row) => row.strainId === strainId && matchesFilters(row, filters));
      const flushFarms = new Set(flushRows.filter((row) => row.finishedBlocks > 0).map((row) => row.farmId)).size;
      const flushReason = withhold("flushProfile", flushFarms);
      const profile = flushReason ? null : pooledFlushProfile(flushRows, level);

      const bins = farmList.reduce<EfficiencyBins>((sum, cell) => addBins(sum, cell.bins), {});
      const spreadValue = efficiencyReason ? null : publishableSpread(bins);
      const spread: StrainResult["spread"] = spreadValue
        ? published(spreadValue)
        : suppressed(efficiencyReason ?? (efficiency.n === 0 ? few : "too few blocks to draw a spread without showing single blocks"));

      const result: StrainResult = {
        strainId,
        strainName: name,
        farms: blockReason ? suppressed(blockReason) : published(blockFarms),
        blocks: blockReason ? suppressed(blockReason) : published(totalBlocks),
        efficiency: efficiencyFigure,
        contamination:
          blockReason || totalBlocks === 0
            ? suppressed(blockReason ?? few)
            : (() => {
                const interval = wilsonInterval(contaminated, totalBlocks, level);
                return published({
                  estimate: 100 * interval.p,
                  lower: 100 * interval.lower,
                  upper: 100 * interval.upper,
                  contaminated,
                  blocks: totalBlocks,
                });
              })(),
        firstHarvestDays:
          firstReason || firstBlocks === 0
            ? suppressed(firstReason ?? few)
            : published({ mean: firstDays / firstBlocks, blocks: firstBlocks }),
        flushProfile: profile
          ? published(
              profile.map((share) => ({
                flush: share.flush,
                meanShare: share.meanShare,
                lower: share.lower,
                upper: share.upper,
                cumulativeShare: share.cumulativeShare,
              })),
            )
          : suppressed(flushReason ?? "not enough finished blocks yet"),
        spread,
        drying: dryingFigure(
          dryingRows.filter((row) => row.strainId === strainId && matchesFilters(row, filters)),
          withhold,
          few,
          level,
        ),
        sentence: "",
      };
      result.sentence = strainSentence(result, minimumFarms);
      return result;
    })
    .sort((a, b) => a.strainName.localeCompare(b.strainName));

  return {
    minimumFarms,
    filtered: filters.substrateRecipeId !== undefined || filters.fruitingMethodId !== undefined,
    strains,
    pairwise: pairwiseDifferences(comparable, model, strainNames, minimumFarms),
    heterogeneity: heterogeneity(comparable, strainNames, input, level),
  };
}

/**
 * The drying ratio of a strain: the mean over blocks of each block's dry ÷ fresh mass, with a t
 * interval over blocks, published only where the minimum number of farms dried harvests of it.
 */
function dryingFigure(
  rows: readonly DryingStatisticsRow[],
  withhold: (kind: "drying", count: number) => string | null,
  few: string,
  level: number,
): StrainResult["drying"] {
  const farms = new Set(rows.filter((row) => row.driedBlocks > 0).map((row) => row.farmId)).size;
  const reason = withhold("drying", farms);
  if (reason) return suppressed(farms === 0 ? "no farm dries this strain's harvests yet" : reason);
  const total = rows.reduce(
    (sum, row) => addSummaries(sum, { n: row.driedBlocks, sum: row.ratioSum, squares: row.ratioSquares }),
    emptySummary,
  );
  if (total.n < 2) return suppressed(few);
  const interval = meanCIFromSummary({ n: total.n, mean: summaryMean(total), sd: Math.sqrt(summaryVariance(total)) }, level);
  return published({ estimate: interval.mean, lower: interval.lower, upper: interval.upper, farms, blocks: total.n });
}

type StrainCells = [string, Map<string, FarmStrainCell>][];

type FarmBlockedModel = { ok: true; fit: BlockedAnova } | { ok: false; message: string };

/**
 * BE ~ strain + farm (the farm is the statistical block) on the comparable strains, fitted once:
 * the strains' adjusted means and the pairwise differences both come from it, so they agree.
 * Strains enter in name order, so the pairs read the same on every request.
 */
function farmBlockedModel(comparable: StrainCells, names: Map<string, string>, level: number): FarmBlockedModel {
  const ordered = [...comparable].sort((a, b) => (names.get(a[0]) ?? "").localeCompare(names.get(b[0]) ?? ""));
  const cells = ordered.flatMap(([strainId, farms]) =>
    [...farms.values()].map((cell) => ({ treatment: strainId, block: cell.farmId, ...cell.efficiency })),
  );
  try {
    return { ok: true, fit: blockedModelFromCells(cells, level) };
  } catch (error) {
    if (error instanceof StatsInputError) return { ok: false, message: error.message };
    throw error;
  }
}

/** Least-squares strain means adjusted for farm, when the model could be fitted. */
function adjustedMeans(model: FarmBlockedModel): Map<string, Interval> {
  if (!model.ok) return new Map();
  return new Map(model.fit.means.map((mean) => [mean.treatment, { estimate: mean.estimate, lower: mean.lower, upper: mean.upper }]));
}

function pairwiseDifferences(
  comparable: StrainCells,
  model: FarmBlockedModel,
  names: Map<string, string>,
  minimumFarms: number,
): PooledResults["pairwise"] {
  if (comparable.length < 2) return suppressed(`needs at least two strains each grown on ${minimumFarms} or more farms`);
  if (!model.ok) return suppressed(model.message);
  const summaries = new Map(
    comparable.map(([strainId, farms]) => [
      strainId,
      {
        farms: contributingFarms(farms.values(), (cell) => cell.efficiency.n),
        blocks: [...farms.values()].reduce((sum, cell) => sum + cell.efficiency.n, 0),
      },
    ]),
  );
  return published(
    model.fit.comparisons.map((comparison) => {
      // The model gives mean(a) − mean(b) with a before b in name order; the table reads "b − a".
      const a = names.get(comparison.a) ?? "Unnamed strain";
      const b = names.get(comparison.b) ?? "Unnamed strain";
      const farms = Math.min(summaries.get(comparison.a)!.farms, summaries.get(comparison.b)!.farms);
      const blocks = summaries.get(comparison.a)!.blocks + summaries.get(comparison.b)!.blocks;
      const estimate = -comparison.difference;
      const lower = -comparison.upper;
      const upper = -comparison.lower;
      return {
        strainA: a,
        strainB: b,
        estimate,
        lower,
        upper,
        pAdjusted: comparison.pAdjusted,
        sentence: comparisonSentence({ better: b, base: a, estimate, lower, upper, farms, blocks }),
      };
    }),
  );
}

/**
 * Each farm's BE difference (strain − reference) with its sampling variance, pooled by
 * DerSimonian–Laird: how much farms disagree (I², τ). The reference is the strain grown on the
 * most farms. Holm adjusts the p-values of the strains-against-reference family.
 */
function heterogeneity(
  comparable: StrainCells,
  names: Map<string, string>,
  input: PooledResultsInput,
  level: number,
): PooledResults["heterogeneity"] {
  const { minimumFarms } = input;
  if (comparable.length < 2) return suppressed(`needs at least two strains each grown on ${minimumFarms} or more farms`);
  const [referenceId, referenceFarms] = [...comparable].sort(
    (a, b) => b[1].size - a[1].size || (names.get(a[0]) ?? "").localeCompare(names.get(b[0]) ?? ""),
  )[0];
  const referenceName = names.get(referenceId) ?? "Unnamed strain";
  const results: Omit<HeterogeneityResult, "pHolm">[] = [];
  const pValues: number[] = [];
  for (const [strainId, farms] of comparable) {
    if (strainId === referenceId) continue;
    const studies: { farmId: string; y: number; v: number; blocks: number }[] = [];
    for (const cell of farms.values()) {
      const reference = referenceFarms.get(cell.farmId);
      if (!reference || cell.efficiency.n < 2 || reference.efficiency.n < 2) continue;
      const v = summaryVariance(cell.efficiency) / cell.efficiency.n + summaryVariance(reference.efficiency) / reference.efficiency.n;
      if (!(v > 0)) continue;
      studies.push({
        farmId: cell.farmId,
        y: summaryMean(cell.efficiency) - summaryMean(reference.efficiency),
        v,
        blocks: cell.efficiency.n + reference.efficiency.n,
      });
    }
    if (studies.length < minimumFarms) continue;
    const pooled = metaAnalysis(studies, level);
    const name = names.get(strainId) ?? "Unnamed strain";
    const blocks = studies.reduce((sum, study) => sum + study.blocks, 0);
    const z = pooled.random.estimate / pooled.random.se;
    const half = (study: { y: number; v: number }) => 1.959963984540054 * Math.sqrt(study.v);
    const own = studies.filter((study) => study.farmId === input.viewerFarmId);
    const others = input.showPerFarmEstimates ? input.random.shuffle(studies.filter((study) => study.farmId !== input.viewerFarmId)) : [];
    const forest: ForestRow[] = [
      ...own.map((study) => ({
        label: "Your farm",
        own: true,
        pooled: false,
        estimate: study.y,
        lower: study.y - half(study),
        upper: study.y + half(study),
      })),
      ...others.map((study, index) => ({
        label: `Farm ${String.fromCharCode(65 + (index % 26))}${index >= 26 ? Math.floor(index / 26) : ""}`,
        own: false,
        pooled: false,
        estimate: study.y,
        lower: study.y - half(study),
        upper: study.y + half(study),
      })),
      {
        label: "All farms (pooled)",
        own: false,
        pooled: true,
        estimate: pooled.random.estimate,
        lower: pooled.random.lower,
        upper: pooled.random.upper,
      },
    ];
    pValues.push(2 * normalLowerTail(-Math.abs(z)));
    results.push({
      strainId,
      strainName: name,
      farms: studies.length,
      blocks,
      estimate: pooled.random.estimate,
      lower: pooled.random.lower,
      upper: pooled.random.upper,
      i2: pooled.i2,
      tau: Math.sqrt(pooled.random.tau2),
      sentence: comparisonSentence({
        better: name,
        base: referenceName,
        estimate: pooled.random.estimate,
        lower: pooled.random.lower,
        upper: pooled.random.upper,
        farms: studies.length,
        blocks,
      }),
      forest,
    });
  }
  if (results.length === 0) return suppressed(`no strain was grown beside ${referenceName} on ${minimumFarms} or more farms`);
  const adjustedP = holm(pValues);
  return published({
    referenceStrainId: referenceId,
    referenceStrainName: referenceName,
    strains: results.map((result, index) => ({ ...result, pHolm: adjustedP[index] })),
  });
}
