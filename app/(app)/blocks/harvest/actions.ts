"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { recordHarvest } from "@/lib/data/blocks";
import { recordHarvestSchema } from "@/lib/season-logs/quick-harvest";
import { formatMass } from "@/lib/units";

// Whose phone queue the entry came from: an entry kept while one member was signed in is never sent in another's name.
const phoneEntrySchema = recordHarvestSchema.extend({ memberId: z.string().max(100).optional() });

export const recordHarvestAction = guardedAction("harvest:record", phoneEntrySchema, async ({ memberId, ...input }, member) => {
  if (memberId !== undefined && memberId !== member.id)
    return {
      status: "error",
      message: "This entry was kept on the phone for another member. It stays here until they sign in on this phone again.",
    };
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
