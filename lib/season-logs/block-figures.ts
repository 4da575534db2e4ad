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
