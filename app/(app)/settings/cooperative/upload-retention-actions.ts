"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { updateUploadRetentionDays } from "@/lib/data/upload-limits";

const retentionSchema = z.object({
  rejectedUploadRetentionDays: z.coerce
    .number("Enter the number of days as a whole number, such as 30.")
    .int("Enter a whole number of days, such as 30.")
    .min(1, "Keep rejected files at least 1 day, so a farm can still download what it sent.")
    .max(3650, "At most 3650 days (ten years)."),
});

export const updateUploadRetentionAction = guardedAction("settings:manage", retentionSchema, async (input, member) => {
  await updateUploadRetentionDays(member, input.rejectedUploadRetentionDays);
  revalidatePath("/settings/cooperative");
  return { status: "ok", message: "Saved. Files of rejected uploads older than this are removed at the next clean-up." };
});
