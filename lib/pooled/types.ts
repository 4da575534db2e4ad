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

/**
 * One farm's drying ratio sums for one strain cell: blocks with a harvest weighed both fresh and
 * dried, and Σ, Σ² of each such block's ratio (dry ÷ fresh, over its dried harvests).
 */
export interface DryingStatisticsRow {
  farmId: string;
  strainId: string;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
  driedBlocks: number;
  ratioSum: number;
  ratioSquares: number;
}

/**
 * One farm's figures for one climate regime kind in one species, with the room as the unit: a
 * "room" here is a fruiting room while it ran that regime. Counts are of blocks matched to such
 * rooms; the sums are of each room's contamination rate (fraction) and each room's mean BE.
 */
export interface RegimeStatisticsRow {
  farmId: string;
  speciesId: string;
  regimeKindId: string;
  rooms: number;
  blocks: number;
  blocksContaminated: number;
  contaminationRoomSum: number;
  contaminationRoomSquares: number;
  /** Rooms with at least one block with a BE, and the blocks behind their means. */
  efficiencyRooms: number;
  efficiencyRoomSum: number;
  efficiencyRoomSquares: number;
  efficiencyBlocks: number;
  /** For the intraclass correlation: Σy, Σy² over the BE blocks; Σ nᵢȳᵢ² and Σ nᵢ² over the rooms. */
  blockEfficiencySum: number;
  blockEfficiencySquares: number;
  roomWeightedSquares: number;
  roomSizeSquares: number;
}

/** What the viewer asked for; an absent recipe or fruiting method means "any". */
export interface PooledFilters {
  substrateRecipeId?: string;
  fruitingMethodId?: string;
}
