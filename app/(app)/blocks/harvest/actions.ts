"use server";

import { revalidatePath } from "next/cache";
import { farmContextOf, guardedAction } from "@/lib/auth/guard";
import { recordHarvest } from "@/lib/data/blocks";
import { AppError } from "@/lib/errors";
import { recordHarvestSchema } from "@/lib/season-logs/quick-harvest";
import { formatMass, parseMass } from "@/lib/units";

export const recordHarvestAction = guardedAction("harvest:record", recordHarvestSchema, async (input, member) => {
  const weight = parseMass(input.weight, { defaultUnit: input.unit });
  if ("error" in weight) throw new AppError("invalid_input", "The weight could not be read.", [{ field: "weight", message: weight.error }]);
  await recordHarvest(farmContextOf(member), {
    blockCode: input.blockCode,
    flush: input.flush,
    harvestedOn: input.harvestedOn,
    freshGrams: weight.grams,
    asWritten: input.weight.trim(),
    unit: input.unit,
  });
  revalidatePath("/blocks", "layout");
  return { status: "ok", message: `Saved flush ${input.flush} of ${input.blockCode}: ${formatMass(weight.grams, member.displayUnits)}.` };
});
