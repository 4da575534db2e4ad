/** Which flushes count towards a block's biological efficiency. */
export const flushWindows = ["all", "1-2", "1"] as const;
export type FlushWindow = (typeof flushWindows)[number];

export const flushWindowLabels: Record<FlushWindow, string> = {
  all: "All flushes",
  "1-2": "Flushes 1–2",
  "1": "First flush only",
};

/** One farm's sufficient statistics for one strain in one recipe × fruiting method × trial arm cell. */
export interface StrainStatisticsRow {
  farmId: string;
  strainId: string;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
  blocks: number;
  blocksContaminated: number;
  efficiencyBlocks: number;
  efficiencySum: number;
  efficiencySquares: number;
  /** Block counts by whole biological-efficiency point. */
  efficiencyBins: Record<string, number>;
  firstHarvestBlocks: number;
  firstHarvestDaysSum: number;
}

/** One farm's sums of finished blocks' flush shares for one strain cell and flush. */
export interface FlushStatisticsRow {
  farmId: string;
  strainId: string;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
  flush: number;
  finishedBlocks: number;
  blocksFruiting: number;
  shareSum: number;
  shareSquares: number;
  cumulativeSum: number;
  cumulativeSquares: number;
}

/**
 * One farm's sums of block BE in one season for one strain in one recipe × fruiting-method cell
 * (trial arms together): the same blocks as the BE of StrainStatisticsRow, split by season. A
 * null season: the block has neither a season nor an inoculation date.
 */
export interface SeasonStatisticsRow {
  farmId: string;
  strainId: string;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
  seasonYear: number | null;
  efficiencyBlocks: number;
  efficiencySum: number;
  efficiencySquares: number;
}

/** What the viewer asked for; an absent recipe or fruiting method means "any". */
export interface PooledFilters {
  substrateRecipeId?: string;
  fruitingMethodId?: string;
}
