import "server-only";
import { asc, eq, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { zipSync, strToU8 } from "fflate";
import {
  auditEvents,
  blocks,
  cooperativeSettings,
  farmImportPreferences,
  farms,
  harvests,
  strains,
  substrateRecipes,
  treatments,
  trialEnrolments,
  uploads,
  valueChanges,
} from "@/db/schema";
import { toCsv } from "@/lib/csv";
import { AppError } from "@/lib/errors";
import { exportFiles, exportReadme, originalFileName, withdrawalConfirmed } from "@/lib/members/farm-export";
import { actor, recordAudit } from "./audit";
import type { Member } from "./members";
import { queuePooledRefresh } from "./pooled-refresh";
import { asMember, farmOf, type FarmMemberContext } from "./context";

function managedFarmOf(member: Member): FarmMemberContext {
  if (member.role !== "farm_manager") throw new AppError("forbidden", "Only a farm manager can download or withdraw the farm's data.");
  return farmOf(member, "download or withdraw the farm's data");
}

function csvOf(kind: keyof typeof exportFiles, rows: Record<string, unknown>[]): string {
  return toCsv(rows, exportFiles[kind].columns);
}

/** Everything the farm gave the co-op, as a zip: CSVs, original files and a README. Read under the farm's own policies. */
export async function exportFarmData(member: Member): Promise<{ fileName: string; zip: Uint8Array }> {
  const { farmId } = managedFarmOf(member);
  return asMember(member, async (tx) => {
    const recipes = alias(substrateRecipes, "recipes");
    const methods = alias(treatments, "methods");
    const blockRows = await tx
      .select({
        id: blocks.id,
        code: blocks.code,
        strainCode: strains.code,
        substrateRecipeCode: recipes.code,
        fruitingMethodCode: methods.code,
        inoculatedOn: blocks.inoculatedOn,
        wetMassG: blocks.wetMassG,
        wetMassAsWritten: blocks.wetMassAsWritten,
        moisture: blocks.moisture,
        contaminated: blocks.contaminated,
        contaminatedOn: blocks.contaminatedOn,
        spentMassG: blocks.spentMassG,
        spentMassAsWritten: blocks.spentMassAsWritten,
        notes: blocks.notes,
        createdAt: blocks.createdAt,
      })
      .from(blocks)
      .innerJoin(strains, eq(strains.id, blocks.strainId))
      .leftJoin(recipes, eq(recipes.id, blocks.substrateRecipeId))
      .leftJoin(methods, eq(methods.id, blocks.fruitingMethodId))
      .where(eq(blocks.farmId, farmId))
      .orderBy(asc(blocks.code));
    const harvestRows = await tx
      .select({
        blockCode: blocks.code,
        flush: harvests.flush,
        harvestedOn: harvests.harvestedOn,
        freshMassG: harvests.freshMassG,
        freshMassAsWritten: harvests.freshMassAsWritten,
        dryMassG: harvests.dryMassG,
        dryMassAsWritten: harvests.dryMassAsWritten,
      })
      .from(harvests)
      .innerJoin(blocks, eq(blocks.id, harvests.blockId))
      .where(eq(harvests.farmId, farmId))
      .orderBy(asc(blocks.code), asc(harvests.flush));
    const uploadRows = await tx.select().from(uploads).where(eq(uploads.farmId, farmId)).orderBy(asc(uploads.uploadedAt));
    const changeRows = await tx
      .select({
        blockCode: blocks.code,
        flush: valueChanges.flush,
        field: valueChanges.field,
        oldValue: valueChanges.oldValue,
        newValue: valueChanges.newValue,
        changedAt: valueChanges.changedAt,
        reason: valueChanges.reason,
      })
      .from(valueChanges)
      .innerJoin(blocks, eq(blocks.id, valueChanges.blockId))
      .where(eq(valueChanges.farmId, farmId))
      .orderBy(asc(valueChanges.changedAt));
    const activityRows = (
      await tx.select().from(auditEvents).where(eq(auditEvents.farmId, farmId)).orderBy(asc(auditEvents.occurredAt))
    ).map((event) => ({ ...event, details: JSON.stringify(event.details) }));
    const [farm] = await tx.select({ name: farms.name }).from(farms).where(eq(farms.id, farmId));
    const [settings] = await tx.select({ name: cooperativeSettings.name }).from(cooperativeSettings);

    const files: Record<string, Uint8Array> = {};
    const uploadList = uploadRows.map((upload, index) => {
      // A rejected upload's file is removed after the co-op's retention period; its row stays, naming no file.
      if (upload.content.byteLength === 0) return { ...upload, archiveName: "" };
      const archiveName = originalFileName(index, upload.fileName);
      files[archiveName] = new Uint8Array(upload.content);
      return { ...upload, archiveName };
    });
    files[exportFiles.blocks.file] = strToU8(csvOf("blocks", blockRows));
    files[exportFiles.harvests.file] = strToU8(csvOf("harvests", harvestRows));
    files[exportFiles.uploads.file] = strToU8(csvOf("uploads", uploadList));
    files[exportFiles.changes.file] = strToU8(csvOf("changes", changeRows));
    files[exportFiles.activity.file] = strToU8(csvOf("activity", activityRows));
    const exportedAt = new Date();
    files["README.txt"] = strToU8(
      exportReadme({
        farmName: farm?.name ?? "Your farm",
        cooperativeName: settings?.name ?? "the co-op",
        exportedAt,
        counts: {
          blocks: blockRows.length,
          harvests: harvestRows.length,
          uploads: uploadRows.length,
          changes: changeRows.length,
          activity: activityRows.length,
        },
      }),
    );
    await recordAudit(tx, {
      ...actor(member),
      farmId,
      action: "farm.data-exported",
      subject: farm?.name ?? "",
      details: { blocks: blockRows.length, harvests: harvestRows.length, uploads: uploadRows.length },
    });
    const slug = (farm?.name ?? "farm")
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-|-$/g, "");
    return { fileName: `${slug}-data-${exportedAt.toISOString().slice(0, 10)}.zip`, zip: zipSync(files, { level: 6 }) };
  });
}

export interface WithdrawalSummary {
  blocks: number;
  harvests: number;
  uploads: number;
  valueChanges: number;
  trialEnrolmentsDropped: number;
  /** Published trials whose reports now say that a farm withdrew after publication. */
  publishedTrialsNoted: number;
}

/**
 * Deletes every row the farm gave (blocks, harvests, uploads, value changes, import choices) in
 * one transaction after the typed confirmation, drops its trial enrolments, records the
 * withdrawal on the farm's and the co-op's log, and queues the recompute of its pooled statistics.
 */
export async function withdrawFarmData(member: Member, typedConfirmation: string): Promise<WithdrawalSummary> {
  const { farmId } = managedFarmOf(member);
  const summary = await asMember(member, async (tx) => {
    const [farm] = await tx.select({ name: farms.name }).from(farms).where(eq(farms.id, farmId));
    if (!farm || !withdrawalConfirmed(farm.name, typedConfirmation)) {
      throw new AppError("invalid_input", "The confirmation does not match.", [
        { field: "confirmation", message: `Type your farm's name, ${farm?.name ?? ""}, exactly to confirm.` },
      ]);
    }
    const deletedHarvests = await tx.delete(harvests).where(eq(harvests.farmId, farmId)).returning({ id: harvests.id });
    const deletedChanges = await tx.delete(valueChanges).where(eq(valueChanges.farmId, farmId)).returning({ id: valueChanges.id });
    const deletedBlocks = await tx.delete(blocks).where(eq(blocks.farmId, farmId)).returning({ id: blocks.id });
    const deletedUploads = await tx.delete(uploads).where(eq(uploads.farmId, farmId)).returning({ id: uploads.id });
    await tx.delete(farmImportPreferences).where(eq(farmImportPreferences.farmId, farmId));
    // Before the enrolments are dropped: published reports keep their figures and note the withdrawal.
    const noted = await tx.execute<{ trials: number }>(sql`select app_note_withdrawal_on_published_trials() as trials`);
    const dropped = await tx
      .update(trialEnrolments)
      .set({ status: "dropped" })
      .where(sql`${trialEnrolments.farmId} = ${farmId} and ${trialEnrolments.status} <> 'dropped'`)
      .returning({ id: trialEnrolments.id });
    const result: WithdrawalSummary = {
      blocks: deletedBlocks.length,
      harvests: deletedHarvests.length,
      uploads: deletedUploads.length,
      valueChanges: deletedChanges.length,
      trialEnrolmentsDropped: dropped.length,
      publishedTrialsNoted: noted.rows[0]?.trials ?? 0,
    };
    const entry = {
      ...actor(member),
      action: "farm.withdrew-data" as const,
      subject: farm.name,
      details: { farmId, ...result },
    };
    await recordAudit(tx, { ...entry, farmId });
    await recordAudit(tx, entry);
    await queuePooledRefresh(tx, farmId);
    return result;
  });
  return summary;
}
