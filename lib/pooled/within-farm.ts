import { addSummaries, emptySummary, summarySumOfSquares, type Summary } from "./sufficient";

/**
 * The spread of block BE within a farm, pooled over farms: each farm's sum of squares about its
 * own mean, over blocks − farms degrees of freedom (what a trial's sample size needs, as farms
 * are blocked out). From the farms' sufficient statistics; null without two blocks more than farms.
 */
export function withinFarmSpread(
  rows: readonly { farmId: string; efficiencyBlocks: number; efficiencySum: number; efficiencySquares: number }[],
): { sd: number; blocks: number; farms: number } | null {
  const byFarm = new Map<string, Summary>();
  for (const row of rows) {
    if (row.efficiencyBlocks === 0) continue;
    byFarm.set(
      row.farmId,
      addSummaries(byFarm.get(row.farmId) ?? emptySummary, {
        n: row.efficiencyBlocks,
        sum: row.efficiencySum,
        squares: row.efficiencySquares,
      }),
    );
  }
  const farms = [...byFarm.values()];
  const blocks = farms.reduce((sum, farm) => sum + farm.n, 0);
  const degrees = blocks - farms.length;
  if (degrees < 1) return null;
  const squares = farms.reduce((sum, farm) => sum + summarySumOfSquares(farm), 0);
  return { sd: Math.sqrt(squares / degrees), blocks, farms: farms.length };
}
