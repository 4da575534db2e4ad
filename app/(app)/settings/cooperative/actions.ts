"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { updateCooperativePrivacySettings } from "@/lib/data/pooled-settings";

const cooperativeSettingsSchema = z.object({
  minimumFarms: z.coerce
    .number("Enter the minimum number of farms as a whole number, such as 3.")
    .int("Enter a whole number of farms, such as 3.")
    .min(2, "At least 2 farms: with 1, a farm's own figures would be published.")
    .max(50, "At most 50 farms; a larger minimum would hide every result."),
  showPerFarmEstimates: z.preprocess((value) => value === "on", z.boolean()),
});

export const updateCooperativeSettingsAction = guardedAction("settings:manage", cooperativeSettingsSchema, async (input, member) => {
  await updateCooperativePrivacySettings(member, input);
  revalidatePath("/settings/cooperative");
  revalidatePath("/results");
  return { status: "ok", message: "Saved. Co-op results use the new settings from now on." };
});
