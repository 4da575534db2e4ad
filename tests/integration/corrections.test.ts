/**
 * Corrections in the app and undoing a season-log commit, against the real database: each edit
 * keeps old → new, who, when and why in value_changes and the farm's activity log, goes through
 * the import's rules, and queues the pooled refresh; an undo restores the stored rows exactly, or
 * is refused when a later change touched them. Another farm's people get "not found" in the same
 * words as for an id that does not exist; an observer and the coordinator get nothing.
 */
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import type { Member } from "@/lib/data/members";
import { jobQueueSchema } from "@/db/job-queue";
import { demoSignIns } from "@/db/seed";
import { correctBlock, correctHarvest, deleteHarvest, noSuchHarvest, undoCommit } from "@/lib/data/corrections";
import { noSuchBlock, recordHarvest } from "@/lib/data/blocks";
import { commitUpload, createUpload, getImportSetup, parseStored, uploadNotFound } from "@/lib/data/season-logs";
import { AppError, isAppError } from "@/lib/errors";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { superuserPool, memberOf } from "./support/database";

let inspector: Pool;
let asGrower: Member;
let asManager: Member;
let asOtherManager: Member;
let asObserver: Member;
let asCoordinator: Member;
let farmId: string;

const today = "2026-05-02";
const header =
  "block_id,strain,substrate,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight";
// CO-A: a 2.5 kg block at 60 % (1 000 g dry substrate), flush 1 of 500 g. CO-B: no harvest yet.
const first = [
  header,
  "CO-A,PO-01,HWB-20,2026-03-01,2.5 kg,60 %,SLIT-ACROSS,1,2026-04-10,500 g",
  "CO-B,PO-01,HWB-20,2026-03-01,2.5 kg,60 %,SLIT-ACROSS,,,",
  "CO-E,PO-01,HWB-20,2026-03-01,2.5 kg,60 %,SLIT-ACROSS,1,2026-04-10,400 g",
  "CO-E,PO-01,HWB-20,2026-03-01,2.5 kg,60 %,SLIT-ACROSS,2,2026-04-24,300 g",
].join("\n");

async function upload(context: Member, fileName: string, csv: string) {
  const content = new TextEncoder().encode(csv);
  const setup = await getImportSetup(context);
  return createUpload(context, { fileName, content, result: await parseStored(content, setup, {}), choices: {} });
}

async function commit(context: Member, fileName: string, csv: string): Promise<string> {
  const view = await upload(context, fileName, csv);
  await commitUpload(context, view.upload.id, {});
  return view.upload.id;
}

async function idOf(sql: string, params: unknown[]): Promise<string> {
  const { rows } = await inspector.query<{ id: string }>(sql, params);
  return rows[0].id;
}

const blockId = (code: string) => idOf("select id from blocks where farm_id = $1 and code = $2", [farmId, code]);
const harvestId = (code: string, flush: number) =>
  idOf("select h.id from harvests h join blocks b on b.id = h.block_id where b.farm_id = $1 and b.code = $2 and h.flush = $3", [
    farmId,
    code,
    flush,
  ]);

async function refusal(work: Promise<unknown>): Promise<AppError> {
  const error = await work.then(
    () => null,
    (caught: unknown) => caught,
  );
  if (!isAppError(error)) throw new Error(`expected a refusal, got ${String(error)}`);
  return error;
}

/** Every stored column of the farm's blocks and harvests, in a fixed order. */
async function farmRows() {
  const blockRows = await inspector.query("select * from blocks where farm_id = $1 order by id", [farmId]);
  const harvestRows = await inspector.query("select * from harvests where farm_id = $1 order by id", [farmId]);
  return { blocks: blockRows.rows, harvests: harvestRows.rows };
}

async function refreshesQueued(): Promise<number> {
  const { rows } = await inspector.query<{ count: number }>(
    `select count(*)::int as count from ${jobQueueSchema}.job where name = 'pooled-refresh' and data->>'farmId' = $1`,
    [farmId],
  );
  return rows[0].count;
}

beforeAll(async () => {
  inspector = superuserPool();
  const { rows: growers } = await inspector.query<{ id: string; farmId: string }>(
    `select id, farm_id as "farmId" from users where email = $1 and role = 'grower'`,
    [demoSignIns.find((member) => member.role === "grower")!.email],
  );
  farmId = growers[0].farmId;
  asGrower = await memberOf(growers[0].id);
  const { rows: managers } = await inspector.query<{ id: string; farmId: string }>(
    `select id, farm_id as "farmId" from users where role = 'farm_manager' order by email`,
  );
  const own = managers.find((manager) => manager.farmId === farmId)!;
  const other = managers.find((manager) => manager.farmId !== farmId)!;
  asManager = await memberOf(own.id);
  asOtherManager = await memberOf(other.id);
  const { rows: others } = await inspector.query<{ id: string; role: "observer" | "coordinator" }>(
    `select id, role from users where role in ('observer', 'coordinator') order by email`,
  );
  asObserver = await memberOf(others.find((user) => user.role === "observer")!.id);
  asCoordinator = await memberOf(others.find((user) => user.role === "coordinator")!.id);
  await commit(asManager, "corrections-first.csv", first);
});

afterAll(async () => {
  await runQueuedJobs(["pooled-refresh"]);
  await stopJobWorkers();
  await inspector.end();
  await closeDatabase();
});

describe("correcting a harvest", () => {
  it("keeps old → new, who and why in the block's history and the farm's activity log, and queues the pooled refresh", async () => {
    const id = await harvestId("CO-A", 1);
    const queued = await refreshesQueued();
    const result = await correctHarvest(
      asGrower,
      { harvestId: id, weight: "550", unit: "g", harvestedOn: "2026-04-11", reason: "read the scale wrong", acceptWarnings: [] },
      today,
    );
    expect(result).toEqual({ status: "saved", changed: 2 });
    const { rows } = await inspector.query(
      "select fresh_mass_g::float8 as grams, fresh_mass_as_written, harvested_on::text from harvests where id = $1",
      [id],
    );
    expect(rows[0]).toEqual({ grams: 550, fresh_mass_as_written: "550 g", harvested_on: "2026-04-11" });
    const history = await inspector.query(
      "select field, old_value, new_value, reason, changed_by, upload_id from value_changes where block_id = $1 and reason is not null order by id",
      [await blockId("CO-A")],
    );
    expect(history.rows).toEqual([
      {
        field: "harvested_on",
        old_value: "2026-04-10",
        new_value: "2026-04-11",
        reason: "read the scale wrong",
        changed_by: asGrower.id,
        upload_id: null,
      },
      {
        field: "fresh_weight",
        old_value: "500",
        new_value: "550",
        reason: "read the scale wrong",
        changed_by: asGrower.id,
        upload_id: null,
      },
    ]);
    const audit = await inspector.query(
      "select actor_user_id, subject, details->>'reason' as reason from audit_events where farm_id = $1 and action = 'harvest.corrected'",
      [farmId],
    );
    expect(audit.rows).toEqual([{ actor_user_id: asGrower.id, subject: "CO-A flush 1", reason: "read the scale wrong" }]);
    expect(await refreshesQueued()).toBe(queued + 1);
  });

  it("refuses what the import refuses, with the reason under the field, and changes nothing", async () => {
    const id = await harvestId("CO-A", 1);
    const before = await farmRows();
    // 50 lb of mushrooms from 1 000 g of dry substrate: a biological efficiency no block reaches.
    const error = await refusal(
      correctHarvest(
        asGrower,
        { harvestId: id, weight: "50 lb", unit: "g", harvestedOn: "2026-04-11", reason: "typo", acceptWarnings: [] },
        today,
      ),
    );
    expect(error.code).toBe("invalid_input");
    expect(error.fieldProblems.map((problem) => problem.field)).toEqual(["weight"]);
    expect(await farmRows()).toEqual(before);
  });

  it("needs 'Save anyway' for a warning, then keeps the warning with the harvest", async () => {
    const id = await harvestId("CO-A", 1);
    const entry = { harvestId: id, weight: "2.6 kg", unit: "g" as const, harvestedOn: "2026-04-11", reason: "a huge flush" };
    const warned = await correctHarvest(asGrower, { ...entry, acceptWarnings: [] }, today);
    expect(warned.status).toBe("warnings");
    const codes = warned.status === "warnings" ? warned.warnings.map((warning) => warning.code) : [];
    expect(codes).toEqual(["flush_heavier_than_block", "efficiency_implausible"]);
    expect(await correctHarvest(asGrower, { ...entry, acceptWarnings: codes }, today)).toMatchObject({ status: "saved" });
    const { rows } = await inspector.query<{ accepted_warnings: string }>("select accepted_warnings from harvests where id = $1", [id]);
    expect(rows[0].accepted_warnings).toMatch(/more than the whole wet block/);
  });

  it("asks before deleting a flush that leaves a gap in the flush numbers", async () => {
    const id = await harvestId("CO-E", 1);
    const answer = await deleteHarvest(asManager, { harvestId: id, reason: "wrong block" });
    expect(answer.status === "warnings" && answer.warnings.map((warning) => [warning.code, warning.field])).toEqual([
      ["flush_gap", "flush"],
    ]);
    expect((await inspector.query("select 1 from harvests where id = $1", [id])).rowCount).toBe(1);
  });

  it("deletes a harvest, its values kept in the history as removed, with the reason", async () => {
    const id = await harvestId("CO-E", 2);
    expect(await deleteHarvest(asManager, { harvestId: id, reason: "entered twice" })).toMatchObject({ status: "deleted" });
    const { rowCount } = await inspector.query("select 1 from harvests where id = $1", [id]);
    expect(rowCount).toBe(0);
    const history = await inspector.query(
      "select flush, field, old_value, new_value, reason from value_changes where block_id = $1 and reason is not null order by id",
      [await blockId("CO-E")],
    );
    expect(history.rows).toEqual([
      { flush: 2, field: "fresh_weight", old_value: "300", new_value: null, reason: "entered twice" },
      { flush: 2, field: "harvested_on", old_value: "2026-04-24", new_value: null, reason: "entered twice" },
    ]);
    const audit = await inspector.query("select subject from audit_events where farm_id = $1 and action = 'harvest.deleted'", [farmId]);
    expect(audit.rows).toEqual([{ subject: "CO-E flush 2" }]);
  });
});

describe("correcting a block's values", () => {
  const form = (id: string, changes: Record<string, unknown> = {}) => ({
    blockId: id,
    wetMass: "2.5 kg",
    wetUnit: "g" as const,
    moisture: "60 %",
    inoculatedOn: "2026-03-01",
    contaminated: false,
    contaminatedOn: "",
    spentMass: "",
    spentUnit: "g" as const,
    notes: "",
    reason: "weighed again",
    acceptWarnings: [] as string[],
    ...changes,
  });

  it("saves the values changed, each in the history with the reason", async () => {
    const id = await blockId("CO-B");
    expect(await correctBlock(asManager, form(id, { wetMass: "2.7 kg", spentMass: "1.9 kg" }), today)).toEqual({
      status: "saved",
      changed: 2,
    });
    const { rows } = await inspector.query(
      "select wet_mass_g::float8 as wet, wet_mass_as_written, spent_mass_g::float8 as spent from blocks where id = $1",
      [id],
    );
    expect(rows[0]).toEqual({ wet: 2700, wet_mass_as_written: "2.7 kg", spent: 1900 });
    const history = await inspector.query(
      "select field, old_value, new_value from value_changes where block_id = $1 and reason = 'weighed again' order by id",
      [id],
    );
    expect(history.rows).toEqual([
      { field: "block_wet_weight", old_value: "2500", new_value: "2700" },
      { field: "spent_weight", old_value: null, new_value: "1900" },
    ]);
  });

  it("refuses an inoculation day after a flush was picked, under that field", async () => {
    const error = await refusal(correctBlock(asManager, form(await blockId("CO-A"), { inoculatedOn: "2026-04-20" }), today));
    expect(error.fieldProblems).toEqual([expect.objectContaining({ field: "inoculatedOn", code: "harvest_before_inoculation" })]);
  });
});

describe("undoing a season-log commit", () => {
  // Changes CO-B's wet weight, adds flush 2 of CO-E, adds block CO-N with a flush.
  const second = [
    header,
    "CO-B,PO-01,HWB-20,2026-03-01,2.8 kg,60 %,SLIT-ACROSS,,,",
    "CO-E,PO-01,HWB-20,2026-03-01,2.5 kg,60 %,SLIT-ACROSS,2,2026-04-25,320 g",
    "CO-N,PO-01,HWB-20,2026-03-05,2.5 kg,60 %,SLIT-ACROSS,1,2026-04-15,450 g",
  ].join("\n");

  it("puts the stored rows back exactly as they were before the commit, recorded as a change", async () => {
    const before = await farmRows();
    const uploadId = await commit(asManager, "corrections-second.csv", second);
    expect(await farmRows()).not.toEqual(before);
    const queued = await refreshesQueued();
    const receipt = await undoCommit(asGrower, { uploadId, reason: "sent last year's sheet" });
    expect(receipt).toMatchObject({ removedBlocks: 1, removedHarvests: 2, restoredRows: 1 });
    expect(await farmRows()).toEqual(before);
    expect(await refreshesQueued()).toBe(queued + 1);

    const history = await inspector.query(
      "select b.code, v.flush, v.field, v.old_value, v.new_value, v.reason from value_changes v join blocks b on b.id = v.block_id where v.reason like 'Undid the commit of corrections-%' order by v.id",
    );
    const reason = "Undid the commit of corrections-second.csv: sent last year's sheet";
    expect(history.rows).toEqual([
      { code: "CO-B", flush: null, field: "block_wet_weight", old_value: "2800", new_value: "2700", reason },
      { code: "CO-E", flush: 2, field: "fresh_weight", old_value: "320", new_value: null, reason },
      { code: "CO-E", flush: 2, field: "harvested_on", old_value: "2026-04-25", new_value: null, reason },
    ]);
    const audit = await inspector.query(
      "select subject, details->'removedBlockCodes' as codes from audit_events where farm_id = $1 and action = 'season-log.undone'",
      [farmId],
    );
    expect(audit.rows).toEqual([{ subject: "corrections-second.csv", codes: ["CO-N"] }]);
    const { rows } = await inspector.query("select undone_at is not null as undone, undone_by from uploads where id = $1", [uploadId]);
    expect(rows[0]).toEqual({ undone: true, undone_by: asGrower.id });

    // Undone once is done: a second undo is refused; the same file may be committed again.
    expect((await refusal(undoCommit(asGrower, { uploadId, reason: "again" }))).code).toBe("conflict");
    await commit(asManager, "corrections-second-again.csv", second);
    const { rowCount } = await inspector.query("select 1 from blocks where farm_id = $1 and code = 'CO-N'", [farmId]);
    expect(rowCount).toBe(1);
  });

  it("is refused, changing nothing, when a later correction changed a value the commit set", async () => {
    const third = [header, "CO-B,PO-01,HWB-20,2026-03-01,2.9 kg,60 %,SLIT-ACROSS,,,"].join("\n");
    const uploadId = await commit(asManager, "corrections-third.csv", third);
    await correctBlock(
      asManager,
      {
        blockId: await blockId("CO-B"),
        wetMass: "2.95 kg",
        wetUnit: "g",
        moisture: "60 %",
        inoculatedOn: "2026-03-01",
        contaminated: false,
        contaminatedOn: "",
        spentMass: "1.9 kg",
        spentUnit: "g",
        notes: "",
        reason: "scale recalibrated",
        acceptWarnings: [],
      },
      today,
    );
    const before = await farmRows();
    const error = await refusal(undoCommit(asManager, { uploadId, reason: "wrong file" }));
    expect(error.code).toBe("conflict");
    expect(error.message).toMatch(/block CO-B/);
    expect(await farmRows()).toEqual(before);
  });

  it("is refused when a later commit changed a harvest the commit added", async () => {
    const fourth = [header, "CO-F,PO-01,HWB-20,2026-03-01,2.5 kg,60 %,SLIT-ACROSS,1,2026-04-10,400 g"].join("\n");
    const fifth = [header, "CO-F,PO-01,HWB-20,2026-03-01,2.5 kg,60 %,SLIT-ACROSS,1,2026-04-10,420 g"].join("\n");
    const uploadId = await commit(asManager, "corrections-fourth.csv", fourth);
    await commit(asManager, "corrections-fifth.csv", fifth);
    const error = await refusal(undoCommit(asManager, { uploadId, reason: "wrong file" }));
    expect(error.code).toBe("conflict");
    expect(error.message).toMatch(/CO-F/);
  });
});

describe("undoing commits in turn", () => {
  const sheet = (wet: string) => [header, `CO-H,PO-01,HWB-20,2026-03-01,${wet},60 %,SLIT-ACROSS,1,2026-04-10,400 g`].join("\n");

  it("undoes the later of two commits, then the earlier one, back to the farm as it was", async () => {
    const before = await farmRows();
    const earlier = await commit(asManager, "corrections-turn-1.csv", sheet("2.5 kg"));
    const later = await commit(asManager, "corrections-turn-2.csv", sheet("2.6 kg"));
    expect((await refusal(undoCommit(asManager, { uploadId: earlier, reason: "both wrong" }))).message).toMatch(/block CO-H/);
    await undoCommit(asManager, { uploadId: later, reason: "both wrong" });
    await undoCommit(asManager, { uploadId: earlier, reason: "both wrong" });
    expect(await farmRows()).toEqual(before);
  });

  it("refuses a commit made before commits kept what they replaced, and an upload never committed", async () => {
    const old = await commit(asManager, "corrections-old.csv", sheet("2.7 kg"));
    await inspector.query("update uploads set kept_for_undo = false where id = $1", [old]);
    expect((await refusal(undoCommit(asManager, { uploadId: old, reason: "old" }))).message).toMatch(/cannot be undone exactly/);
    const unchecked = await upload(asManager, "corrections-never.csv", sheet("2.8 kg"));
    expect((await refusal(undoCommit(asManager, { uploadId: unchecked.upload.id, reason: "never" }))).message).toMatch(/never committed/);
  });
});

describe("re-uploading the grown sheet", () => {
  const sheet = (grams: number) => [header, `CO-G,PO-01,HWB-20,2026-03-01,2.5 kg,60 %,SLIT-ACROSS,1,2026-04-10,${grams} g`].join("\n");

  it("lists the flushes recorded with the phone form that the file lacks, keeps them by default, removes them when asked, and an undo puts them back", async () => {
    await commit(asManager, "corrections-grown-1.csv", sheet(400));
    const phone = await recordHarvest(
      asGrower,
      { blockCode: "CO-G", flush: 2, weight: "300", unit: "g", harvestedOn: "2026-04-24", acceptWarnings: [] },
      today,
    );
    expect(phone.status).toBe("saved");

    const kept = await upload(asManager, "corrections-grown-2.csv", sheet(410));
    expect(kept.report.preview.notInFile).toMatchObject({ phoneForm: 1, otherFiles: 0, harvests: [{ blockCode: "CO-G", flush: 2 }] });
    expect((await commitUpload(asManager, kept.upload.id, {})).removedHarvests).toBe(0);
    expect((await inspector.query("select 1 from harvests where id = $1", [await harvestId("CO-G", 2)])).rowCount).toBe(1);

    const before = await farmRows();
    const removing = await upload(asManager, "corrections-grown-3.csv", sheet(420));
    expect((await commitUpload(asManager, removing.upload.id, {}, { removeNotInFile: true })).removedHarvests).toBe(1);
    const { rows } = await inspector.query(
      "select flush, field, old_value, new_value from value_changes where upload_id = $1 and new_value is null order by id",
      [removing.upload.id],
    );
    expect(rows).toEqual([
      { flush: 2, field: "fresh_weight", old_value: "300", new_value: null },
      { flush: 2, field: "harvested_on", old_value: "2026-04-24", new_value: null },
    ]);
    const remaining = await inspector.query(
      "select h.flush from harvests h join blocks b on b.id = h.block_id where b.farm_id = $1 and b.code = 'CO-G'",
      [farmId],
    );
    expect(remaining.rows).toEqual([{ flush: 1 }]);

    await undoCommit(asManager, { uploadId: removing.upload.id, reason: "the phone flushes were right" });
    expect(await farmRows()).toEqual(before);
  });
});

describe("who may correct", () => {
  const unknown = "0190a0c4-0000-7000-8000-00000000abcd";

  it("gives another farm's manager 'not found' in the same words as for an id that does not exist", async () => {
    const harvest = await harvestId("CO-A", 1);
    const block = await blockId("CO-A");
    const { rows } = await inspector.query<{ id: string }>(
      "select id from uploads where farm_id = $1 and outcome = 'committed' and undone_at is null limit 1",
      [farmId],
    );
    const upload = rows[0].id;
    const before = await farmRows();
    const entry = { weight: "1 kg", unit: "g" as const, harvestedOn: "2026-04-11", reason: "mine now", acceptWarnings: [] };
    // Each pair: another farm's row, then an id that does not exist on the manager's own farm.
    for (const [ours, none] of [
      [
        () => correctHarvest(asOtherManager, { ...entry, harvestId: harvest }, today),
        () => correctHarvest(asManager, { ...entry, harvestId: unknown }, today),
      ],
      [
        () => deleteHarvest(asOtherManager, { harvestId: harvest, reason: "mine now" }),
        () => deleteHarvest(asManager, { harvestId: unknown, reason: "x" }),
      ],
      [
        () => undoCommit(asOtherManager, { uploadId: upload, reason: "mine now" }),
        () => undoCommit(asManager, { uploadId: unknown, reason: "x" }),
      ],
    ] as const) {
      const theirs = await refusal(ours());
      const nothing = await refusal(none());
      expect(theirs.code).toBe("not_found");
      expect(theirs.message).toBe(nothing.message);
    }
    const blockForm = {
      blockId: block,
      wetMass: "9 kg",
      wetUnit: "g" as const,
      moisture: "",
      inoculatedOn: "",
      contaminated: true,
      contaminatedOn: "",
      spentMass: "",
      spentUnit: "g" as const,
      notes: "",
      reason: "mine now",
      acceptWarnings: [],
    };
    const theirs = await refusal(correctBlock(asOtherManager, blockForm, today));
    expect([theirs.code, theirs.message]).toEqual(["not_found", noSuchBlock]);
    expect((await refusal(correctHarvest(asOtherManager, { ...entry, harvestId: harvest }, today))).message).toBe(noSuchHarvest);
    expect((await refusal(undoCommit(asOtherManager, { uploadId: upload, reason: "x" }))).message).toBe(uploadNotFound);
    expect(await farmRows()).toEqual(before);
  });

  it("refuses an observer and the coordinator, and row-level security hides the rows from a forged observer context", async () => {
    const harvest = await harvestId("CO-A", 1);
    for (const context of [asObserver, asCoordinator])
      expect((await refusal(deleteHarvest(context, { harvestId: harvest, reason: "curious" }))).code).toBe("forbidden");
    // An observer's id with the farm's id set: the policies still match no row.
    const forged: Member = { ...asObserver, farmId };
    expect((await refusal(deleteHarvest(forged, { harvestId: harvest, reason: "curious" }))).code).toBe("not_found");
    const { rowCount } = await inspector.query("select 1 from harvests where id = $1", [harvest]);
    expect(rowCount).toBe(1);
  });
});
