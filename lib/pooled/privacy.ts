import { addBins, type EfficiencyBins } from "./bins";
import { addSummaries, emptySummary, type Summary } from "./sufficient";
import type { PooledFilters, StrainStatisticsRow } from "./types";

/** One farm's pooled-over-filter statistics for one strain. Stays inside lib/pooled. */
export interface FarmStrainCell {
  farmId: string;
  strainId: string;
  blocks: number;
  blocksContaminated: number;
  efficiency: Summary;
  bins: EfficiencyBins;
  firstHarvestBlocks: number;
  firstHarvestDaysSum: number;
}

export function matchesFilters(
  row: { substrateRecipeId: string | null; fruitingMethodId: string | null },
  filters: PooledFilters,
): boolean {
  if (filters.substrateRecipeId !== undefined && row.substrateRecipeId !== filters.substrateRecipeId) return false;
  if (filters.fruitingMethodId !== undefined && row.fruitingMethodId !== filters.fruitingMethodId) return false;
  return true;
}

export function isFiltered(filters: PooledFilters): boolean {
  return filters.substrateRecipeId !== undefined || filters.fruitingMethodId !== undefined;
}

/** Adds up each farm's rows for each strain under the filters: strain → farm → cell. */
export function farmCells(rows: readonly StrainStatisticsRow[], filters: PooledFilters): Map<string, Map<string, FarmStrainCell>> {
  const byStrain = new Map<string, Map<string, FarmStrainCell>>();
  for (const row of rows) {
    if (!matchesFilters(row, filters)) continue;
    let farms = byStrain.get(row.strainId);
    if (!farms) byStrain.set(row.strainId, (farms = new Map()));
    const cell = farms.get(row.farmId) ?? {
      farmId: row.farmId,
      strainId: row.strainId,
      blocks: 0,
      blocksContaminated: 0,
      efficiency: emptySummary,
      bins: {},
      firstHarvestBlocks: 0,
      firstHarvestDaysSum: 0,
    };
    farms.set(row.farmId, {
      ...cell,
      blocks: cell.blocks + row.blocks,
      blocksContaminated: cell.blocksContaminated + row.blocksContaminated,
      efficiency: addSummaries(cell.efficiency, { n: row.efficiencyBlocks, sum: row.efficiencySum, squares: row.efficiencySquares }),
      bins: addBins(cell.bins, row.efficiencyBins),
      firstHarvestBlocks: cell.firstHarvestBlocks + row.firstHarvestBlocks,
      firstHarvestDaysSum: cell.firstHarvestDaysSum + row.firstHarvestDaysSum,
    });
  }
  return byStrain;
}

export function suppressedMessage(minimumFarms: number): string {
  return `fewer than ${minimumFarms} farms`;
}

export const differencingMessage =
  "withheld: with this filter, comparing it with the unfiltered figure could single out fewer farms than the co-op's minimum";

/**
 * The differencing guard. Any two published figures for one strain can be subtracted, so a
 * filtered figure (by recipe and/or fruiting method) is published only when every cell of
 * that strain's full recipe × fruiting-method cross-classification is either empty or has
 * blocks from at least the minimum number of farms. Then every published figure is a union of
 * such cells, and any difference of published figures is too: none can isolate fewer farms
 * than the minimum. Unfiltered figures need only the minimum themselves.
 */
export function filterIsSafe(strainRows: readonly StrainStatisticsRow[], filters: PooledFilters, minimumFarms: number): boolean {
  if (!isFiltered(filters)) return true;
  const farmsByCell = new Map<string, Set<string>>();
  for (const row of strainRows) {
    if (row.blocks <= 0) continue;
    const key = `${row.substrateRecipeId ?? "none"}|${row.fruitingMethodId ?? "none"}`;
    let farms = farmsByCell.get(key);
    if (!farms) farmsByCell.set(key, (farms = new Set()));
    farms.add(row.farmId);
  }
  return [...farmsByCell.values()].every((farms) => farms.size >= minimumFarms);
}

/** Farms with at least one counted item (blocks, BE blocks …) in a strain's cells. */
export function contributingFarms(cells: Iterable<FarmStrainCell>, count: (cell: FarmStrainCell) => number): number {
  let farms = 0;
  for (const cell of cells) if (count(cell) > 0) farms++;
  return farms;
}
