import "server-only";
import { eq, sql } from "drizzle-orm";
import { cooperativeSettings } from "@/db/schema";
import { actor, recordAudit } from "@/lib/data/audit";
import { type Member } from "@/lib/data/members";
import { AppError, databaseRefusalOf } from "@/lib/errors";
import { canonicalTimeZone } from "@/lib/time/display";
import type { CooperativeSettingsInput } from "@/lib/pooled";
import { asMember } from "./context";

const settingsColumns = {
  minimumFarms: cooperativeSettings.minimumFarms,
  showPerFarmEstimates: cooperativeSettings.showPerFarmEstimates,
  releaseSchedule: cooperativeSettings.releaseSchedule,
  releaseHour: cooperativeSettings.releaseHour,
  releaseTimeZone: cooperativeSettings.releaseTimeZone,
};

/** The settings as saved; `releaseTimeZone` is the zone whose clocks `releaseHour` is read on. */
export type CooperativeSettings = CooperativeSettingsInput & { releaseTimeZone: string };

export async function getCooperativeSettingsForEditing(member: Member): Promise<CooperativeSettings & { name: string }> {
  return asMember(member, async (tx) => {
    const [row] = await tx.select({ name: cooperativeSettings.name, ...settingsColumns }).from(cooperativeSettings);
    if (!row) throw new AppError("not_found", "The co-op has no settings row yet; run the set-up (npm start) first.");
    return row;
  });
}

/**
 * Changes who counts as "enough farms", whether anonymised per-farm estimates are shown and when
 * releases are cut (the hour on the clocks of the zone the coordinator reads times in); audited.
 * The database refuses a minimum below 3 whoever asks.
 */
export async function updateCooperativeSettings(member: Member, next: CooperativeSettings): Promise<void> {
  if (!canonicalTimeZone(next.releaseTimeZone))
    throw new AppError("invalid_input", `"${next.releaseTimeZone.slice(0, 60)}" is not a time zone. Choose your zone on Settings first.`);
  await asMember(member, async (tx) => {
    const [before] = await tx.select(settingsColumns).from(cooperativeSettings);
    const updated = await tx
      .update(cooperativeSettings)
      .set({ ...next, updatedAt: sql`now()` })
      .where(eq(cooperativeSettings.id, 1))
      .returning({ id: cooperativeSettings.id })
      .catch((error: unknown) => {
        if (databaseRefusalOf(error).constraint === "minimum_farms_at_least_three") {
          throw new AppError(
            "invalid_input",
            "The minimum number of farms cannot be below 3: with 2, each farm learns the other's figures.",
          );
        }
        throw error;
      });
    if (updated.length === 0) throw new AppError("forbidden", "Only the co-op coordinator may change these settings.");
    await recordAudit(tx, {
      action: "cooperative-settings.updated",
      subject: "Co-op settings",
      farmId: null,
      ...actor(member),
      details: { before, after: next },
    });
  });
}
