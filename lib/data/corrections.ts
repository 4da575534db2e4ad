import "server-only";
import { and, eq, getTableColumns, isNull, ne, sql } from "drizzle-orm";
import { type Transaction } from "@/db/client";
import { blocks, harvests, seasonLogReplacedRows, uploads, valueChanges } from "@/db/schema";
import { actor, recordAudit } from "@/lib/data/audit";
import { noSuchBlock } from "@/lib/data/blocks";
import { queuePooledRefresh } from "@/lib/data/pooled-refresh";
import { uploadNotFound } from "@/lib/data/season-logs";
import { AppError } from "@/lib/errors";
import {
  blockValueChanges,
  checkBlockCorrection,
  checkHarvestCorrection,
  checkHarvestRemoval,
  harvestValueChanges,
  type BlockCorrection,
  type BlockProblem,
  type ChangedValue,
  type HarvestCorrection,
} from "@/lib/season-logs/corrections";
import { harvestRemovalChanges } from "@/lib/season-logs/plan";
import { latestToday, warningsNotAccepted, type HarvestProblem } from "@/lib/season-logs/quick-harvest";
import type { UploadReport } from "@/lib/season-logs/report";
import { planUndo, type CommitChange } from "@/lib/season-logs/undo";
import type { Member } from "./members";
import { asMember, farmOf, type FarmMemberContext } from "./context";
import { chosenDisplay, formatDay } from "@/lib/time/display";

/**
 * Corrections in the app and undoing a season-log commit. Each runs in one transaction through
 * the tenant door under the farm's season-log lock (as a commit and the quick form do), keeps
 * every replaced value in value_changes with who, when and why, writes the farm's activity log
 * and queues the farm's pooled refresh, so the co-op's figures follow.
 */

export const noSuchHarvest = "There is no such harvest on your farm. Pick it from its block's page.";
const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

async function lockFarm(tx: Transaction, farmId: string): Promise<void> {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`season-log:${farmId}`}, 0))`);
}

async function keepHistory(
  tx: Transaction,
  farm: FarmMemberContext,
  blockId: string,
  changes: readonly ChangedValue[],
  reason: string,
  uploadId: string | null = null,
): Promise<void> {
  if (changes.length === 0) return;
  await tx
    .insert(valueChanges)
    .values(changes.map((change) => ({ farmId: farm.farmId, blockId, ...change, reason, uploadId, changedBy: farm.userId })));
}

export type CorrectionResult<Problem> = { status: "saved"; changed: number } | { status: "warnings"; warnings: Problem[] };

async function harvestOf(tx: Transaction, harvestId: string) {
  if (!uuidPattern.test(harvestId)) throw new AppError("not_found", noSuchHarvest);
  const [row] = await tx
    .select({
      id: harvests.id,
      blockId: harvests.blockId,
      flush: harvests.flush,
      harvestedOn: harvests.harvestedOn,
      freshMassG: harvests.freshMassG,
      dryMassG: harvests.dryMassG,
      code: blocks.code,
      inoculatedOn: blocks.inoculatedOn,
      wetMassG: blocks.wetMassG,
      moisture: blocks.moisture,
      contaminated: blocks.contaminated,
      contaminatedOn: blocks.contaminatedOn,
    })
    .from(harvests)
    .innerJoin(blocks, eq(blocks.id, harvests.blockId))
    .where(eq(harvests.id, harvestId));
  if (!row) throw new AppError("not_found", noSuchHarvest);
  return row;
}

/**
 * Corrects a harvest's day and fresh weight by the quick form's rules against the block's other
 * harvests: an error refuses it (a problem per field), warnings not yet accepted return unsaved,
 * and the warnings accepted are kept with the harvest.
 */
export async function correctHarvest(
  member: Member,
  entry: Omit<HarvestCorrection, "acceptWarnings"> & { acceptWarnings: readonly string[] },
  today: string = latestToday(),
): Promise<CorrectionResult<HarvestProblem>> {
  const farm = farmOf(member, "correct its records");
  return asMember(member, async (tx) => {
    await lockFarm(tx, farm.farmId);
    const harvest = await harvestOf(tx, entry.harvestId);
    const others = await tx
      .select({ flush: harvests.flush, freshMassG: harvests.freshMassG })
      .from(harvests)
      .where(and(eq(harvests.blockId, harvest.blockId), ne(harvests.id, harvest.id)));
    const check = checkHarvestCorrection(entry, harvest, { ...harvest, harvests: others }, today);
    if (check.errors.length > 0) throw new AppError("invalid_input", "Not saved: correct what is marked.", check.errors);
    if (warningsNotAccepted(check.warnings, entry.acceptWarnings).length > 0) return { status: "warnings", warnings: check.warnings };
    const freshGrams = check.freshGrams as number;
    const changes = harvestValueChanges(harvest.flush, harvest, { harvestedOn: entry.harvestedOn, freshMassG: freshGrams });
    await tx
      .update(harvests)
      .set({
        harvestedOn: entry.harvestedOn,
        freshMassG: freshGrams,
        freshMassAsWritten: check.asWritten,
        freshMassUnit: check.unit,
        acceptedWarnings: check.warnings.length > 0 ? check.warnings.map((warning) => warning.message).join("\n") : null,
        updatedAt: sql`now()`,
      })
      .where(eq(harvests.id, harvest.id));
    await keepHistory(tx, farm, harvest.blockId, changes, entry.reason);
    await recordAudit(tx, {
      action: "harvest.corrected",
      subject: `${harvest.code} flush ${harvest.flush}`,
      farmId: farm.farmId,
      ...actor(member),
      details: {
        blockId: harvest.blockId,
        flush: harvest.flush,
        reason: entry.reason,
        changes,
        savedAnyway: check.warnings.map((w) => w.code),
      },
    });
    await queuePooledRefresh(tx, farm.farmId);
    return { status: "saved", changed: changes.length };
  });
}

export type DeleteHarvestResult = { status: "deleted"; blockId: string } | { status: "warnings"; warnings: HarvestProblem[] };

/**
 * Deletes a harvest; its values go to the block's history as removed, with the reason. A gap it
 * would leave in the flush numbers is a warning to accept first, as the importer's.
 */
export async function deleteHarvest(
  member: Member,
  entry: { harvestId: string; reason: string; acceptWarnings?: readonly string[] },
): Promise<DeleteHarvestResult> {
  const farm = farmOf(member, "correct its records");
  return asMember(member, async (tx) => {
    await lockFarm(tx, farm.farmId);
    const harvest = await harvestOf(tx, entry.harvestId);
    const others = await tx
      .select({ flush: harvests.flush })
      .from(harvests)
      .where(and(eq(harvests.blockId, harvest.blockId), ne(harvests.id, harvest.id)));
    const warnings = checkHarvestRemoval(
      harvest.code,
      harvest.flush,
      others.map((other) => other.flush),
    );
    if (warningsNotAccepted(warnings, entry.acceptWarnings ?? []).length > 0) return { status: "warnings", warnings };
    const changes = harvestRemovalChanges(harvest);
    await tx.delete(harvests).where(eq(harvests.id, harvest.id));
    await keepHistory(tx, farm, harvest.blockId, changes, entry.reason);
    await recordAudit(tx, {
      action: "harvest.deleted",
      subject: `${harvest.code} flush ${harvest.flush}`,
      farmId: farm.farmId,
      ...actor(member),
      details: { blockId: harvest.blockId, flush: harvest.flush, reason: entry.reason, changes },
    });
    await queuePooledRefresh(tx, farm.farmId);
    return { status: "deleted", blockId: harvest.blockId };
  });
}

const blockValueColumns = {
  code: blocks.code,
  inoculatedOn: blocks.inoculatedOn,
  wetMassG: blocks.wetMassG,
  wetMassAsWritten: blocks.wetMassAsWritten,
  wetMassUnit: blocks.wetMassUnit,
  moisture: blocks.moisture,
  contaminated: blocks.contaminated,
  contaminatedOn: blocks.contaminatedOn,
  spentMassG: blocks.spentMassG,
  spentMassAsWritten: blocks.spentMassAsWritten,
  spentMassUnit: blocks.spentMassUnit,
  notes: blocks.notes,
};

/** Corrects a block's recorded values by the import's rules against its stored harvests; the same answers as `correctHarvest`. */
export async function correctBlock(
  member: Member,
  entry: Omit<BlockCorrection, "acceptWarnings"> & { acceptWarnings: readonly string[] },
  today: string = latestToday(),
): Promise<CorrectionResult<BlockProblem>> {
  const farm = farmOf(member, "correct its records");
  if (!uuidPattern.test(entry.blockId)) throw new AppError("not_found", noSuchBlock);
  return asMember(member, async (tx) => {
    await lockFarm(tx, farm.farmId);
    const [stored] = await tx.select(blockValueColumns).from(blocks).where(eq(blocks.id, entry.blockId));
    if (!stored) throw new AppError("not_found", noSuchBlock);
    const flushes = await tx
      .select({ flush: harvests.flush, harvestedOn: harvests.harvestedOn, freshMassG: harvests.freshMassG })
      .from(harvests)
      .where(eq(harvests.blockId, entry.blockId));
    const check = checkBlockCorrection(
      { ...entry, acceptWarnings: [...entry.acceptWarnings] },
      { code: stored.code, harvests: flushes },
      today,
    );
    if (check.errors.length > 0 || check.values === null)
      throw new AppError("invalid_input", "Not saved: correct what is marked.", check.errors);
    if (warningsNotAccepted(check.warnings, entry.acceptWarnings).length > 0) return { status: "warnings", warnings: check.warnings };
    const changes = blockValueChanges(stored, check.values);
    if (changes.length === 0) return { status: "saved", changed: 0 };
    const values = { ...check.values };
    // A mass left as it was keeps the way it was first written.
    if (values.wetMassG === stored.wetMassG)
      Object.assign(values, { wetMassAsWritten: stored.wetMassAsWritten, wetMassUnit: stored.wetMassUnit });
    if (values.spentMassG === stored.spentMassG)
      Object.assign(values, { spentMassAsWritten: stored.spentMassAsWritten, spentMassUnit: stored.spentMassUnit });
    await tx
      .update(blocks)
      .set({ ...values, updatedAt: sql`now()` })
      .where(eq(blocks.id, entry.blockId));
    await keepHistory(tx, farm, entry.blockId, changes, entry.reason);
    await recordAudit(tx, {
      action: "block.corrected",
      subject: stored.code,
      farmId: farm.farmId,
      ...actor(member),
      details: { blockId: entry.blockId, reason: entry.reason, changes, savedAnyway: check.warnings.map((w) => w.code) },
    });
    await queuePooledRefresh(tx, farm.farmId);
    return { status: "saved", changed: changes.length };
  });
}

export interface UndoReceipt {
  uploadId: string;
  fileName: string;
  removedBlocks: number;
  removedHarvests: number;
  restoredRows: number;
}

/** Every column but the id, so a row is put back whole, whatever columns the table has by then. */
function restoredColumns(table: typeof blocks | typeof harvests) {
  const columns: Record<string, { name: string }> = getTableColumns(table);
  const names = Object.values(columns)
    .map((column) => column.name)
    .filter((name) => name !== "id");
  return { target: sql.raw(names.map((name) => `"${name}"`).join(", ")), source: sql.raw(names.map((name) => `r."${name}"`).join(", ")) };
}

/**
 * Undoes a committed season log as a new change: removes each block and harvest it added, puts
 * back each row it updated exactly as it was stored before, records each value put back and each
 * harvest removed in value_changes with the reason, marks the upload undone (the same file may then
 * be committed again), writes the activity log and queues the pooled refresh. Refused, with what
 * stands in the way, when a later commit or correction changed rows the commit wrote.
 */
export async function undoCommit(member: Member, entry: { uploadId: string; reason: string }): Promise<UndoReceipt> {
  const farm = farmOf(member, "correct its records");
  if (!uuidPattern.test(entry.uploadId)) throw new AppError("not_found", uploadNotFound);
  const uploadId = entry.uploadId;
  return asMember(member, async (tx) => {
    await lockFarm(tx, farm.farmId);
    const [upload] = await tx
      .select({
        fileName: uploads.fileName,
        outcome: uploads.outcome,
        keptForUndo: uploads.keptForUndo,
        undoneAt: uploads.undoneAt,
        report: uploads.report,
      })
      .from(uploads)
      .where(eq(uploads.id, uploadId));
    if (!upload) throw new AppError("not_found", uploadNotFound);
    if (upload.outcome !== "committed") throw new AppError("conflict", "This upload was never committed, so there is nothing to undo.");
    if (upload.undoneAt)
      throw new AppError(
        "conflict",
        `This commit was already undone on ${formatDay(upload.undoneAt, chosenDisplay(member))}; nothing more to do.`,
      );
    if (!upload.keptForUndo)
      throw new AppError(
        "conflict",
        "This file was committed before Rhizomorph kept what a commit replaces, so it cannot be undone exactly. Correct the values on each block's page instead.",
      );

    // A row the commit wrote and nobody touched since still has the commit's transaction time.
    const untouched = (updatedAt: typeof blocks.updatedAt | typeof harvests.updatedAt) =>
      sql<boolean>`coalesce(${updatedAt} = (select committed_at from uploads where id = ${uploadId}::uuid), false)`;
    const replacedIds = (kind: "block" | "harvest") =>
      sql`(select row_id from season_log_replaced_rows where upload_id = ${uploadId}::uuid and row_kind = ${kind})`;

    const replacedBlocks = await tx
      .select({
        rowId: seasonLogReplacedRows.rowId,
        code: blocks.code,
        present: sql<boolean>`${blocks.id} is not null`,
        untouched: untouched(blocks.updatedAt),
      })
      .from(seasonLogReplacedRows)
      .leftJoin(blocks, eq(blocks.id, seasonLogReplacedRows.rowId))
      .where(and(eq(seasonLogReplacedRows.uploadId, uploadId), eq(seasonLogReplacedRows.rowKind, "block")));
    const replacedHarvests = await tx
      .select({
        rowId: seasonLogReplacedRows.rowId,
        flush: sql<string>`${seasonLogReplacedRows.before}->>'flush'`,
        code: sql<string | null>`(select code from blocks where id = (${seasonLogReplacedRows.before}->>'block_id')::uuid)`,
        present: sql<boolean>`${harvests.id} is not null`,
        untouched: untouched(harvests.updatedAt),
      })
      .from(seasonLogReplacedRows)
      .leftJoin(harvests, eq(harvests.id, seasonLogReplacedRows.rowId))
      .where(and(eq(seasonLogReplacedRows.uploadId, uploadId), eq(seasonLogReplacedRows.rowKind, "harvest")));
    // A harvest the commit removed cannot go back where a flush was recorded since, or whose block is gone.
    const blockedReturns = await tx.execute<{ label: string }>(sql`
      select 'flush ' || (s.before->>'flush') || ' of ' || coalesce(b.code, 'a removed block') as label
      from season_log_replaced_rows s
      left join blocks b on b.id = (s.before->>'block_id')::uuid
      where s.upload_id = ${uploadId}::uuid and s.row_kind = 'removed_harvest'
        and (b.id is null or exists (select 1 from harvests h where h.block_id = b.id and h.flush = (s.before->>'flush')::int))`);
    const createdBlocks = await tx
      .select({ id: blocks.id, code: blocks.code, untouched: untouched(blocks.updatedAt) })
      .from(blocks)
      .where(and(eq(blocks.lastUploadId, uploadId), sql`${blocks.id} not in ${replacedIds("block")}`));
    const createdHarvests = await tx
      .select({
        id: harvests.id,
        blockId: harvests.blockId,
        blockCode: blocks.code,
        flush: harvests.flush,
        harvestedOn: harvests.harvestedOn,
        freshMassG: harvests.freshMassG,
        dryMassG: harvests.dryMassG,
        untouched: untouched(harvests.updatedAt),
      })
      .from(harvests)
      .innerJoin(blocks, eq(blocks.id, harvests.blockId))
      .where(and(eq(harvests.uploadId, uploadId), sql`${harvests.id} not in ${replacedIds("harvest")}`));
    const laterHarvests = await tx
      .select({ blockCode: blocks.code, flush: harvests.flush })
      .from(harvests)
      .innerJoin(blocks, eq(blocks.id, harvests.blockId))
      .where(
        and(
          eq(blocks.lastUploadId, uploadId),
          sql`${blocks.id} not in ${replacedIds("block")}`,
          sql`${harvests.uploadId} is distinct from ${uploadId}::uuid`,
          // One this commit added and a later file rewrote is named as rewritten, below.
          sql`not exists (select 1 from season_log_replaced_rows s where s.row_id = ${harvests.id} and s.before->>'upload_id' = ${uploadId})`,
        ),
      );
    // Rows this commit added that a later commit still standing rewrote: that commit kept them as they were.
    const rewrittenSince = await tx
      .select({
        kind: seasonLogReplacedRows.rowKind,
        code: sql<
          string | null
        >`(select code from blocks where id = coalesce((${seasonLogReplacedRows.before}->>'block_id')::uuid, ${seasonLogReplacedRows.rowId}))`,
        flush: sql<string | null>`${seasonLogReplacedRows.before}->>'flush'`,
      })
      .from(seasonLogReplacedRows)
      .innerJoin(uploads, eq(uploads.id, seasonLogReplacedRows.uploadId))
      .where(
        and(
          ne(seasonLogReplacedRows.uploadId, uploadId),
          isNull(uploads.undoneAt),
          sql`coalesce(${seasonLogReplacedRows.before}->>'upload_id', ${seasonLogReplacedRows.before}->>'last_upload_id') = ${uploadId}`,
        ),
      );
    // A block's room from the start that the commit wrote and a move since replaced (the block page clears upload_id),
    // or any move since on a block the commit added: refused like any later change, never overwritten.
    const roomsChangedSince = await tx.execute<{ code: string }>(sql`
      select b.code from value_changes v join blocks b on b.id = v.block_id
        left join block_room_moves m on m.block_id = v.block_id and m.moved_on is null
        where v.upload_id = ${uploadId}::uuid and v.field = 'fruiting_room' and m.upload_id is distinct from ${uploadId}::uuid
      union
      select b.code from block_room_moves m join blocks b on b.id = m.block_id
        where b.last_upload_id = ${uploadId}::uuid and b.id not in ${replacedIds("block")} and m.upload_id is distinct from ${uploadId}::uuid
      order by 1`);
    const changes: CommitChange[] = await tx
      .select({
        blockId: valueChanges.blockId,
        flush: valueChanges.flush,
        field: valueChanges.field,
        oldValue: valueChanges.oldValue,
        newValue: valueChanges.newValue,
      })
      .from(valueChanges)
      .where(eq(valueChanges.uploadId, uploadId));

    const counts = (upload.report as UploadReport | null)?.preview.counts;
    const plan = planUndo({
      added: { blocks: counts?.newBlocks ?? 0, harvests: counts?.newHarvests ?? 0 },
      createdBlocks,
      createdHarvests,
      laterHarvestsOnCreatedBlocks: laterHarvests,
      replaced: [
        ...replacedBlocks.map((row) => ({
          kind: "block" as const,
          rowId: row.rowId,
          label: `block ${row.code}`,
          present: row.present,
          untouched: row.untouched,
        })),
        ...replacedHarvests.map((row) => ({
          kind: "harvest" as const,
          rowId: row.rowId,
          label: `flush ${row.flush} of ${row.code ?? "a removed block"}`,
          present: row.present,
          untouched: row.untouched,
        })),
      ],
      rewrittenSince: [
        ...rewrittenSince.map((row) => ({
          kind: row.kind === "block" ? ("block" as const) : ("harvest" as const),
          label: row.kind === "block" ? `block ${row.code ?? ""}` : `flush ${row.flush} of ${row.code ?? "a removed block"}`,
        })),
        // Not a row it added, so counted apart from those: a conflict all the same.
        ...blockedReturns.rows.map((row) => ({ kind: "removed" as const, label: row.label })),
        ...roomsChangedSince.rows.map((row) => ({ kind: "room" as const, label: `the fruiting room of block ${row.code}` })),
      ],
      changes,
    });
    if ("conflicts" in plan) throw new AppError("conflict", `Nothing was undone. ${plan.conflicts.join(" ")}`);
    const { steps } = plan;

    for (const [kind, table] of [
      ["block", blocks],
      ["harvest", harvests],
    ] as const) {
      const { target, source } = restoredColumns(table);
      await tx.execute(sql`
        update ${table} t set (${target}) = (${source})
        from season_log_replaced_rows s, jsonb_populate_record(null::${table}, s.before) r
        where s.upload_id = ${uploadId}::uuid and s.row_kind = ${kind} and t.id = s.row_id`);
    }
    // A stored block's room from the start of fruiting: a move the commit added goes, one it replaced gets its room back.
    await tx.execute(sql`
      delete from block_room_moves m where m.upload_id = ${uploadId}::uuid and m.moved_on is null
        and m.id not in (select row_id from season_log_replaced_rows where upload_id = ${uploadId}::uuid and row_kind = 'room_move')`);
    await tx.execute(sql`
      update block_room_moves t set room_id = r.room_id, upload_id = r.upload_id
      from season_log_replaced_rows s, jsonb_populate_record(null::block_room_moves, s.before) r
      where s.upload_id = ${uploadId}::uuid and s.row_kind = 'room_move' and t.id = s.row_id`);
    // Harvests the commit removed (the grower chose to remove what the file did not have) go back whole.
    await tx.execute(sql`
      insert into harvests select (jsonb_populate_record(null::harvests, s.before)).*
      from season_log_replaced_rows s where s.upload_id = ${uploadId}::uuid and s.row_kind = 'removed_harvest'`);
    const ids = (list: string[]) => sql`(select value::uuid from json_array_elements_text(${JSON.stringify(list)}::json))`;
    if (steps.removeHarvestIds.length > 0) await tx.delete(harvests).where(sql`${harvests.id} in ${ids(steps.removeHarvestIds)}`);
    if (steps.removeBlockIds.length > 0) await tx.delete(blocks).where(sql`${blocks.id} in ${ids(steps.removeBlockIds)}`);
    const reason = `Undid the commit of ${upload.fileName}: ${entry.reason}`;
    if (steps.history.length > 0)
      await tx
        .insert(valueChanges)
        .values(steps.history.map((change) => ({ farmId: farm.farmId, ...change, reason, changedBy: farm.userId })));
    await tx
      .update(uploads)
      .set({ undoneAt: sql`now()`, undoneBy: farm.userId })
      .where(eq(uploads.id, uploadId));
    const receipt = {
      uploadId,
      fileName: upload.fileName,
      removedBlocks: steps.removeBlockIds.length,
      removedHarvests: steps.removeHarvestIds.length,
      restoredRows: steps.restore.length,
    };
    await recordAudit(tx, {
      action: "season-log.undone",
      subject: upload.fileName,
      farmId: farm.farmId,
      ...actor(member),
      details: {
        ...receipt,
        reason: entry.reason,
        removedBlockCodes: createdBlocks.map((block) => block.code),
        valuesPutBack: changes.length,
      },
    });
    await queuePooledRefresh(tx, farm.farmId);
    return receipt;
  });
}
