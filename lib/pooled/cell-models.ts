import { blockedAnovaFromCells, type BlockedAnova } from "@/lib/stats";
import { summaryMean, summarySumOfSquares, type Summary } from "./sufficient";

/** One farm × strain cell of block BE: the farm is the statistical block, the strain the treatment. */
export interface ModelCell extends Summary {
  treatment: string;
  block: string;
}

/**
 * The farm-blocked model (BE ~ strain + farm) from per-farm × strain sums n, Σy, Σy²: its
 * least-squares fit depends on the blocks' values only through them, so this is lib/stats
 * blockedAnovaFromCells on each cell's count, mean and sum of squares, the same fit the
 * trial report makes from block values. Throws StatsInputError as blockedAnova does.
 */
export function blockedModelFromCells(cells: readonly ModelCell[], level = 0.95): BlockedAnova {
  return blockedAnovaFromCells(
    cells.map((cell) => ({
      treatment: cell.treatment,
      block: cell.block,
      n: cell.n,
      mean: cell.n > 0 ? summaryMean(cell) : 0,
      sumOfSquares: summarySumOfSquares(cell),
    })),
    level,
  );
}
