import "server-only";
import { createHash, randomFillSync, randomInt } from "node:crypto";
import { gunzipSync, gzipSync } from "node:zlib";
import { and, desc, eq, isNull, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { v7 as timeOrderedId } from "uuid";
import { copyInto, type Transaction } from "@/db/client";
import {
  blocks,
  farmImportPreferences,
  harvests,
  strains,
  substrateRecipes,
  treatments,
  trialArms,
  trialBlockAssignments,
  trials,
  uploads,
} from "@/db/schema";
import {
  createSeasonLogParser,
  parseWorkbook,
  type SeasonLogParserOptions,
  type SeasonLogResult,
  type TemplateCodes,
  workbookKind,
} from "@/lib/import";
import { AppError } from "@/lib/errors";
import type { RegisterEntryText } from "@/lib/import/registers";
import { actor, recordAudit } from "@/lib/data/audit";
import { queuePooledRefresh } from "@/lib/data/pooled-refresh";
import { assertStorageRoom } from "@/lib/data/upload-limits";
import {
  type BlockWrite,
  type CommitPlan,
  type HarvestWrite,
  type PlanCounts,
  type PlanInput,
  type StoredHarvest,
  planCommit,
  withNotInFileRemoved,
} from "@/lib/season-logs/plan";
import { type ParseChoices, type UploadReport, buildReport, parserOptions } from "@/lib/season-logs/report";
import { copyChunks } from "@/lib/season-logs/copy-text";
import { seasonLogExportCsv } from "@/lib/season-logs/export";
import { packParse, stagingKey, unpackParse } from "@/lib/season-logs/staged";
import { todayUtc } from "@/lib/import/dates";
import type { Member } from "./members";
import { asMember, farmOf } from "./context";

export interface UploadSummary {
  id: string;
  fileName: string;
  uploadedAt: string;
  outcome: "received" | "rejected" | "committed" | "already_imported";
  sizeBytes: number;
  rowCount: number;
  committedAt: string | null;
  /** When the commit was undone (lib/data/corrections.ts); null while it stands. */
  undoneAt: string | null;
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
  /** Stored harvests of the file's blocks that the file did not have, removed as the grower chose. */
  removedHarvests: number;
}

/** What the parser needs from the database before a file streams in. */
export interface ImportSetup {
  /** The co-op's active strains: a file may name one by its code or its name. */
  knownStrains: RegisterEntryText[];
  remembered: ParseChoices;
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
  undoneAt: uploads.undoneAt,
};

function summary(row: {
  id: string;
  fileName: string;
  uploadedAt: Date;
  outcome: UploadSummary["outcome"];
  sizeBytes: number;
  rowCount: number;
  committedAt: Date | null;
  undoneAt: Date | null;
}): UploadSummary {
  return { ...row, uploadedAt: iso(row.uploadedAt)!, committedAt: iso(row.committedAt), undoneAt: iso(row.undoneAt) };
}

export function sha256Of(content: Uint8Array): string {
  return createHash("sha256").update(content).digest("hex");
}

export async function getImportSetup(member: Member): Promise<ImportSetup> {
  const farm = farmOf(member, "work with its season logs");
  return asMember(member, async (tx) => {
    const codes = await tx
      .select({ code: strains.code, name: strains.name })
      .from(strains)
      .where(eq(strains.status, "active"))
      .orderBy(strains.code);
    const [preferences] = await tx.select().from(farmImportPreferences).where(eq(farmImportPreferences.farmId, farm.farmId));
    const remembered: ParseChoices = {};
    if (preferences && Object.keys(preferences.columnMapping).length > 0) remembered.mapping = preferences.columnMapping;
    const unit = preferences?.defaultMassUnit;
    if (unit === "g" || unit === "kg" || unit === "lb" || unit === "oz") remembered.defaultMassUnit = unit;
    return { knownStrains: codes.map((row) => ({ code: row.code, names: [row.name] })), remembered };
  });
}

/** The co-op's active registry codes, so the downloadable template imports as it stands. */
export async function getTemplateCodes(member: Member): Promise<TemplateCodes> {
  return asMember(member, async (tx) => {
    const active = <T extends { code: string }>(rows: T[]) => rows.map((row) => row.code);
    return {
      strains: active(await tx.select({ code: strains.code }).from(strains).where(eq(strains.status, "active")).orderBy(strains.code)),
      substrates: active(
        await tx
          .select({ code: substrateRecipes.code })
          .from(substrateRecipes)
          .where(eq(substrateRecipes.status, "active"))
          .orderBy(substrateRecipes.code),
      ),
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

/** Parses bytes already in memory (a stored upload, CSV or a spreadsheet file) with the grower's choices. */
export async function parseStored(
  content: Uint8Array,
  setup: ImportSetup,
  choices: ParseChoices,
  extra: Partial<SeasonLogParserOptions> = {},
): Promise<SeasonLogResult> {
  const kind = workbookKind(content);
  if (kind !== null) return parseWorkbook(content, kind, { ...parserOptions(choices, setup.knownStrains), ...extra });
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
  // Joined to block codes here rather than in SQL: right after a large commit the planner's
  // statistics still say the tables are small, and it joined 100 000 harvests by nested loop.
  const codeOfBlock = new Map(storedBlocks.map((block) => [block.id, block.code]));
  const harvestRows = await tx
    .select({
      id: harvests.id,
      blockId: harvests.blockId,
      flush: harvests.flush,
      harvestedOn: harvests.harvestedOn,
      freshMassG: harvests.freshMassG,
      dryMassG: harvests.dryMassG,
      fromFile: sql<boolean>`${harvests.uploadId} is not null`,
    })
    .from(harvests)
    .where(eq(harvests.farmId, farmId));
  const storedHarvests = harvestRows.map(({ blockId, ...harvest }) => ({ ...harvest, blockCode: codeOfBlock.get(blockId) ?? "" }));
  // A file may name a register entry by its code or its name.
  const named = <T extends { name: string }>(rows: T[]) => rows.map(({ name, ...row }) => ({ ...row, names: [name] }));
  const strainRows = named(
    await tx.select({ id: strains.id, code: strains.code, name: strains.name }).from(strains).where(eq(strains.status, "active")),
  );
  const recipeRows = named(
    await tx
      .select({ id: substrateRecipes.id, code: substrateRecipes.code, name: substrateRecipes.name })
      .from(substrateRecipes)
      .where(eq(substrateRecipes.status, "active")),
  );
  const methodRows = named(
    await tx
      .select({ id: treatments.id, code: treatments.code, name: treatments.name })
      .from(treatments)
      .where(and(eq(treatments.status, "active"), eq(treatments.kind, "fruiting_method"))),
  );
  const armMethods = alias(treatments, "arm_methods");
  const assignmentRows = await tx
    .select({
      blockCode: trialBlockAssignments.blockCode,
      armId: trialArms.id,
      armLabel: trialArms.label,
      trialCode: trials.code,
      trialTitle: trials.title,
      strainId: strains.id,
      strainCode: strains.code,
      methodId: armMethods.id,
      methodCode: armMethods.code,
      methodName: armMethods.name,
    })
    .from(trialBlockAssignments)
    .innerJoin(trialArms, eq(trialArms.id, trialBlockAssignments.armId))
    .innerJoin(trials, eq(trials.id, trialBlockAssignments.trialId))
    .innerJoin(strains, eq(strains.id, trialArms.strainId))
    // Only a fruiting method is a season-log column; an arm that varies humidity fixes no fruiting method.
    .leftJoin(armMethods, and(eq(armMethods.id, trialArms.treatmentId), eq(armMethods.kind, "fruiting_method")))
    .where(eq(trialBlockAssignments.farmId, farmId));
  const assignments = assignmentRows.map(({ methodId, methodCode, methodName, ...row }) => ({
    ...row,
    fruitingMethod: methodId && methodCode && methodName ? { id: methodId, code: methodCode, name: methodName } : null,
  }));
  return {
    storedBlocks,
    storedHarvests,
    strains: strainRows,
    substrateRecipes: recipeRows,
    fruitingMethods: methodRows,
    assignments,
  };
}

async function committedBefore(tx: Transaction, farmId: string, sha256: string, except?: string): Promise<Date | null> {
  const rows = await tx
    .select({ committedAt: uploads.committedAt, id: uploads.id })
    .from(uploads)
    // An undone commit no longer counts: the same file may be committed again.
    .where(and(eq(uploads.farmId, farmId), eq(uploads.sha256, sha256), eq(uploads.outcome, "committed"), isNull(uploads.undoneAt)))
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
 * The parse kept with an upload that can be committed, so the commit need not read the file
 * again: packed, then gzip (under a third of the packed size, so cheaper to store and read
 * back), as base64 text.
 */
function stagedParseOf(
  outcome: UploadSummary["outcome"],
  choices: ParseChoices,
  knownStrains: readonly RegisterEntryText[],
  result: SeasonLogResult,
): string | null {
  if (outcome !== "received") return null;
  return gzipSync(packParse(stagingKey(choices, knownStrains, todayUtc()), result), { level: 1 }).toString("base64");
}

/** A parse's report, outcome and staged parse against what the farm has stored: one short read, then CPU work with no connection held. */
async function previewOf(member: Member, sha256: string, result: SeasonLogResult, choices: ParseChoices, except?: string) {
  const farm = farmOf(member, "work with its season logs");
  const { alreadyImportedAt, planInput } = await asMember(member, async (tx) => ({
    alreadyImportedAt: await committedBefore(tx, farm.farmId, sha256, except),
    planInput: await loadPlanInput(tx, farm.farmId),
  }));
  // A preview only: the commit plans again under the farm's lock against what is stored then.
  const plan = planCommit({ records: result.records, ...planInput });
  const report = buildReport({
    rowCount: result.records.length,
    parserIssues: result.issues,
    plan,
    detected: result.detected,
    choices,
  });
  const outcome = outcomeOf(report, alreadyImportedAt);
  const stagedParse = stagedParseOf(
    outcome,
    choices,
    planInput.strains.map((strain) => ({ code: strain.code, names: strain.names })),
    result,
  );
  return { alreadyImportedAt, report, outcome, stagedParse };
}

/**
 * Keeps a file the farm sent, whatever is wrong with it, with its report and a preview of what
 * committing it would change. The same file committed before is marked and changes nothing.
 * Refused when the farm's stored files would pass the co-op's limit (lib/data/upload-limits.ts).
 */
export async function createUpload(
  member: Member,
  input: { fileName: string; content: Uint8Array; result: SeasonLogResult; choices: ParseChoices },
): Promise<UploadView> {
  const farm = farmOf(member, "work with its season logs");
  const sha256 = sha256Of(input.content);
  const { alreadyImportedAt, report, outcome, stagedParse } = await previewOf(member, sha256, input.result, input.choices);
  return asMember(member, async (tx) => {
    await assertStorageRoom(tx, farm.farmId, input.content.byteLength);
    const [row] = await tx
      .insert(uploads)
      .values({
        farmId: farm.farmId,
        uploadedBy: farm.userId,
        fileName: input.fileName,
        content: Buffer.from(input.content.buffer, input.content.byteOffset, input.content.byteLength),
        sha256,
        sizeBytes: input.content.byteLength,
        outcome,
        rowCount: report.rowCount,
        report,
        options: input.choices,
        stagedParse,
      })
      .returning(summaryColumns);
    await recordAudit(tx, {
      action: "season-log.uploaded",
      subject: input.fileName,
      farmId: farm.farmId,
      ...actor(member),
      details: {
        uploadId: row.id,
        rows: report.rowCount,
        errors: report.errorCount,
        warnings: report.warningCount,
        alreadyImported: alreadyImportedAt !== null,
      },
    });
    return viewOf(summary(row), report, alreadyImportedAt);
  });
}

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export const uploadNotFound = "That upload is not one of your farm's. Pick it again from the list of past uploads.";

async function storedUpload(member: Member, uploadId: string) {
  farmOf(member, "work with its season logs");
  if (!uuidPattern.test(uploadId)) throw new AppError("not_found", uploadNotFound);
  const [row] = await asMember(member, (tx) =>
    tx
      .select({ ...summaryColumns, sha256: uploads.sha256, report: uploads.report })
      .from(uploads)
      .where(eq(uploads.id, uploadId)),
  );
  if (!row) throw new AppError("not_found", uploadNotFound);
  return row;
}

/** The file's bytes, read only when they are needed: they can be tens of megabytes. */
async function storedContent(member: Member, uploadId: string): Promise<Buffer> {
  const [row] = await asMember(member, (tx) =>
    tx.select({ content: uploads.content, filePurgedAt: uploads.filePurgedAt }).from(uploads).where(eq(uploads.id, uploadId)),
  );
  if (!row) throw new AppError("not_found", uploadNotFound);
  if (row.filePurgedAt)
    throw new AppError(
      "not_found",
      "This upload was rejected, and its file was removed after the co-op's retention period; its report is kept. Upload the file again to check it.",
    );
  return row.content;
}

async function rememberChoices(tx: Transaction, farmId: string, choices: ParseChoices): Promise<void> {
  if (!choices.mapping && !choices.defaultMassUnit) return;
  const values = { farmId, columnMapping: choices.mapping ?? {}, defaultMassUnit: choices.defaultMassUnit ?? null, updatedAt: new Date() };
  await tx.insert(farmImportPreferences).values(values).onConflictDoUpdate({ target: farmImportPreferences.farmId, set: values });
}

/** Reads a stored upload again with the grower's mapping and choices; remembers them for the farm. */
export async function recheckUpload(member: Member, uploadId: string, choices: ParseChoices): Promise<UploadView> {
  const farm = farmOf(member, "work with its season logs");
  const stored = await storedUpload(member, uploadId);
  if (stored.outcome === "committed")
    throw new AppError("conflict", "This upload is already committed. Upload the file again to check it against what is stored now.");
  const setup = await getImportSetup(member);
  const result = await parseStored(await storedContent(member, uploadId), setup, choices);
  const { alreadyImportedAt, report, outcome, stagedParse } = await previewOf(member, stored.sha256, result, choices, uploadId);
  return asMember(member, async (tx) => {
    const [row] = await tx
      .update(uploads)
      .set({ report, options: choices, rowCount: report.rowCount, outcome, stagedParse })
      .where(eq(uploads.id, uploadId))
      .returning(summaryColumns);
    await rememberChoices(tx, farm.farmId, choices);
    return viewOf(summary(row), report, alreadyImportedAt);
  });
}

/**
 * The upload's staged parse when it was made with these choices, today's strain register and
 * today's date (so it equals a fresh parse); otherwise the stored file, read again.
 */
async function parseForCommit(member: Member, uploadId: string, setup: ImportSetup, choices: ParseChoices): Promise<SeasonLogResult> {
  const [row] = await asMember(member, (tx) =>
    tx.select({ stagedParse: uploads.stagedParse }).from(uploads).where(eq(uploads.id, uploadId)),
  );
  const packed = row?.stagedParse ? gunzipSync(Buffer.from(row.stagedParse, "base64")).toString("utf8") : null;
  const staged = packed ? unpackParse(packed, stagingKey(choices, setup.knownStrains, todayUtc())) : null;
  return staged ?? (await parseStored(await storedContent(member, uploadId), setup, choices));
}

/**
 * The commit's rows are staged in temporary tables that vanish at the end of the transaction
 * (`on commit drop`, a rollback drops them too), filled by COPY, then written with one set-based
 * statement per table. COPY reads rows several times faster than any INSERT's parameters or JSON,
 * and one statement per table lets PostgreSQL check the keys of all rows in one pass of its
 * triggers. The names are schema-qualified: pg_temp is searched last (db/client.ts).
 */
const stagedBlocks = `create temporary table commit_blocks (is_new boolean not null, id uuid not null, code text not null,
  strain_id uuid, substrate_recipe_id uuid, fruiting_method_id uuid, trial_arm_id uuid, inoculated_on date,
  wet_mass_g numeric, wet_mass_as_written text, wet_mass_unit text, moisture numeric, contaminated boolean, contaminated_on date,
  spent_mass_g numeric, spent_mass_as_written text, spent_mass_unit text, notes text) on commit drop`;
const stagedHarvests = `create temporary table commit_harvests (is_new boolean not null, id uuid not null, block_id uuid not null, flush integer,
  harvested_on date, fresh_mass_g numeric, fresh_mass_as_written text, fresh_mass_unit text,
  dry_mass_g numeric, dry_mass_as_written text, dry_mass_unit text) on commit drop`;
const stagedChanges = `create temporary table commit_value_changes (block_id uuid not null, flush integer, field text not null,
  old_value text, new_value text) on commit drop`;

/**
 * Time-ordered ids (UUIDv7) for one commit's new rows: the commit's millisecond, then a counter
 * from a random start, so they sort in the order made. Random bits come from one buffer filled
 * at a time: the package's default asks the system for 16 random bytes per id, 20 times slower.
 */
function idsInOrder(): () => string {
  const msecs = Date.now();
  const random = new Uint8Array(16 * 1024);
  let seq = randomInt(2 ** 30);
  let used = random.length;
  return () => {
    if (used === random.length) {
      randomFillSync(random);
      used = 0;
    }
    used += 16;
    return timeOrderedId({ msecs, seq: seq++, random: random.subarray(used - 16, used) });
  };
}

function refuseIfChanged(updated: number | null, expected: number): void {
  if (updated !== expected)
    throw new AppError(
      "conflict",
      "The farm's blocks changed while the file was being committed, so nothing was saved. Check the file again and commit it.",
    );
}

/** Copies the stored rows a commit is about to update or remove, whole, so undoing it puts them back exactly (lib/data/corrections.ts). */
async function keepReplacedRows(tx: Transaction, uploadId: string, kind: "block" | "harvest" | "removed_harvest", rows: SQL) {
  await tx.execute(sql`
    insert into season_log_replaced_rows (farm_id, upload_id, row_kind, row_id, before)
    select r.farm_id, ${uploadId}::uuid, ${kind}, r.id, to_jsonb(r) from (${rows}) r`);
}

/**
 * Writes the plan: new rows inserted and changed ones updated by id, each table's rows staged by
 * COPY and written by one statement, as rhizo_app under row-level security. The plan was made
 * under the farm's lock, so it knows which rows are new. New rows get their ids here: their
 * harvests need no look-up by block code, and time-ordered ids (UUIDv7) land at the end of the
 * indexes instead of on random pages, which makes writing many harvests far cheaper.
 */
async function writePlan(
  tx: Transaction,
  farmId: string,
  userId: string,
  uploadId: string,
  plan: CommitPlan & { removedHarvests?: readonly StoredHarvest[] },
): Promise<void> {
  const nextId = idsInOrder();
  const blockIds = new Map<string, string>();
  let changedBlocks = 0;
  const isNew = new Set<object>();
  for (const block of plan.blocks) {
    if (block.id === null) isNew.add(block);
    else changedBlocks++;
    // The plan is this commit's own, so its rows take their ids in place rather than as copies.
    block.id ??= nextId();
    blockIds.set(block.code, block.id);
  }
  let changedHarvests = 0;
  for (const harvest of plan.harvests) {
    if (harvest.blockId === null) {
      const blockId = blockIds.get(harvest.blockCode);
      if (blockId === undefined) throw new Error(`the plan has a harvest of block ${harvest.blockCode} but not the block`);
      harvest.blockId = blockId;
    } else blockIds.set(harvest.blockCode, harvest.blockId);
    if (harvest.id === null) isNew.add(harvest);
    else changedHarvests++;
    harvest.id ??= nextId();
  }

  if (plan.blocks.length > 0) {
    await tx.execute(sql.raw(stagedBlocks));
    await copyInto(
      tx,
      "copy pg_temp.commit_blocks from stdin",
      copyChunks(plan.blocks, (b: BlockWrite) => [
        isNew.has(b),
        b.id,
        b.code,
        b.strainId,
        b.substrateRecipeId,
        b.fruitingMethodId,
        b.trialArmId,
        b.inoculatedOn,
        b.wetMassG,
        b.wetMassAsWritten,
        b.wetMassUnit,
        b.moisture,
        b.contaminated,
        b.contaminatedOn,
        b.spentMassG,
        b.spentMassAsWritten,
        b.spentMassUnit,
        b.notes,
      ]),
    );
    if (plan.blocks.length > changedBlocks) {
      await tx.execute(sql`
        insert into blocks (id, farm_id, code, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, inoculated_on,
          wet_mass_g, wet_mass_as_written, wet_mass_unit, moisture, contaminated, contaminated_on,
          spent_mass_g, spent_mass_as_written, spent_mass_unit, notes, last_upload_id)
        select id, ${farmId}::uuid, code, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, inoculated_on,
          wet_mass_g, wet_mass_as_written, wet_mass_unit, moisture, contaminated, contaminated_on,
          spent_mass_g, spent_mass_as_written, spent_mass_unit, notes, ${uploadId}::uuid
        from pg_temp.commit_blocks where is_new`);
    }
    if (changedBlocks > 0) {
      await keepReplacedRows(
        tx,
        uploadId,
        "block",
        sql`select b.* from blocks b join pg_temp.commit_blocks u on u.id = b.id and not u.is_new`,
      );
      const updated = await tx.execute(sql`
        update blocks b set
          strain_id = u.strain_id, substrate_recipe_id = u.substrate_recipe_id, fruiting_method_id = u.fruiting_method_id,
          trial_arm_id = u.trial_arm_id, inoculated_on = u.inoculated_on, wet_mass_g = u.wet_mass_g,
          wet_mass_as_written = coalesce(u.wet_mass_as_written, b.wet_mass_as_written), wet_mass_unit = coalesce(u.wet_mass_unit, b.wet_mass_unit),
          moisture = u.moisture, contaminated = u.contaminated, contaminated_on = u.contaminated_on, spent_mass_g = u.spent_mass_g,
          spent_mass_as_written = coalesce(u.spent_mass_as_written, b.spent_mass_as_written), spent_mass_unit = coalesce(u.spent_mass_unit, b.spent_mass_unit),
          notes = u.notes, last_upload_id = ${uploadId}::uuid, updated_at = now()
        from pg_temp.commit_blocks u
        where b.id = u.id and not u.is_new`);
      refuseIfChanged(updated.rowCount, changedBlocks);
    }
  }

  if (plan.harvests.length > 0) {
    await tx.execute(sql.raw(stagedHarvests));
    await copyInto(
      tx,
      "copy pg_temp.commit_harvests from stdin",
      copyChunks(plan.harvests, (h: HarvestWrite) => [
        isNew.has(h),
        h.id,
        h.blockId,
        h.flush,
        h.harvestedOn,
        h.freshMassG,
        h.freshMassAsWritten,
        h.freshMassUnit,
        h.dryMassG,
        h.dryMassAsWritten,
        h.dryMassUnit,
      ]),
    );
    if (plan.harvests.length > changedHarvests) {
      await tx.execute(sql`
        insert into harvests (id, farm_id, block_id, flush, harvested_on, fresh_mass_g, fresh_mass_as_written, fresh_mass_unit,
          dry_mass_g, dry_mass_as_written, dry_mass_unit, upload_id)
        select id, ${farmId}::uuid, block_id, flush, harvested_on, fresh_mass_g, fresh_mass_as_written, fresh_mass_unit,
          dry_mass_g, dry_mass_as_written, dry_mass_unit, ${uploadId}::uuid
        from pg_temp.commit_harvests where is_new`);
    }
    if (changedHarvests > 0) {
      await keepReplacedRows(
        tx,
        uploadId,
        "harvest",
        sql`select h.* from harvests h join pg_temp.commit_harvests u on u.id = h.id and not u.is_new`,
      );
      const updated = await tx.execute(sql`
        update harvests h set
          harvested_on = u.harvested_on, fresh_mass_g = u.fresh_mass_g, fresh_mass_as_written = u.fresh_mass_as_written,
          fresh_mass_unit = u.fresh_mass_unit, dry_mass_g = u.dry_mass_g,
          dry_mass_as_written = coalesce(u.dry_mass_as_written, h.dry_mass_as_written), dry_mass_unit = coalesce(u.dry_mass_unit, h.dry_mass_unit),
          upload_id = ${uploadId}::uuid, updated_at = now(),
          -- The file's values replace what a grower saved anyway: its warnings were about the old values.
          accepted_warnings = null
        from pg_temp.commit_harvests u
        where h.id = u.id and not u.is_new`);
      refuseIfChanged(updated.rowCount, changedHarvests);
    }
  }

  // Removed only when the grower chose so; kept whole, so undoing the commit puts them back.
  const removedHarvests = plan.removedHarvests ?? [];
  if (removedHarvests.length > 0) {
    const ids = JSON.stringify(removedHarvests.map((harvest) => harvest.id));
    const chosen = sql`h.id in (select value::uuid from json_array_elements_text(${ids}::json))`;
    await keepReplacedRows(tx, uploadId, "removed_harvest", sql`select h.* from harvests h where ${chosen}`);
    const removed = await tx.execute(sql`delete from harvests h where ${chosen}`);
    refuseIfChanged(removed.rowCount, removedHarvests.length);
    // A removed harvest's block may be one the plan leaves untouched: its history needs the block's id.
    const stored = await tx.select({ id: blocks.id, code: blocks.code }).from(blocks).where(eq(blocks.farmId, farmId));
    for (const row of stored) if (!blockIds.has(row.code)) blockIds.set(row.code, row.id);
  }

  if (plan.changes.length > 0) {
    await tx.execute(sql.raw(stagedChanges));
    // Every change is of a block or harvest the plan writes or removes, so its block id is known.
    await copyInto(
      tx,
      "copy pg_temp.commit_value_changes from stdin",
      copyChunks(plan.changes, (change) => [blockIds.get(change.blockCode), change.flush, change.field, change.oldValue, change.newValue]),
    );
    await tx.execute(sql`
      insert into value_changes (farm_id, block_id, flush, field, old_value, new_value, upload_id, changed_by)
      select ${farmId}::uuid, block_id, flush, field, old_value, new_value, ${uploadId}::uuid, ${userId}::uuid
      from pg_temp.commit_value_changes`);
  }
}

/**
 * Commits a stored upload: takes its staged parse (or reads the file again when the choices
 * changed) and, in one transaction under the farm's lock, plans against what is stored,
 * inserts new blocks and harvests, updates changed ones, keeps every replaced value as history,
 * marks the upload committed and queues the farm's pooled refresh (the job runs after the commit).
 * Any error leaves the farm's data as it was.
 */
export async function commitUpload(
  member: Member,
  uploadId: string,
  choices: ParseChoices,
  { removeNotInFile = false }: { removeNotInFile?: boolean } = {},
): Promise<CommitReceipt> {
  const farm = farmOf(member, "work with its season logs");
  const stored = await storedUpload(member, uploadId);
  if (stored.outcome === "committed")
    throw new AppError("conflict", `This upload was committed on ${iso(stored.committedAt)?.slice(0, 10)}; nothing more to do.`);
  const setup = await getImportSetup(member);
  const result = await parseForCommit(member, uploadId, setup, choices);
  const receipt = await asMember(member, async (tx) => {
    // Two commits for one farm run one after the other, so overlapping sheets end as if sent in turn.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`season-log:${farm.farmId}`}, 0))`);
    const alreadyImportedAt = await committedBefore(tx, farm.farmId, stored.sha256, uploadId);
    if (alreadyImportedAt) {
      throw new AppError(
        "conflict",
        `This file was already imported on ${iso(alreadyImportedAt)!.slice(0, 10)}; committing it again would change nothing.`,
      );
    }
    const planned = planCommit({ records: result.records, ...(await loadPlanInput(tx, farm.farmId)) });
    const plan = removeNotInFile ? withNotInFileRemoved(planned) : { ...planned, removedHarvests: [] };
    const report = buildReport({
      rowCount: result.records.length,
      parserIssues: result.issues,
      plan,
      detected: result.detected,
      choices,
    });
    if (report.errorCount > 0) {
      const first = report.issues.find((issue) => issue.severity === "error");
      throw new AppError(
        "invalid_input",
        `The file still has ${report.errorCount} error${report.errorCount === 1 ? "" : "s"}, so nothing was saved. First: ${first?.message ?? ""} Correct the file or the mapping and check it again.`,
      );
    }
    await writePlan(tx, farm.farmId, farm.userId, uploadId, plan);
    const [row] = await tx
      .update(uploads)
      // The transaction's own time, as every row it writes gets in updated_at: an undo knows a row untouched since by that.
      .set({
        outcome: "committed",
        committedAt: sql`now()`,
        keptForUndo: true,
        report,
        options: choices,
        rowCount: report.rowCount,
        stagedParse: null,
      })
      .where(eq(uploads.id, uploadId))
      .returning({ committedAt: uploads.committedAt, fileName: uploads.fileName });
    await rememberChoices(tx, farm.farmId, choices);
    await recordAudit(tx, {
      action: "season-log.committed",
      subject: row.fileName,
      farmId: farm.farmId,
      ...actor(member),
      details: { uploadId, ...plan.counts, changedValues: plan.changes.length, removedHarvests: plan.removedHarvests.length },
    });
    await queuePooledRefresh(tx, farm.farmId);
    return {
      uploadId,
      fileName: row.fileName,
      committedAt: iso(row.committedAt)!,
      counts: plan.counts,
      changedValues: plan.changes.length,
      removedHarvests: plan.removedHarvests.length,
    };
  });
  return receipt;
}

export async function listUploads(member: Member): Promise<UploadSummary[]> {
  const farm = farmOf(member, "work with its season logs");
  const rows = await asMember(member, (tx) =>
    tx.select(summaryColumns).from(uploads).where(eq(uploads.farmId, farm.farmId)).orderBy(desc(uploads.uploadedAt)).limit(200),
  );
  return rows.map(summary);
}

export async function getUploadView(member: Member, uploadId: string): Promise<UploadView> {
  const farm = farmOf(member, "work with its season logs");
  const stored = await storedUpload(member, uploadId);
  const alreadyImportedAt =
    stored.outcome === "already_imported"
      ? await asMember(member, (tx) => committedBefore(tx, farm.farmId, stored.sha256, uploadId))
      : null;
  return viewOf(summary(stored), stored.report as UploadReport, alreadyImportedAt);
}

export async function getUploadFile(member: Member, uploadId: string): Promise<{ fileName: string; content: Buffer }> {
  const stored = await storedUpload(member, uploadId);
  return { fileName: stored.fileName, content: await storedContent(member, uploadId) };
}

/**
 * The farm's blocks and harvests as a season log (`lib/season-logs/export.ts`): uploaded again
 * unchanged it changes nothing, so a grower can download, correct or add rows, and upload.
 */
export async function getSeasonLogExport(member: Member): Promise<{ fileName: string; csv: string }> {
  const farm = farmOf(member, "work with its season logs");
  return asMember(member, async (tx) => {
    const recipes = alias(substrateRecipes, "recipes");
    const methods = alias(treatments, "methods");
    const blockRows = await tx
      .select({
        code: blocks.code,
        strainCode: strains.code,
        substrateCode: recipes.code,
        trialCode: trials.code,
        armLabel: trialArms.label,
        inoculatedOn: blocks.inoculatedOn,
        wetMassG: blocks.wetMassG,
        moisture: blocks.moisture,
        fruitingMethodCode: methods.code,
        contaminated: blocks.contaminated,
        contaminatedOn: blocks.contaminatedOn,
        spentMassG: blocks.spentMassG,
        notes: blocks.notes,
      })
      .from(blocks)
      .innerJoin(strains, eq(strains.id, blocks.strainId))
      .leftJoin(recipes, eq(recipes.id, blocks.substrateRecipeId))
      .leftJoin(methods, eq(methods.id, blocks.fruitingMethodId))
      .leftJoin(trialArms, eq(trialArms.id, blocks.trialArmId))
      .leftJoin(trials, eq(trials.id, trialArms.trialId))
      .where(eq(blocks.farmId, farm.farmId))
      .orderBy(blocks.code);
    const harvestRows = await tx
      .select({
        blockCode: blocks.code,
        flush: harvests.flush,
        harvestedOn: harvests.harvestedOn,
        freshMassG: harvests.freshMassG,
        dryMassG: harvests.dryMassG,
      })
      .from(harvests)
      .innerJoin(blocks, eq(blocks.id, harvests.blockId))
      .where(eq(harvests.farmId, farm.farmId));
    return { fileName: `season-log-${todayUtc()}.csv`, csv: seasonLogExportCsv(blockRows, harvestRows) };
  });
}
