"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { withdrawFarmData } from "@/lib/data/data-rights";
import { agree, count } from "@/lib/words";

const withdrawSchema = z.object({ confirmation: z.string().trim().min(1, "Type your farm's name to confirm.") });

export const withdrawFarmDataAction = guardedAction("farm:withdraw", withdrawSchema, async (input, member) => {
  const removed = await withdrawFarmData(member, input.confirmation);
  revalidatePath("/", "layout");
  return {
    status: "ok",
    message: `Withdrawn: ${count(removed.blocks, "block")}, ${count(removed.harvests, "harvest")} and ${count(removed.uploads, "uploaded file")} were deleted, and the co-op's pooled results are being recomputed without them. ${
      removed.publishedTrialsNoted > 0
        ? `${count(removed.publishedTrialsNoted, "published trial report")} ${agree(removed.publishedTrialsNoted, "keeps its figures and now says", "keep their figures and now say")} that a farm withdrew. `
        : ""
    }The record of this withdrawal stays in the activity log.`,
  };
});
