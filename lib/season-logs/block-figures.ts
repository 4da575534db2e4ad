import { biologicalEfficiency, massLoss } from "../stats";

export interface BlockFigureInput {
  /** Harvests recorded: a block with none has no efficiency yet, not 0 %. */
  flushes: number;
  wetMassG: number | null;
  moisture: number | null;
  totalFreshG: number;
  spentMassG: number | null;
}

/**
 * A block's biological efficiency (fresh mass ÷ dry substrate × 100 %) and mass loss in percent;
 * null where the block lacks the weighing that figure needs, and the efficiency null before its first harvest.
 */
export function blockFigures(block: BlockFigureInput): { biologicalEfficiency: number | null; massLoss: number | null } {
  const weighed = block.wetMassG !== null && block.wetMassG > 0;
  const efficiency =
    weighed && block.flushes > 0 && block.moisture !== null && block.moisture < 1
      ? biologicalEfficiency({ freshG: block.totalFreshG, wetBlockG: block.wetMassG!, moisture: block.moisture })
      : null;
  const loss = weighed && block.spentMassG !== null ? massLoss(block.wetMassG!, block.spentMassG) : null;
  return { biologicalEfficiency: efficiency, massLoss: loss };
}

/** The flush after the highest one recorded (1 for a block with no harvest yet). */
export function nextFlush(recordedFlushes: readonly number[]): number {
  return recordedFlushes.reduce((highest, flush) => Math.max(highest, flush), 0) + 1;
}

export type BlockState = "contaminated" | "spent" | "fruiting" | "no harvest yet";

/**
 * Where a block stands, in the words a grower uses: lost to contamination; spent (its spent mass weighed,
 * so it has given its last flush); fruiting (picked at least once); or not harvested yet.
 */
export function blockState(block: { contaminated: boolean; spentMassG: number | null; flushes: number }): BlockState {
  if (block.contaminated) return "contaminated";
  if (block.spentMassG !== null) return "spent";
  return block.flushes > 0 ? "fruiting" : "no harvest yet";
}
