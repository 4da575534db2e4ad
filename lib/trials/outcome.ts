import { biologicalEfficiency } from "@/lib/stats";

import type { ContaminatedHandling } from "./contaminated-handling";

export type { ContaminatedHandling } from "./contaminated-handling";

export interface TrialOutcomeProtocol {
  /** BE is counted over flushes 1..flushes. */
  flushes: number;
  contaminatedHandling: ContaminatedHandling;
}

export interface TrialBlockRecord {
  wetMassG: number | null;
  moisture: number | null;
  contaminated: boolean;
  /** The spent block's mass; recorded means the grower has marked the block spent (finished fruiting). */
  spentMassG: number | null;
  harvests: { flush: number; freshMassG: number }[];
}

/**
 * Why a block is left out of the BE comparison, as every protocol declares it:
 * - contaminated: only when the protocol leaves contaminated blocks out (otherwise they count as 0 %);
 * - lost: no wet mass or moisture, so no BE can be computed;
 * - unfinished: not yet through the outcome's last flush and not marked spent, so its BE is not final;
 * - no_harvest: finished without a harvest in the outcome's flushes; a block with no harvest is
 *   never counted as 0 %, which would credit a missing record as a failed block.
 */
export const exclusionReasons = ["contaminated", "lost", "unfinished", "no_harvest"] as const;
export type ExclusionReason = (typeof exclusionReasons)[number];

export type BlockClass = { counted: true; value: number; countedAsZero: boolean } | { counted: false; reason: ExclusionReason };

/** What the protocol and the report say about each reason, for a trial counting flushes 1..k. */
export function exclusionReasonLabel(reason: ExclusionReason, flushes: number): string {
  switch (reason) {
    case "contaminated":
      return "contaminated (left out, as the protocol declares)";
    case "lost":
      return "lost: no wet mass or moisture recorded";
    case "unfinished":
      return `unfinished: not yet through flush ${flushes} and not marked spent`;
    case "no_harvest":
      return `no harvest recorded in flushes 1–${flushes}`;
  }
}

/**
 * How one block enters the trial's pre-declared outcome, biological efficiency over flushes 1..k.
 * In this order: a contaminated block counts as 0 % or is left out, as the protocol says (its mass
 * does not matter then); a block without wet mass or moisture is lost; a block with no flush k (or
 * later) that is not marked spent is unfinished; a block with no harvest in flushes 1..k is left out.
 * Every other block counts with the BE of the flushes it gave, 1..k (a block spent after flush 1 of
 * 2 has finished with what it gave).
 */
export function classifyTrialBlock(block: TrialBlockRecord, protocol: TrialOutcomeProtocol): BlockClass {
  if (block.contaminated) {
    return protocol.contaminatedHandling === "count_as_zero"
      ? { counted: true, value: 0, countedAsZero: true }
      : { counted: false, reason: "contaminated" };
  }
  if (block.wetMassG === null || block.moisture === null || !(block.wetMassG > 0)) return { counted: false, reason: "lost" };
  const throughLastFlush = block.harvests.some((harvest) => harvest.flush >= protocol.flushes);
  if (!throughLastFlush && block.spentMassG === null) return { counted: false, reason: "unfinished" };
  const counted = block.harvests.filter((harvest) => harvest.flush <= protocol.flushes);
  if (!counted.length) return { counted: false, reason: "no_harvest" };
  const freshG = counted.reduce((sum, harvest) => sum + harvest.freshMassG, 0);
  return {
    counted: true,
    value: biologicalEfficiency({ freshG, wetBlockG: block.wetMassG, moisture: block.moisture }),
    countedAsZero: false,
  };
}

/** One block's outcome record, with why it is left out (null when it counts) and whether it counts as 0 % for contamination. */
export interface ClassifiedOutcomeRecord {
  farm: string;
  armId: string;
  contaminated: boolean;
  value: number | null;
  excluded: ExclusionReason | null;
  countedAsZero: boolean;
}

export interface TrialBlockRow {
  id: string;
  farmId: string;
  armId: string | null;
  wetMassG: number | null;
  moisture: number | null;
  contaminated: boolean;
  spentMassG: number | null;
}

/**
 * Turns a trial's blocks and harvests into outcome records, each farm keyed by its id: the
 * analysis treats the key as opaque, and discloseTrialAnalysis gives farms the pseudonyms the
 * report shows (drawn at random, never in id order, which the coordinator could match to farms).
 */
export function trialOutcomeRecords(
  blockRows: TrialBlockRow[],
  harvestRows: { blockId: string; flush: number; freshMassG: number }[],
  protocol: TrialOutcomeProtocol,
): ClassifiedOutcomeRecord[] {
  const byBlock = new Map<string, { flush: number; freshMassG: number }[]>();
  for (const harvest of harvestRows) byBlock.set(harvest.blockId, [...(byBlock.get(harvest.blockId) ?? []), harvest]);
  return blockRows
    .filter((row) => row.armId !== null)
    .map((row) => {
      const standing = classifyTrialBlock({ ...row, harvests: byBlock.get(row.id) ?? [] }, protocol);
      return {
        farm: row.farmId,
        armId: row.armId!,
        contaminated: row.contaminated,
        value: standing.counted ? standing.value : null,
        excluded: standing.counted ? null : standing.reason,
        countedAsZero: standing.counted && standing.countedAsZero,
      };
    });
}

/** Counts of one farm's blocks in one arm before closing: what is still incomplete, never a mass. */
export interface IncompleteCounts {
  listed: number;
  /** Listed blocks not (yet) in the farm's season log. */
  notInSeasonLog: number;
  inSeasonLog: number;
  /** Not contaminated and not yet through the outcome's last flush nor marked spent: left out if closed now. */
  withoutOutcomeFlushes: number;
  /** Not contaminated, without a wet mass or moisture: lost if closed now. */
  withoutMass: number;
  /** Not contaminated and no spent mass recorded (a block through the last flush still counts). */
  notSpent: number;
  contaminated: number;
  /** Would enter the BE comparison if the trial closed now (contaminated ones at 0 % included, where declared). */
  wouldCount: number;
  /** Would be left out if the trial closed now, by reason. */
  leftOut: Record<ExclusionReason, number>;
}

/** What closing now would do with one farm's blocks in one arm, and what is still missing. */
export function incompleteCounts(blocks: readonly TrialBlockRecord[], listed: number, protocol: TrialOutcomeProtocol): IncompleteCounts {
  const counts: IncompleteCounts = {
    listed,
    notInSeasonLog: Math.max(listed - blocks.length, 0),
    inSeasonLog: blocks.length,
    withoutOutcomeFlushes: 0,
    withoutMass: 0,
    notSpent: 0,
    contaminated: 0,
    wouldCount: 0,
    leftOut: { contaminated: 0, lost: 0, unfinished: 0, no_harvest: 0 },
  };
  for (const block of blocks) {
    if (block.contaminated) counts.contaminated += 1;
    else {
      if (block.wetMassG === null || block.moisture === null || !(block.wetMassG > 0)) counts.withoutMass += 1;
      if (block.spentMassG === null) {
        counts.notSpent += 1;
        if (!block.harvests.some((harvest) => harvest.flush >= protocol.flushes)) counts.withoutOutcomeFlushes += 1;
      }
    }
    const standing = classifyTrialBlock(block, protocol);
    if (standing.counted) counts.wouldCount += 1;
    else counts.leftOut[standing.reason] += 1;
  }
  return counts;
}

/** Whether anything in the counts is still incomplete: the close dialog says so plainly when nothing is. */
export const hasIncomplete = (counts: IncompleteCounts) =>
  counts.notInSeasonLog + counts.withoutOutcomeFlushes + counts.withoutMass + counts.notSpent > 0;
