"use server";

import { revalidatePath } from "next/cache";
import { guardedAction } from "@/lib/auth/guard";
import { updateSeasonStart } from "@/lib/data/seasons";
import { seasonStartLabel, seasonStartSchema } from "@/lib/seasons";

export const updateSeasonStartAction = guardedAction("settings:manage", seasonStartSchema, async (input, member) => {
  const start = { month: input.seasonStartMonth, day: input.seasonStartDay };
  await updateSeasonStart(member, start);
  revalidatePath("/settings/cooperative");
  revalidatePath("/blocks");
  revalidatePath("/my-farm");
  revalidatePath("/results");
  return { status: "ok", message: `Saved. Seasons now start on ${seasonStartLabel(start)}; every block's season follows from now on.` };
});
