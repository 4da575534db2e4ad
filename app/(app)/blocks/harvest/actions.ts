"use server";

import { revalidatePath } from "next/cache";
import { guardedAction } from "@/lib/auth/guard";
import { recordHarvest } from "@/lib/data/blocks";
import { recordHarvestSchema } from "@/lib/season-logs/quick-harvest";
import { formatMass } from "@/lib/units";

export const recordHarvestAction = guardedAction("harvest:record", recordHarvestSchema, async (input, member) => {
  const result = await recordHarvest(member, input);
  if (result.status === "warnings")
    return {
      status: "confirm",
      message: "Check what is marked, then correct it or save anyway.",
      warnings: result.warnings,
    };
  revalidatePath("/blocks", "layout");
  const converted = formatMass(result.freshGrams, member.displayUnits);
  // The weight as the grower typed it first, so a wrong unit shows in their own words.
  const weight = converted === result.asWritten ? result.asWritten : `${result.asWritten} (${converted})`;
  return { status: "ok", message: `Saved flush ${result.flush} of ${result.blockCode}: ${weight}.` };
});
