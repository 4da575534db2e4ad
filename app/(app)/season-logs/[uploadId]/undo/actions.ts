"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { undoCommit } from "@/lib/data/corrections";
import { correctionReason } from "@/lib/season-logs/corrections";
import { count } from "@/lib/words";

const undoCommitSchema = z.object({ uploadId: z.string().max(100), reason: correctionReason });

export const undoCommitAction = guardedAction("farm-data:correct", undoCommitSchema, async (input, member) => {
  const receipt = await undoCommit(member, input);
  revalidatePath("/season-logs");
  revalidatePath("/blocks", "layout");
  return {
    status: "ok",
    message: `Undone: ${receipt.fileName}. Removed ${count(receipt.removedBlocks, "block")} and ${count(receipt.removedHarvests, "harvest")} it added; put back ${count(receipt.restoredRows, "row")} it changed, as they were. The co-op's figures follow at their next release.`,
  };
});
