"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { correctBlock, correctHarvest, deleteHarvest } from "@/lib/data/corrections";
import { moveBlock } from "@/lib/data/rooms";
import { moveSchema } from "@/lib/rooms/schemas";
import { blockCorrectionSchema, harvestCorrectionSchema, harvestRemovalSchema } from "@/lib/season-logs/corrections";
import { count } from "@/lib/words";

const confirm = (warnings: { code: string; field: string; message: string }[]) => ({
  status: "confirm" as const,
  message: "Check what is marked, then correct it or save anyway.",
  warnings,
});

const saved = (changed: number) => ({
  status: "ok" as const,
  message:
    changed === 0
      ? "Nothing changed: the values are as stored."
      : `Saved ${count(changed, "changed value")}, with your reason, in the history below.`,
});

export const correctBlockAction = guardedAction("farm-data:correct", blockCorrectionSchema, async (input, member) => {
  const result = await correctBlock(member, input);
  if (result.status === "warnings") return confirm(result.warnings);
  revalidatePath("/blocks", "layout");
  return saved(result.changed);
});

// One form corrects or deletes a harvest: the button pressed says which ("Save anyway" corrects).
const harvestFormSchema = z.preprocess(
  (form) => ({ intent: "correct", ...(form as object) }),
  z.discriminatedUnion("intent", [
    harvestCorrectionSchema.extend({ intent: z.literal("correct") }),
    harvestRemovalSchema.extend({ intent: z.literal("delete") }),
  ]),
);

export const correctHarvestAction = guardedAction("farm-data:correct", harvestFormSchema, async (input, member) => {
  if (input.intent === "delete") {
    const deleted = await deleteHarvest(member, input);
    if (deleted.status === "warnings")
      return { ...confirm(deleted.warnings), message: "Check what is marked, then delete anyway or keep the harvest." };
    revalidatePath("/blocks", "layout");
    redirect(`/blocks/${deleted.blockId}?deleted=1`);
  }
  const result = await correctHarvest(member, input);
  if (result.status === "warnings") return confirm(result.warnings);
  revalidatePath("/blocks", "layout");
  return saved(result.changed);
});

export const moveBlockAction = guardedAction("rooms:record", moveSchema, async (input, member) => {
  const { roomName } = await moveBlock(member, input);
  revalidatePath("/blocks", "layout");
  revalidatePath("/rooms", "layout");
  return { status: "ok", message: `Saved: moved to ${roomName}${input.movedOn ? "" : " from the start of fruiting"}.` };
});
