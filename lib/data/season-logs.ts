import "server-only";
import type { UploadOutcome } from "@/lib/season-logs/outcomes";
import { createHash } from "node:crypto";
import { and, desc, eq, isNull, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { copyInto, type Transaction } from "@/db/client";
import {
  blockRoomMoves,
  blocks,
  farmImportPreferences,
  fruitingRooms,
  harvests,
  strains,
  substrateRecipes,
  treatments,
  trialArms,
  trialBlockAssignments,
  trials,
  uploads,
  users,
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
import { type PlanCounts, type PlanInput, planCommit, withNotInFileRemoved } from "@/lib/season-logs/plan";
import { type ParseChoices, type UploadReport, buildReport, parserOptions } from "@/lib/season-logs/report";
import { seasonLogExportCsv } from "@/lib/season-logs/export";
import { commitRowsOf, keepCommitRows, keptCommitRows, stagingKey, type CommitRows } from "@/lib/season-logs/commit-rows";
import { todayUtc } from "@/lib/import/dates";
import { uploadHistoryDetails, uploadOutcomeWords, type UploadCheck } from "@/lib/season-logs/upload-history";
import type { AuditDetail } from "@/lib/audit/sentences";
import type { Member } from "./members";
import { asMember, farmOf } from "./context";
import { chosenDisplay, formatDay } from "@/lib/time/display";
import { count } from "@/lib/words";

export interface UploadSummary {
  id: string;
  fileName: string;
  uploadedAt: string;
  outcome: UploadOutcome;
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
      seasonYear: blocks.seasonYear,
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
  // The farm's own rooms (row-level security shows no other farm's), and each block's room from the start of fruiting.
  const rooms = await tx
    .select({ id: fruitingRooms.id, name: fruitingRooms.name, retiredOn: fruitingRooms.retiredOn })
    .from(fruitingRooms)
    .where(eq(fruitingRooms.farmId, farmId));
  const startRooms =
    rooms.length === 0
      ? []
      : await tx
          .select({ blockId: blockRoomMoves.blockId, roomId: blockRoomMoves.roomId })
          .from(blockRoomMoves)
          .where(and(eq(blockRoomMoves.farmId, farmId), isNull(blockRoomMoves.movedOn)));
  const roomOfBlock = new Map(startRooms.map((move) => [move.blockId, move.roomId]));
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
    storedBlocks:
      roomOfBlock.size === 0 ? storedBlocks : storedBlocks.map((block) => ({ ...block, roomId: roomOfBlock.get(block.id) ?? null })),
    storedHarvests,
    strains: strainRows,
    substrateRecipes: recipeRows,
    fruitingMethods: methodRows,
    assignments,
    rooms,
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

/**
 * What an upload's plan depended on besides the file: the farm's data version (a number triggers
 * move with every statement that writes its blocks or harvests, migration 0031), the registers a
 * file's codes resolve against and the farm's trial lists. Read before the rows it vouches for, so a
 * write landing in between makes it older than they are, never newer: the commit then plans again.
 */
async function farmDataMarker(tx: Transaction, farmId: string): Promise<string> {
  const result = await tx.execute<{ marker: string }>(sql`
    select coalesce((select version from farm_data_versions where farm_id = ${farmId}::uuid), 0)::text || ':' || md5(concat_ws(';',
      (select string_agg(concat_ws('|', id, code, name), ',' order by id) from strains where status = 'active'),
      (select string_agg(concat_ws('|', id, code, name), ',' order by id) from substrate_recipes where status = 'active'),
      (select string_agg(concat_ws('|', id, code, name), ',' order by id) from treatments where status = 'active' and kind = 'fruiting_method'),
      (select string_agg(concat_ws('|', a.block_code, a.arm_id, r.label, r.strain_id, r.treatment_id, t.code, t.title), ',' order by a.block_code)
        from trial_block_assignments a join trial_arms r on r.id = a.arm_id join trials t on t.id = a.trial_id
        where a.farm_id = ${farmId}::uuid),
      -- The farm's rooms and each block's room from the start of fruiting: no trigger moves the data version for them.
      (select string_agg(concat_ws('|', id, name, retired_on), ',' order by id) from fruiting_rooms where farm_id = ${farmId}::uuid),
      (select string_agg(concat_ws('|', block_id, room_id), ',' order by block_id) from block_room_moves
        where farm_id = ${farmId}::uuid and moved_on is null))) as marker`);
  return result.rows[0].marker;
}

const storedBlockIds = (input: Omit<PlanInput, "records">) => new Map(input.storedBlocks.map((block) => [block.code, block.id]));

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
 * A parse's report and outcome against what the farm has stored, and for a file that can be
 * committed the rows the commit would write: one short read, then CPU work with no connection held.
 */
async function previewOf(member: Member, sha256: string, result: SeasonLogResult, choices: ParseChoices, except?: string) {
  const farm = farmOf(member, "work with its season logs");
  const { alreadyImportedAt, marker, planInput } = await asMember(member, async (tx) => ({
    alreadyImportedAt: await committedBefore(tx, farm.farmId, sha256, except),
    marker: await farmDataMarker(tx, farm.farmId),
    planInput: await loadPlanInput(tx, farm.farmId),
  }));
  const plan = planCommit({ records: result.records, ...planInput });
  const report = buildReport({
    rowCount: result.records.length,
    parserIssues: result.issues,
    plan,
    detected: result.detected,
    choices,
  });
  const outcome = outcomeOf(report, alreadyImportedAt);
  const knownStrains = planInput.strains.map((strain) => ({ code: strain.code, names: strain.names }));
  // Kept for the commit, which writes them as they are if the marker has not moved by then.
  const commitRows =
    outcome === "received"
      ? await keepCommitRows(stagingKey(choices, knownStrains, todayUtc()), marker, commitRowsOf(plan, storedBlockIds(planInput)))
      : null;
  return { alreadyImportedAt, report, outcome, commitRows };
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
  const { alreadyImportedAt, report, outcome, commitRows } = await previewOf(member, sha256, input.result, input.choices);
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
        commitRows,
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
  const { alreadyImportedAt, report, outcome, commitRows } = await previewOf(member, stored.sha256, result, choices, uploadId);
  return asMember(member, async (tx) => {
    const [row] = await tx
      .update(uploads)
      .set({ report, options: choices, rowCount: report.rowCount, outcome, commitRows })
      .where(eq(uploads.id, uploadId))
      .returning(summaryColumns);
    await rememberChoices(tx, farm.farmId, choices);
    return viewOf(summary(row), report, alreadyImportedAt);
  });
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
  spent_mass_g numeric, spent_mass_as_written text, spent_mass_unit text, notes text, season_year integer, room_id uuid) on commit drop`;
const stagedHarvests = `create temporary table commit_harvests (is_new boolean not null, id uuid not null, block_id uuid not null, flush integer,
  harvested_on date, fresh_mass_g numeric, fresh_mass_as_written text, fresh_mass_unit text,
  dry_mass_g numeric, dry_mass_as_written text, dry_mass_unit text) on commit drop`;
const stagedChanges = `create temporary table commit_value_changes (block_id uuid not null, flush integer, field text not null,
  old_value text, new_value text) on commit drop`;

function refuseIfChanged(updated: number | null, expected: number): void {
  if (updated !== expected)
    throw new AppError(
      "conflict",
      "The farm's blocks changed while the file was being committed, so nothing was saved. Check the file again and commit it.",
    );
}

/** Copies the stored rows a commit is about to update or remove, whole, so undoing it puts them back exactly (lib/data/corrections.ts). */
async function keepReplacedRows(tx: Transaction, uploadId: string, kind: "block" | "harvest" | "removed_harvest" | "room_move", rows: SQL) {
  await tx.execute(sql`
    insert into season_log_replaced_rows (farm_id, upload_id, row_kind, row_id, before)
    select r.farm_id, ${uploadId}::uuid, ${kind}, r.id, to_jsonb(r) from (${rows}) r`);
}

/**
 * Each staged block's room from the start of fruiting, as its move with no date: inserted for a
 * block that has none, its room replaced where the file names another (the move it replaces is
 * kept for the undo). The composite key (room_id, farm_id) refuses a room of another farm.
 */
async function writeStartRooms(tx: Transaction, farmId: string, userId: string, uploadId: string, storedBlocks: boolean) {
  if (storedBlocks)
    await keepReplacedRows(
      tx,
      uploadId,
      "room_move",
      sql`select m.* from block_room_moves m join pg_temp.commit_blocks u on u.id = m.block_id and not u.is_new
        where m.moved_on is null and u.room_id is not null and m.room_id <> u.room_id`,
    );
  await tx.execute(sql`
    insert into block_room_moves (farm_id, block_id, room_id, moved_on, upload_id, created_by)
    select ${farmId}::uuid, id, room_id, null, ${uploadId}::uuid, ${userId}::uuid from pg_temp.commit_blocks where room_id is not null
    on conflict on constraint block_room_moves_block_day_unique do update set room_id = excluded.room_id, upload_id = excluded.upload_id
    where block_room_moves.room_id <> excluded.room_id`);
}

/**
 * Writes a commit's rows: new rows inserted and changed ones updated by id, each table's rows
 * staged by COPY and written by one statement, as rhizo_app under row-level security. The rows
 * were planned against exactly what is stored (the farm's lock is held, and a kept plan is used
 * only while the farm's data marker has not moved), so they know which rows are new.
 */
async function writeRows(tx: Transaction, farmId: string, userId: string, uploadId: string, rows: CommitRows): Promise<void> {
  if (rows.blockCount > 0) {
    await tx.execute(sql.raw(stagedBlocks));
    await copyInto(tx, "copy pg_temp.commit_blocks from stdin", rows.blocks);
    if (rows.blockCount > rows.changedBlocks) {
      await tx.execute(sql`
        insert into blocks (id, farm_id, code, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, inoculated_on,
          wet_mass_g, wet_mass_as_written, wet_mass_unit, moisture, contaminated, contaminated_on,
          spent_mass_g, spent_mass_as_written, spent_mass_unit, notes, season_year, last_upload_id)
        select id, ${farmId}::uuid, code, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, inoculated_on,
          wet_mass_g, wet_mass_as_written, wet_mass_unit, moisture, contaminated, contaminated_on,
          spent_mass_g, spent_mass_as_written, spent_mass_unit, notes, season_year, ${uploadId}::uuid
        from pg_temp.commit_blocks where is_new`);
    }
    if (rows.changedBlocks > 0) {
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
          notes = u.notes, season_year = u.season_year, last_upload_id = ${uploadId}::uuid, updated_at = now()
        from pg_temp.commit_blocks u
        where b.id = u.id and not u.is_new`);
      refuseIfChanged(updated.rowCount, rows.changedBlocks);
    }
    if (rows.roomCount > 0) await writeStartRooms(tx, farmId, userId, uploadId, rows.changedBlocks > 0);
  }

  if (rows.harvestCount > 0) {
    await tx.execute(sql.raw(stagedHarvests));
    await copyInto(tx, "copy pg_temp.commit_harvests from stdin", rows.harvests);
    if (rows.harvestCount > rows.changedHarvests) {
      await tx.execute(sql`
        insert into harvests (id, farm_id, block_id, flush, harvested_on, fresh_mass_g, fresh_mass_as_written, fresh_mass_unit,
          dry_mass_g, dry_mass_as_written, dry_mass_unit, upload_id)
        select id, ${farmId}::uuid, block_id, flush, harvested_on, fresh_mass_g, fresh_mass_as_written, fresh_mass_unit,
          dry_mass_g, dry_mass_as_written, dry_mass_unit, ${uploadId}::uuid
        from pg_temp.commit_harvests where is_new`);
    }
    if (rows.changedHarvests > 0) {
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
      refuseIfChanged(updated.rowCount, rows.changedHarvests);
    }
  }

  // Removed only when the grower chose so; kept whole, so undoing the commit puts them back.
  if (rows.removedHarvestIds.length > 0) {
    const chosen = sql`h.id in (select value::uuid from json_array_elements_text(${JSON.stringify(rows.removedHarvestIds)}::json))`;
    await keepReplacedRows(tx, uploadId, "removed_harvest", sql`select h.* from harvests h where ${chosen}`);
    const removed = await tx.execute(sql`delete from harvests h where ${chosen}`);
    refuseIfChanged(removed.rowCount, rows.removedHarvestIds.length);
  }

  if (rows.changeCount > 0) {
    await tx.execute(sql.raw(stagedChanges));
    await copyInto(tx, "copy pg_temp.commit_value_changes from stdin", rows.changes);
    await tx.execute(sql`
      insert into value_changes (farm_id, block_id, flush, field, old_value, new_value, upload_id, changed_by)
      select ${farmId}::uuid, block_id, flush, field, old_value, new_value, ${uploadId}::uuid, ${userId}::uuid
      from pg_temp.commit_value_changes`);
  }
}

/**
 * Commits a stored upload in one transaction under the farm's lock: writes the rows planned at
 * upload when neither the grower's choices, the registers, the day nor the farm's stored data have
 * changed since (farmDataMarker), and otherwise reads the file again and plans against what is
 * stored now. Either way it inserts new blocks and harvests, updates changed ones, keeps every
 * replaced value as history, marks the upload committed and queues the farm's pooled refresh
 * (the job runs after the commit). Any error leaves the farm's data as it was.
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
    throw new AppError(
      "conflict",
      `This upload was committed on ${stored.committedAt ? formatDay(stored.committedAt, chosenDisplay(member)) : "an earlier day"}; nothing more to do.`,
    );
  const setup = await getImportSetup(member);
  const key = stagingKey(choices, setup.knownStrains, todayUtc());
  const receipt = await asMember(member, async (tx) => {
    // Two commits for one farm run one after the other, so overlapping sheets end as if sent in turn.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`season-log:${farm.farmId}`}, 0))`);
    const alreadyImportedAt = await committedBefore(tx, farm.farmId, stored.sha256, uploadId);
    if (alreadyImportedAt) {
      throw new AppError(
        "conflict",
        `This file was already imported on ${formatDay(alreadyImportedAt, chosenDisplay(member))}; committing it again would change nothing.`,
      );
    }
    const [upload] = await tx.select({ commitRows: uploads.commitRows }).from(uploads).where(eq(uploads.id, uploadId));
    const kept = keptCommitRows(upload?.commitRows ?? null, key, await farmDataMarker(tx, farm.farmId));
    // Removing the stored harvests the file leaves out is a plan of its own.
    const planned = kept && !(removeNotInFile && kept.notInFileHarvests > 0) ? { rows: kept, report: stored.report as UploadReport } : null;
    const { rows, report } = planned ?? (await planAgain(tx, member, uploadId, setup, choices, removeNotInFile));
    await writeRows(tx, farm.farmId, farm.userId, uploadId, rows);
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
        commitRows: null,
      })
      .where(eq(uploads.id, uploadId))
      .returning({ committedAt: uploads.committedAt, fileName: uploads.fileName });
    await rememberChoices(tx, farm.farmId, choices);
    await recordAudit(tx, {
      action: "season-log.committed",
      subject: row.fileName,
      farmId: farm.farmId,
      ...actor(member),
      details: { uploadId, ...rows.counts, changedValues: rows.changeCount, removedHarvests: rows.removedHarvestIds.length },
    });
    await queuePooledRefresh(tx, farm.farmId);
    return {
      uploadId,
      fileName: row.fileName,
      committedAt: iso(row.committedAt)!,
      counts: rows.counts,
      changedValues: rows.changeCount,
      removedHarvests: rows.removedHarvestIds.length,
    };
  });
  return receipt;
}

/**
 * The commit's rows when the ones planned at upload no longer hold: the file read again under
 * the commit's choices and planned against what is stored now, inside the commit's transaction
 * (the farm's lock is held, so nothing can change between the plan and the writes).
 */
async function planAgain(
  tx: Transaction,
  member: Member,
  uploadId: string,
  setup: ImportSetup,
  choices: ParseChoices,
  removeNotInFile: boolean,
): Promise<{ rows: CommitRows; report: UploadReport }> {
  const farm = farmOf(member, "work with its season logs");
  const result = await parseStored(await storedContent(member, uploadId), setup, choices);
  const planInput = await loadPlanInput(tx, farm.farmId);
  const planned = planCommit({ records: result.records, ...planInput });
  const plan = removeNotInFile ? withNotInFileRemoved(planned) : planned;
  const report = buildReport({ rowCount: result.records.length, parserIssues: result.issues, plan, detected: result.detected, choices });
  if (report.errorCount > 0) {
    const first = report.issues.find((issue) => issue.severity === "error");
    throw new AppError(
      "invalid_input",
      `The file still has ${count(report.errorCount, "error")}, so nothing was saved. First: ${first?.message ?? ""} Correct the file or the mapping and check it again.`,
    );
  }
  return { rows: commitRowsOf(plan, storedBlockIds(planInput)), report };
}

/** A row of the farm's past uploads: one per upload, its checks folded into its details. */
export interface UploadHistoryRow extends UploadSummary {
  /** Who sent the file (empty when that person's account is gone). */
  sentBy: string;
  outcomeWords: string;
  details: AuditDetail[];
}

/** How many of a report's problems a past upload's row lists; the review page has them all. */
const issuesInHistory = 3;

export async function listUploads(member: Member): Promise<UploadHistoryRow[]> {
  const farm = farmOf(member, "work with its season logs");
  const sender = alias(users, "sender");
  const undoer = alias(users, "undoer");
  const rows = await asMember(member, (tx) =>
    tx
      .select({
        ...summaryColumns,
        sentBy: sender.name,
        undoneBy: undoer.name,
        // Only what the row shows: a report can hold hundreds of problems and the whole preview.
        errorCount: sql<number | null>`(${uploads.report}->>'errorCount')::int`,
        warningCount: sql<number | null>`(${uploads.report}->>'warningCount')::int`,
        counts: sql<UploadCheck["counts"]>`${uploads.report}->'preview'->'counts'`,
        firstIssues: sql<
          UploadCheck["firstIssues"] | null
        >`jsonb_path_query_array(${uploads.report}->'issues', ${`$[0 to ${issuesInHistory - 1}]`}::jsonpath)`,
      })
      .from(uploads)
      .leftJoin(sender, eq(sender.id, uploads.uploadedBy))
      .leftJoin(undoer, eq(undoer.id, uploads.undoneBy))
      .where(eq(uploads.farmId, farm.farmId))
      .orderBy(desc(uploads.uploadedAt))
      .limit(200),
  );
  return rows.map(({ sentBy, undoneBy, errorCount, warningCount, counts, firstIssues, ...row }) => {
    const upload = summary(row);
    const check: UploadCheck = {
      rowCount: upload.rowCount,
      errorCount: errorCount ?? 0,
      warningCount: warningCount ?? 0,
      counts: counts ?? null,
      firstIssues: (firstIssues ?? []).map(({ line, severity, message }) => ({ line, severity, message })),
    };
    return {
      ...upload,
      sentBy: sentBy ?? "",
      outcomeWords: uploadOutcomeWords(upload),
      details: uploadHistoryDetails({ ...upload, undoneBy: undoneBy ?? "", check }),
    };
  });
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
        seasonYear: blocks.seasonYear,
        wetMassG: blocks.wetMassG,
        moisture: blocks.moisture,
        fruitingMethodCode: methods.code,
        roomName: fruitingRooms.name,
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
      // The room from the start of fruiting is what the fruiting_room column says; a later dated move is not.
      .leftJoin(blockRoomMoves, and(eq(blockRoomMoves.blockId, blocks.id), isNull(blockRoomMoves.movedOn)))
      .leftJoin(fruitingRooms, eq(fruitingRooms.id, blockRoomMoves.roomId))
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
