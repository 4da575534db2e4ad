import { biologicalEfficiency } from "@/lib/stats";

export type ContaminatedHandling = "exclude" | "count_as_zero";

export interface TrialBlockRecord {
  wetMassG: number | null;
  moisture: number | null;
  contaminated: boolean;
  harvests: { flush: number; freshMassG: number }[];
}

export type BlockOutcome = { value: number } | { value: null; reason: "contaminated" | "no_mass" };

/**
 * The pre-declared outcome of one block: biological efficiency over flushes 1..k. A contaminated
 * block is left out or counts as 0 % as the protocol says; a block without its wet mass or
 * moisture cannot give a BE and is reported as lost.
 */
export function blockOutcome(
  block: TrialBlockRecord,
  outcome: { flushes: number; contaminatedHandling: ContaminatedHandling },
): BlockOutcome {
  if (block.contaminated) {
    return outcome.contaminatedHandling === "count_as_zero" ? { value: 0 } : { value: null, reason: "contaminated" };
  }
  if (block.wetMassG === null || block.moisture === null || block.wetMassG <= 0) return { value: null, reason: "no_mass" };
  const freshG = block.harvests.filter((harvest) => harvest.flush <= outcome.flushes).reduce((sum, harvest) => sum + harvest.freshMassG, 0);
  return { value: biologicalEfficiency({ freshG, wetBlockG: block.wetMassG, moisture: block.moisture }) };
}

/**
 * Turns a trial's blocks and harvests into outcome records, each farm keyed by its id: the
 * analysis treats the key as opaque, and discloseTrialAnalysis gives farms the pseudonyms the
 * report shows (drawn at random, never in id order, which the coordinator could match to farms).
 */
export function trialOutcomeRecords(
  blockRows: {
    id: string;
    farmId: string;
    armId: string | null;
    wetMassG: number | null;
    moisture: number | null;
    contaminated: boolean;
  }[],
  harvestRows: { blockId: string; flush: number; freshMassG: number }[],
  outcome: { flushes: number; contaminatedHandling: ContaminatedHandling },
): { farm: string; armId: string; contaminated: boolean; value: number | null }[] {
  const byBlock = new Map<string, { flush: number; freshMassG: number }[]>();
  for (const harvest of harvestRows) byBlock.set(harvest.blockId, [...(byBlock.get(harvest.blockId) ?? []), harvest]);
  return blockRows
    .filter((row) => row.armId !== null)
    .map((row) => ({
      farm: row.farmId,
      armId: row.armId!,
      contaminated: row.contaminated,
      value: blockOutcome(
        { wetMassG: row.wetMassG, moisture: row.moisture, contaminated: row.contaminated, harvests: byBlock.get(row.id) ?? [] },
        outcome,
      ).value,
    }));
}
