import type { ChangedValue } from "./corrections";
import { harvestRemovalChanges } from "./plan";
import { count } from "@/lib/words";

/**
 * What undoing a season-log commit must do, or why it cannot. A row the commit wrote is
 * "untouched" when its updated_at is still the commit's own transaction time: every row a commit
 * inserts or updates gets that time, and every later write (a commit, an edit) a later one. An
 * undo that would overwrite or remove a later change is refused, never guessed at.
 */

export interface CreatedBlock {
  id: string;
  code: string;
  untouched: boolean;
}

export interface CreatedHarvest {
  id: string;
  blockId: string;
  blockCode: string;
  flush: number;
  harvestedOn: string | null;
  freshMassG: number;
  dryMassG: number | null;
  untouched: boolean;
}

export interface ReplacedRow {
  kind: "block" | "harvest";
  rowId: string;
  /** "block B-12" or "flush 2 of B-12", for a refusal's words. */
  label: string;
  /** False when the row is gone (a harvest deleted since). */
  present: boolean;
  untouched: boolean;
}

/** A value the commit changed, from its own value history (old → new); the undo records new → old. */
export interface CommitChange extends ChangedValue {
  blockId: string;
}

export interface UndoInput {
  /** How many blocks and harvests the commit added, from its report. */
  added: { blocks: number; harvests: number };
  createdBlocks: readonly CreatedBlock[];
  createdHarvests: readonly CreatedHarvest[];
  /** Harvests on blocks the commit added that it did not add itself (a flush recorded since). */
  laterHarvestsOnCreatedBlocks: readonly { blockCode: string; flush: number }[];
  replaced: readonly ReplacedRow[];
  /**
   * Rows the commit added that a later commit (not undone) rewrote or removed: they no longer carry
   * this commit's id; and ("removed") harvests the commit removed that cannot go back, a flush
   * having been recorded in their place since.
   */
  rewrittenSince: readonly { kind: "block" | "harvest" | "removed" | "room"; label: string }[];
  changes: readonly CommitChange[];
}

export interface UndoSteps {
  removeHarvestIds: string[];
  removeBlockIds: string[];
  restore: { kind: "block" | "harvest"; rowId: string }[];
  /** What the undo records in value_changes: each value put back, and each harvest removed from a block that stays. */
  history: CommitChange[];
}

export type UndoPlan = { conflicts: string[] } | { steps: UndoSteps };

function listed(items: readonly string[]): string {
  const shown = items.slice(0, 5).join(", ");
  return items.length > 5 ? `${shown} and ${items.length - 5} more` : shown;
}

export function planUndo(input: UndoInput): UndoPlan {
  const changedSince = [
    ...input.createdBlocks.filter((block) => !block.untouched).map((block) => `block ${block.code}`),
    ...input.createdHarvests.filter((harvest) => !harvest.untouched).map((harvest) => `flush ${harvest.flush} of ${harvest.blockCode}`),
    ...input.replaced.filter((row) => row.present && !row.untouched).map((row) => row.label),
    ...input.rewrittenSince.map((row) => row.label),
  ];
  const rewritten = (kind: "block" | "harvest") => input.rewrittenSince.filter((row) => row.kind === kind).length;
  const conflicts: string[] = [];
  if (changedSince.length > 0)
    conflicts.push(
      `Changed since this commit, by a later file or a correction: ${listed(changedSince)}. Undo the later change first, or correct these by hand.`,
    );
  const gone = input.replaced.filter((row) => !row.present).map((row) => row.label);
  const missingBlocks = input.added.blocks - input.createdBlocks.length - rewritten("block");
  const missingHarvests = input.added.harvests - input.createdHarvests.length - rewritten("harvest");
  if (gone.length > 0 || missingBlocks > 0 || missingHarvests > 0) {
    const parts = [
      ...(gone.length > 0 ? [listed(gone)] : []),
      ...(missingBlocks > 0 ? [`${count(missingBlocks, "block")} it added`] : []),
      ...(missingHarvests > 0 ? [`${count(missingHarvests, "harvest")} it added`] : []),
    ];
    conflicts.push(
      `Rewritten or deleted since this commit: ${parts.join("; ")}. What the commit wrote is no longer all there to take back.`,
    );
  }
  if (input.laterHarvestsOnCreatedBlocks.length > 0)
    conflicts.push(
      `Recorded since on blocks this commit added: ${listed(input.laterHarvestsOnCreatedBlocks.map((harvest) => `flush ${harvest.flush} of ${harvest.blockCode}`))}. Undoing would remove them with the blocks; delete them first if they are wrong.`,
    );
  if (conflicts.length > 0) return { conflicts };

  const removedBlocks = new Set(input.createdBlocks.map((block) => block.id));
  const history: CommitChange[] = input.changes.map((change) => ({
    blockId: change.blockId,
    flush: change.flush,
    field: change.field,
    oldValue: change.newValue,
    newValue: change.oldValue,
  }));
  // A removed block takes its history with it; a removed harvest on a block that stays is recorded there.
  for (const harvest of input.createdHarvests)
    if (!removedBlocks.has(harvest.blockId))
      history.push(...harvestRemovalChanges(harvest).map((change) => ({ ...change, blockId: harvest.blockId })));
  return {
    steps: {
      removeHarvestIds: input.createdHarvests.map((harvest) => harvest.id),
      removeBlockIds: [...removedBlocks],
      restore: input.replaced.map((row) => ({ kind: row.kind, rowId: row.rowId })),
      history,
    },
  };
}
