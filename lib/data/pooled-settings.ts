import "server-only";
import { eq, sql } from "drizzle-orm";
import { withFarmContext } from "@/db/client";
import { cooperativeSettings } from "@/db/schema";
import { recordAudit } from "@/lib/data/audit";
import { farmContextOf, type Member } from "@/lib/data/members";
import { AppError } from "@/lib/errors";

export interface CooperativePrivacySettings {
  minimumFarms: number;
  showPerFarmEstimates: boolean;
}

export async function getCooperativeSettingsForEditing(member: Member): Promise<CooperativePrivacySettings & { name: string }> {
  return withFarmContext(farmContextOf(member), async (tx) => {
    const [row] = await tx
      .select({
        name: cooperativeSettings.name,
        minimumFarms: cooperativeSettings.minimumFarms,
        showPerFarmEstimates: cooperativeSettings.showPerFarmEstimates,
      })
      .from(cooperativeSettings);
    if (!row) throw new AppError("not_found", "The co-op has no settings row yet; run the set-up (npm start) first.");
    return row;
  });
}

/** Changes who counts as "enough farms" and whether anonymised per-farm estimates are shown; audited. */
export async function updateCooperativePrivacySettings(member: Member, next: CooperativePrivacySettings): Promise<void> {
  await withFarmContext(farmContextOf(member), async (tx) => {
    const [before] = await tx
      .select({ minimumFarms: cooperativeSettings.minimumFarms, showPerFarmEstimates: cooperativeSettings.showPerFarmEstimates })
      .from(cooperativeSettings);
    const updated = await tx
      .update(cooperativeSettings)
      .set({ minimumFarms: next.minimumFarms, showPerFarmEstimates: next.showPerFarmEstimates, updatedAt: sql`now()` })
      .where(eq(cooperativeSettings.id, 1))
      .returning({ id: cooperativeSettings.id });
    if (updated.length === 0) throw new AppError("forbidden", "Only the co-op coordinator may change these settings.");
    await recordAudit(tx, {
      action: "cooperative-settings.updated",
      subject: "Co-op settings",
      farmId: null,
      actorUserId: member.id,
      actorLabel: member.name,
      details: { before, after: next },
    });
  });
}
