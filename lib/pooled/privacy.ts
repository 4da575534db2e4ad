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
    if (!farms) byStrain.set(row.strainId, (farms = new Map<string, FarmStrainCell>()));
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

/** What a figure is made of: a farm's row in one recipe × fruiting-method cell (strain or flush statistics). */
export interface CellRow {
  farmId: string;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
}

/**
 * The differencing guard. Any two published figures for one strain can be subtracted, so a
 * figure filtered by recipe and/or fruiting method is published only when every cell of that
 * strain's full recipe × fruiting-method cross-classification has either no farm or at least
 * the minimum number of farms *contributing to that figure*: `contributes` says how much a row
 * gives to it (blocks for counts, blocks with a BE for BE, finished blocks for the flush profile
 * …), so farms whose blocks have not fruited do not count towards a BE cell. Then every
 * published figure of that kind is a union of such cells, and any difference of two is too:
 * none can isolate fewer contributing farms than the minimum. Unfiltered figures need only the
 * minimum themselves.
 */
export function filterIsSafe<Row extends CellRow>(
  strainRows: readonly Row[],
  filters: PooledFilters,
  minimumFarms: number,
  contributes: (row: Row) => number,
): boolean {
  if (!isFiltered(filters)) return true;
  const farmsByCell = new Map<string, Set<string>>();
  for (const row of strainRows) {
    if (contributes(row) <= 0) continue;
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
