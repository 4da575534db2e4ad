"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { cutReleaseNow } from "@/lib/data/pooled-releases";
import { updateCooperativeSettings } from "@/lib/data/pooled-settings";
import { cooperativeSettingsSchema } from "@/lib/pooled";
import { timeDisplayFor } from "@/lib/time/member-display";
import { count } from "@/lib/words";

export const updateCooperativeSettingsAction = guardedAction("settings:manage", cooperativeSettingsSchema, async (input, member) => {
  // The hour is read on the clocks of the zone the coordinator reads every other time in.
  await updateCooperativeSettings(member, { ...input, releaseTimeZone: (await timeDisplayFor(member)).timeZone });
  revalidatePath("/settings/cooperative");
  revalidatePath("/results");
  return { status: "ok", message: "Saved. Co-op results use the new settings from now on." };
});

// The form says what it asks for, so a form posted empty (or by mistake) publishes nothing.
const cutReleaseSchema = z.object({ publish: z.literal("release", "Use the button “Publish a release now” to publish one.") });

/** The coordinator cuts a release now, under the same rule as the schedule. */
export const cutReleaseNowAction = guardedAction("settings:manage", cutReleaseSchema, async (_input, member) => {
  const attempt = await cutReleaseNow(member);
  revalidatePath("/settings/cooperative");
  revalidatePath("/results");
  if (attempt.outcome === "cut") {
    return {
      status: "ok",
      message: `Release ${attempt.release.number} is published: ${count(attempt.figuresChanged, "figure")} took new values.`,
    };
  }
  if (attempt.outcome === "waiting") {
    return {
      status: "error",
      message: `Nothing was published: the changes since the last release come from too few farms (each figure needs changes from at least ${attempt.minimumFarms}). See what waits below.`,
    };
  }
  return { status: "ok", message: "Nothing was published: no farm's data has changed since the last release." };
});
