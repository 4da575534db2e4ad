import "server-only";
import { createHash } from "node:crypto";
import { and, desc, eq, sql } from "drizzle-orm";
import { withFarmContext, type FarmContext, type Transaction } from "@/db/client";
import { blocks, farmImportPreferences, harvests, strains, substrateRecipes, treatments, trialArms, trialBlockAssignments, trials, uploads } from "@/db/schema";
import { createSeasonLogParser, type SeasonLogParserOptions, type SeasonLogResult, type TemplateCodes } from "@/lib/import";
import { AppError } from "@/lib/errors";
import { recordAudit } from "@/lib/data/audit";
import { refreshPooledStatistics } from "@/lib/data/pooled-refresh";
import { type CommitPlan, type PlanCounts, type PlanInput, planCommit } from "@/lib/season-logs/plan";
import { type ParseChoices, type UploadReport, buildReport, parserOptions } from "@/lib/season-logs/report";

export type FarmMemberContext = FarmContext & { userId: string; farmId: string };

export interface UploadSummary {
  id: string;
  fileName: string;
  uploadedAt: string;
  outcome: "received" | "rejected" | "committed" | "already_imported";
  sizeBytes: number;
  rowCount: number;
  committedAt: string | null;
}

export interface UploadView {
  upload: UploadSummary;
  report: UploadReport;
  /** Set when the same file was committed before: nothing will change. */
  alreadyImportedAt: string | null;
  canCommit: boolean;
}

export interface CommitReceipt {
  uploadId: string;
  fileName: string;
  committedAt: string;
  counts: PlanCounts;
  changedValues: number;
}

/** What the parser needs from the database before a file streams in. */
export interface ImportSetup {
  knownStrains: string[];
  remembered: ParseChoices;
}

function farmOf(context: FarmContext): FarmMemberContext {
  if (!context.farmId || !context.userId) throw new AppError("forbidden", "Only a farm's own people can work with its season logs.");
  return context as FarmMemberContext;
}

function iso(value: Date | string | null): string | null {
  if (value === null) return null;
  return value instanceof Date ? value.toISOString() : new Date(value).toISOString();
}

const summaryColumns = {
  id: uploads.id,
  fileName: uploads.fileName,
  uploadedAt: uploads.uploadedAt,
  outcome: uploads.outcome,
  sizeBytes: uploads.sizeBytes,
  rowCount: uploads.rowCount,
  committedAt: uploads.committedAt,
};

function summary(row: { id: string; fileName: string; uploadedAt: Date; outcome: UploadSummary["outcome"]; sizeBytes: number; rowCount: number; committedAt: Date | null }): UploadSummary {
  return { ...row, uploadedAt: iso(row.uploadedAt)!, committedAt: iso(row.committedAt) };
}

export function sha256Of(content: Uint8Array): string {
  return createHash("sha256").update(content).digest("hex");
}

export async function getImportSetup(context: FarmContext): Promise<ImportSetup> {
  const farm = farmOf(context);
  return withFarmContext(farm, async (tx) => {
    const codes = await tx.select({ code: strains.code }).from(strains).where(eq(strains.status, "active")).orderBy(strains.code);
    const [preferences] = await tx.select().from(farmImportPreferences).where(eq(farmImportPreferences.farmId, farm.farmId));
    const remembered: ParseChoices = {};
    if (preferences && Object.keys(preferences.columnMapping).length > 0) remembered.mapping = preferences.columnMapping;
    const unit = preferences?.defaultMassUnit;
    if (unit === "g" || unit === "kg" || unit === "lb" || unit === "oz") remembered.defaultMassUnit = unit;
    return { knownStrains: codes.map((row) => row.code), remembered };
  });
}

/** The co-op's active registry codes, so the downloadable template imports as it stands. */
export async function getTemplateCodes(context: FarmContext): Promise<TemplateCodes> {
  return withFarmContext(context, async (tx) => {
    const active = <T extends { code: string }>(rows: T[]) => rows.map((row) => row.code);
    return {
      strains: active(await tx.select({ code: strains.code }).from(strains).where(eq(strains.status, "active")).orderBy(strains.code)),
      substrates: active(await tx.select({ code: substrateRecipes.code }).from(substrateRecipes).where(eq(substrateRecipes.status, "active")).orderBy(substrateRecipes.code)),
      fruitingMethods: active(
        await tx
          .select({ code: treatments.code })
          .from(treatments)
          .where(and(eq(treatments.status, "active"), eq(treatments.kind, "fruiting_method")))
          .orderBy(treatments.code),
      ),
    };
  });
}

/** Parses bytes already in memory (a stored upload) with the grower's choices. */
export function parseStored(content: Uint8Array, setup: ImportSetup, choices: ParseChoices, extra: Partial<SeasonLogParserOptions> = {}): SeasonLogResult {
  const parser = createSeasonLogParser({ ...parserOptions(choices, setup.knownStrains), ...extra });
  const slice = 1024 * 1024;
  for (let start = 0; start < content.length; start += slice) parser.write(content.subarray(start, start + slice));
  return parser.end();
}

async function loadPlanInput(tx: Transaction, farmId: string): Promise<Omit<PlanInput, "records">> {
  // One after the other: a transaction's client runs one query at a time.
  const storedBlocks = await tx
    .select({
      id: blocks.id,
      code: blocks.code,
      strainId: blocks.strainId,
      substrateRecipeId: blocks.substrateRecipeId,
      fruitingMethodId: blocks.fruitingMethodId,
      trialArmId: blocks.trialArmId,
      inoculatedOn: blocks.inoculatedOn,
      wetMassG: blocks.wetMassG,
      moisture: blocks.moisture,
      contaminated: blocks.contaminated,
      contaminatedOn: blocks.contaminatedOn,
      spentMassG: blocks.spentMassG,
      notes: blocks.notes,
    })
    .from(blocks)
    .where(eq(blocks.farmId, farmId));
  const storedHarvests = await tx
    .select({ blockCode: blocks.code, flush: harvests.flush, harvestedOn: harvests.harvestedOn, freshMassG: harvests.freshMassG, dryMassG: harvests.dryMassG })
    .from(harvests)
    .innerJoin(blocks, eq(blocks.id, harvests.blockId))
    .where(eq(harvests.farmId, farmId));
  const strainRows = await tx.select({ id: strains.id, code: strains.code }).from(strains).where(eq(strains.status, "active"));
  const recipeRows = await tx.select({ id: substrateRecipes.id, code: substrateRecipes.code }).from(substrateRecipes).where(eq(substrateRecipes.status, "active"));
  const methodRows = await tx.select({ id: treatments.id, code: treatments.code }).from(treatments).where(and(eq(treatments.status, "active"), eq(treatments.kind, "fruiting_method")));
  const assignmentRows = await tx
    .select({ blockCode: trialBlockAssignments.blockCode, armId: trialArms.id, armLabel: trialArms.label, trialCode: trials.code, strainId: strains.id, strainCode: strains.code })
    .from(trialBlockAssignments)
    .innerJoin(trialArms, eq(trialArms.id, trialBlockAssignments.armId))
    .innerJoin(trials, eq(trials.id, trialBlockAssignments.trialId))
    .innerJoin(strains, eq(strains.id, trialArms.strainId))
    .where(eq(trialBlockAssignments.farmId, farmId));
  return { storedBlocks, storedHarvests, strains: strainRows, substrateRecipes: recipeRows, fruitingMethods: methodRows, assignments: assignmentRows };
}

async function committedBefore(tx: Transaction, farmId: string, sha256: string, except?: string): Promise<Date | null> {
  const rows = await tx
    .select({ committedAt: uploads.committedAt, id: uploads.id })
    .from(uploads)
    .where(and(eq(uploads.farmId, farmId), eq(uploads.sha256, sha256), eq(uploads.outcome, "committed")))
    .orderBy(uploads.committedAt)
    .limit(2);
  return rows.find((row) => row.id !== except)?.committedAt ?? null;
}

function viewOf(row: UploadSummary, report: UploadReport, alreadyImportedAt: Date | null): UploadView {
  return {
    upload: row,
    report,
    alreadyImportedAt: iso(alreadyImportedAt),
    canCommit: row.outcome === "received" && report.errorCount === 0 && alreadyImportedAt === null,
  };
}

function outcomeOf(report: UploadReport, alreadyImportedAt: Date | null): UploadSummary["outcome"] {
  if (alreadyImportedAt) return "already_imported";
  return report.errorCount > 0 ? "rejected" : "received";
}

/**
 * Keeps a file the farm sent, whatever is wrong with it, with its report and a preview of what
 * committing it would change. The same file committed before is marked and changes nothing.
 */
export async function createUpload(
  context: FarmContext,
  input: { fileName: string; content: Uint8Array; result: SeasonLogResult; choices: ParseChoices },
): Promise<UploadView> {
  const farm = farmOf(context);
  const sha256 = sha256Of(input.content);
  return withFarmContext(farm, async (tx) => {
    const alreadyImportedAt = await committedBefore(tx, farm.farmId, sha256);
    const plan = planCommit({ records: input.result.records, ...(await loadPlanInput(tx, farm.farmId)) });
    const report = buildReport({ rowCount: input.result.records.length, parserIssues: input.result.issues, plan, detected: input.result.detected, choices: input.choices });
    const [row] = await tx
      .insert(uploads)
      .values({
        farmId: farm.farmId,
        uploadedBy: farm.userId,
        fileName: input.fileName,
        content: Buffer.from(input.content.buffer, input.content.byteOffset, input.content.byteLength),
        sha256,
        sizeBytes: input.content.byteLength,
        outcome: outcomeOf(report, alreadyImportedAt),
        rowCount: report.rowCount,
        report,
        options: input.choices,
      })
      .returning(summaryColumns);
    await recordAudit(tx, {
      action: "season-log.uploaded",
      subject: input.fileName,
      farmId: farm.farmId,
      actorUserId: farm.userId,
      details: { uploadId: row.id, rows: report.rowCount, errors: report.errorCount, warnings: report.warningCount, alreadyImported: alreadyImportedAt !== null },
    });
    return viewOf(summary(row), report, alreadyImportedAt);
  });
}

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const notYours = "That upload is not one of your farm's. Pick it again from the list of past uploads.";

async function storedUpload(context: FarmMemberContext, uploadId: string) {
  if (!uuidPattern.test(uploadId)) throw new AppError("not_found", notYours);
  const [row] = await withFarmContext(context, (tx) =>
    tx.select({ ...summaryColumns, content: uploads.content, sha256: uploads.sha256, report: uploads.report }).from(uploads).where(eq(uploads.id, uploadId)),
  );
  if (!row) throw new AppError("not_found", notYours);
  return row;
}

async function rememberChoices(tx: Transaction, farmId: string, choices: ParseChoices): Promise<void> {
  if (!choices.mapping && !choices.defaultMassUnit) return;
  const values = { farmId, columnMapping: choices.mapping ?? {}, defaultMassUnit: choices.defaultMassUnit ?? null, updatedAt: new Date() };
  await tx.insert(farmImportPreferences).values(values).onConflictDoUpdate({ target: farmImportPreferences.farmId, set: values });
}

/** Reads a stored upload again with the grower's mapping and choices; remembers them for the farm. */
export async function recheckUpload(context: FarmContext, uploadId: string, choices: ParseChoices): Promise<UploadView> {
  const farm = farmOf(context);
  const stored = await storedUpload(farm, uploadId);
  if (stored.outcome === "committed") throw new AppError("conflict", "This upload is already committed. Upload the file again to check it against what is stored now.");
  const setup = await getImportSetup(farm);
  const result = parseStored(stored.content, setup, choices);
  return withFarmContext(farm, async (tx) => {
    const alreadyImportedAt = await committedBefore(tx, farm.farmId, stored.sha256, uploadId);
    const plan = planCommit({ records: result.records, ...(await loadPlanInput(tx, farm.farmId)) });
    const report = buildReport({ rowCount: result.records.length, parserIssues: result.issues, plan, detected: result.detected, choices });
    const [row] = await tx
      .update(uploads)
      .set({ report, options: choices, rowCount: report.rowCount, outcome: outcomeOf(report, alreadyImportedAt) })
      .where(eq(uploads.id, uploadId))
      .returning(summaryColumns);
    await rememberChoices(tx, farm.farmId, choices);
    return viewOf(summary(row), report, alreadyImportedAt);
  });
}

const writeSlice = 20_000;
// Each column goes as one array parameter (sql.param), so unnest takes any number of rows in one statement.

async function writePlan(tx: Transaction, farmId: string, userId: string, uploadId: string, plan: CommitPlan): Promise<void> {
  for (let start = 0; start < plan.blocks.length; start += writeSlice) {
    const part = plan.blocks.slice(start, start + writeSlice);
    const column = <K extends keyof (typeof part)[number]>(name: K) => sql.param(part.map((block) => block[name]));
    await tx.execute(sql`
      insert into blocks (farm_id, code, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, inoculated_on,
        wet_mass_g, wet_mass_as_written, wet_mass_unit, moisture, contaminated, contaminated_on,
        spent_mass_g, spent_mass_as_written, spent_mass_unit, notes, last_upload_id)
      select ${farmId}::uuid, u.*, ${uploadId}::uuid from unnest(
        ${column("code")}::text[], ${column("strainId")}::uuid[], ${column("substrateRecipeId")}::uuid[], ${column("fruitingMethodId")}::uuid[],
        ${column("trialArmId")}::uuid[], ${column("inoculatedOn")}::date[], ${column("wetMassG")}::numeric[], ${column("wetMassAsWritten")}::text[],
        ${column("wetMassUnit")}::text[], ${column("moisture")}::numeric[], ${column("contaminated")}::boolean[], ${column("contaminatedOn")}::date[],
        ${column("spentMassG")}::numeric[], ${column("spentMassAsWritten")}::text[], ${column("spentMassUnit")}::text[], ${column("notes")}::text[]
      ) as u
      on conflict (farm_id, code) do update set
        strain_id = excluded.strain_id, substrate_recipe_id = excluded.substrate_recipe_id, fruiting_method_id = excluded.fruiting_method_id,
        trial_arm_id = excluded.trial_arm_id, inoculated_on = excluded.inoculated_on,
        wet_mass_g = excluded.wet_mass_g,
        wet_mass_as_written = coalesce(excluded.wet_mass_as_written, blocks.wet_mass_as_written),
        wet_mass_unit = coalesce(excluded.wet_mass_unit, blocks.wet_mass_unit),
        moisture = excluded.moisture, contaminated = excluded.contaminated, contaminated_on = excluded.contaminated_on,
        spent_mass_g = excluded.spent_mass_g,
        spent_mass_as_written = coalesce(excluded.spent_mass_as_written, blocks.spent_mass_as_written),
        spent_mass_unit = coalesce(excluded.spent_mass_unit, blocks.spent_mass_unit),
        notes = excluded.notes, last_upload_id = excluded.last_upload_id, updated_at = now()`);
  }
  for (let start = 0; start < plan.harvests.length; start += writeSlice) {
    const part = plan.harvests.slice(start, start + writeSlice);
    const column = <K extends keyof (typeof part)[number]>(name: K) => sql.param(part.map((harvest) => harvest[name]));
    await tx.execute(sql`
      insert into harvests (farm_id, block_id, flush, harvested_on, fresh_mass_g, fresh_mass_as_written, fresh_mass_unit,
        dry_mass_g, dry_mass_as_written, dry_mass_unit, upload_id)
      select ${farmId}::uuid, b.id, u.flush, u.harvested_on, u.fresh, u.fresh_written, u.fresh_unit, u.dry, u.dry_written, u.dry_unit, ${uploadId}::uuid
      from unnest(
        ${column("blockCode")}::text[], ${column("flush")}::integer[], ${column("harvestedOn")}::date[], ${column("freshMassG")}::numeric[],
        ${column("freshMassAsWritten")}::text[], ${column("freshMassUnit")}::text[], ${column("dryMassG")}::numeric[],
        ${column("dryMassAsWritten")}::text[], ${column("dryMassUnit")}::text[]
      ) as u(code, flush, harvested_on, fresh, fresh_written, fresh_unit, dry, dry_written, dry_unit)
      join blocks b on b.farm_id = ${farmId}::uuid and b.code = u.code
      on conflict (block_id, flush) do update set
        harvested_on = excluded.harvested_on, fresh_mass_g = excluded.fresh_mass_g,
        fresh_mass_as_written = excluded.fresh_mass_as_written, fresh_mass_unit = excluded.fresh_mass_unit,
        dry_mass_g = excluded.dry_mass_g,
        dry_mass_as_written = coalesce(excluded.dry_mass_as_written, harvests.dry_mass_as_written),
        dry_mass_unit = coalesce(excluded.dry_mass_unit, harvests.dry_mass_unit),
        upload_id = excluded.upload_id, updated_at = now()`);
  }
  for (let start = 0; start < plan.changes.length; start += writeSlice) {
    const part = plan.changes.slice(start, start + writeSlice);
    const column = <K extends keyof (typeof part)[number]>(name: K) => sql.param(part.map((change) => change[name]));
    await tx.execute(sql`
      insert into value_changes (farm_id, block_id, flush, field, old_value, new_value, upload_id, changed_by)
      select ${farmId}::uuid, b.id, u.flush, u.field, u.old_value, u.new_value, ${uploadId}::uuid, ${userId}::uuid
      from unnest(${column("blockCode")}::text[], ${column("flush")}::integer[], ${column("field")}::text[], ${column("oldValue")}::text[], ${column("newValue")}::text[])
        as u(code, flush, field, old_value, new_value)
      join blocks b on b.farm_id = ${farmId}::uuid and b.code = u.code`);
  }
}

/**
 * Commits a stored upload: reads its bytes again with the chosen options and, in one
 * transaction under the farm's lock, upserts blocks and harvests, keeps every replaced value
 * as history, and marks the upload committed. Any error leaves the farm's data as it was.
 */
export async function commitUpload(context: FarmContext, uploadId: string, choices: ParseChoices): Promise<CommitReceipt> {
  const farm = farmOf(context);
  const stored = await storedUpload(farm, uploadId);
  if (stored.outcome === "committed") throw new AppError("conflict", `This upload was committed on ${iso(stored.committedAt)?.slice(0, 10)}; nothing more to do.`);
  const setup = await getImportSetup(farm);
  const result = parseStored(stored.content, setup, choices);
  const receipt = await withFarmContext(farm, async (tx) => {
    // Two commits for one farm run one after the other, so overlapping sheets end as if sent in turn.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`season-log:${farm.farmId}`}, 0))`);
    const alreadyImportedAt = await committedBefore(tx, farm.farmId, stored.sha256, uploadId);
    if (alreadyImportedAt) {
      throw new AppError("conflict", `This file was already imported on ${iso(alreadyImportedAt)!.slice(0, 10)}; committing it again would change nothing.`);
    }
    const plan = planCommit({ records: result.records, ...(await loadPlanInput(tx, farm.farmId)) });
    const report = buildReport({ rowCount: result.records.length, parserIssues: result.issues, plan, detected: result.detected, choices });
    if (report.errorCount > 0) {
      const first = report.issues.find((issue) => issue.severity === "error");
      throw new AppError("invalid_input", `The file still has ${report.errorCount} error${report.errorCount === 1 ? "" : "s"}, so nothing was saved. First: ${first?.message ?? ""} Correct the file or the mapping and check it again.`);
    }
    await writePlan(tx, farm.farmId, farm.userId, uploadId, plan);
    const [row] = await tx
      .update(uploads)
      .set({ outcome: "committed", committedAt: new Date(), report, options: choices, rowCount: report.rowCount })
      .where(eq(uploads.id, uploadId))
      .returning({ committedAt: uploads.committedAt, fileName: uploads.fileName });
    await rememberChoices(tx, farm.farmId, choices);
    await recordAudit(tx, {
      action: "season-log.committed",
      subject: row.fileName,
      farmId: farm.farmId,
      actorUserId: farm.userId,
      details: { uploadId, ...plan.counts, changedValues: plan.changes.length },
    });
    return { uploadId, fileName: row.fileName, committedAt: iso(row.committedAt)!, counts: plan.counts, changedValues: plan.changes.length };
  });
  void refreshPooledStatistics(farm.farmId).catch((error: unknown) => console.error("Refreshing pooled statistics failed", error));
  return receipt;
}

export async function listUploads(context: FarmContext): Promise<UploadSummary[]> {
  const farm = farmOf(context);
  const rows = await withFarmContext(farm, (tx) => tx.select(summaryColumns).from(uploads).where(eq(uploads.farmId, farm.farmId)).orderBy(desc(uploads.uploadedAt)).limit(200));
  return rows.map(summary);
}

export async function getUploadView(context: FarmContext, uploadId: string): Promise<UploadView> {
  const farm = farmOf(context);
  const stored = await storedUpload(farm, uploadId);
  const alreadyImportedAt = stored.outcome === "already_imported" ? await withFarmContext(farm, (tx) => committedBefore(tx, farm.farmId, stored.sha256, uploadId)) : null;
  return viewOf(summary(stored), stored.report as UploadReport, alreadyImportedAt);
}

export async function getUploadFile(context: FarmContext, uploadId: string): Promise<{ fileName: string; content: Buffer }> {
  const stored = await storedUpload(farmOf(context), uploadId);
  return { fileName: stored.fileName, content: stored.content };
}
