import { readFileSync } from "node:fs";
import path from "node:path";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { closeDatabase, withFarmContext } from "@/db/client";
import { listAuditEvents } from "@/lib/data/audit";
import { farmContextOf } from "@/lib/data/context";
import type { Member } from "@/lib/data/members";
import { getBlock, listBlocks, listHarvestTargets, recordHarvest } from "@/lib/data/blocks";
import {
  commitUpload,
  createUpload,
  getImportSetup,
  getTemplateCodes,
  getUploadFile,
  listUploads,
  parseStored,
  recheckUpload,
  type UploadView,
} from "@/lib/data/season-logs";
import { seasonLogTemplateCsv } from "@/lib/import";
import { isAppError } from "@/lib/errors";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import type { ParseChoices } from "@/lib/season-logs/report";
import { databaseRefusal, superuserPool, twoDemoFarms, type DemoFarm, memberOf } from "./support/database";

let inspector: Pool;
let farmA: DemoFarm;
let farmB: DemoFarm;
let asFarmA: Member;
let asFarmB: Member;

beforeAll(async () => {
  inspector = superuserPool();
  [farmA, farmB] = await twoDemoFarms(inspector);
  asFarmA = await memberOf(farmA.managerId);
  asFarmB = await memberOf(farmB.managerId);
});

afterAll(async () => {
  // The commits queued pooled refreshes; run them, so later files find the figures settled.
  await runQueuedJobs(["pooled-refresh"]);
  await stopJobWorkers();
  await inspector.query("drop trigger if exists test_refuse_harvest on harvests");
  await inspector.query("drop function if exists test_refuse_harvest()");
  await inspector.query("drop trigger if exists test_slow_commit on blocks");
  await inspector.query("drop function if exists test_slow_commit()");
  await inspector.end();
  await closeDatabase();
});

const header =
  "block_id,strain,substrate,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight,contaminated,notes";

/** A season log of `blocks` blocks named <prefix>-<n>, each with `flushes` harvests of `fresh` grams (flush 1). */
function sheet(prefix: string, blocks: number[], options: { flushes?: number; fresh?: (block: number) => number } = {}): string {
  const lines = [header];
  for (const block of blocks) {
    const fresh = options.fresh?.(block) ?? 400 + block;
    for (let flush = 1; flush <= (options.flushes ?? 2); flush++) {
      lines.push(
        `${prefix}-${block},PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,${flush},2026-04-${String(flush * 10).padStart(2, "0")},${flush === 1 ? fresh : 250} g,no,`,
      );
    }
  }
  return `${lines.join("\r\n")}\r\n`;
}

async function upload(context: Member, text: string, fileName = "season.csv", choices: ParseChoices = {}): Promise<UploadView> {
  const content = new TextEncoder().encode(text);
  const setup = await getImportSetup(context);
  return createUpload(context, { fileName, content, result: await parseStored(content, setup, choices), choices });
}

async function storedHarvests(farm: DemoFarm, prefix: string) {
  const { rows } = await inspector.query<{ code: string; flush: number; fresh: string }>(
    `select substr(b.code, length($2) + 1) as code, h.flush, h.fresh_mass_g::text as fresh
     from harvests h join blocks b on b.id = h.block_id where b.farm_id = $1 and b.code like $2 || '%' order by 1, 2`,
    [farm.id, prefix],
  );
  return rows;
}

async function historyCount(farm: DemoFarm, prefix: string): Promise<number> {
  const { rows } = await inspector.query<{ count: string }>(
    "select count(*) from value_changes v join blocks b on b.id = v.block_id where b.farm_id = $1 and b.code like $2 || '%'",
    [farm.id, prefix],
  );
  return Number(rows[0].count);
}

async function refusal(work: Promise<unknown>): Promise<{ code: string; message: string }> {
  try {
    await work;
  } catch (error) {
    if (isAppError(error)) return { code: error.code, message: error.message };
    throw error;
  }
  throw new Error("the commit went through where it should have been refused");
}

describe("committing a season log", () => {
  it("stores the file, previews the change and commits blocks and harvests in one go", async () => {
    const view = await upload(asFarmA, sheet("IT-A", [1, 2, 3]));
    expect(view.report.errorCount).toBe(0);
    expect(view.canCommit).toBe(true);
    expect(view.report.preview.counts).toMatchObject({ newBlocks: 3, newHarvests: 6, changedBlocks: 0, changedHarvests: 0 });

    const { rows: kept } = await inspector.query<{ sha256: string; size_bytes: number; outcome: string }>(
      "select sha256, size_bytes, outcome from uploads where id = $1",
      [view.upload.id],
    );
    expect(kept[0]).toMatchObject({ outcome: "received" });
    expect(kept[0].sha256).toMatch(/^[0-9a-f]{64}$/);

    const receipt = await commitUpload(asFarmA, view.upload.id, {});
    expect(receipt.counts).toMatchObject({ newBlocks: 3, newHarvests: 6 });
    expect(await storedHarvests(farmA, "IT-A")).toHaveLength(6);
    const { rows: blocks } = await inspector.query(
      "select wet_mass_g::float8 as wet, wet_mass_as_written, moisture::float8 as moisture, trial_arm_id from blocks where farm_id = $1 and code = 'IT-A-1'",
      [farmA.id],
    );
    expect(blocks[0]).toMatchObject({ wet: 2500, wet_mass_as_written: "2500 g", moisture: 0.62, trial_arm_id: null });
    const { rows: audit } = await inspector.query(
      "select details from audit_events where action = 'season-log.committed' and details->>'uploadId' = $1",
      [view.upload.id],
    );
    expect(audit).toHaveLength(1);
  });

  it("says when the same file was already imported and changes nothing", async () => {
    const text = sheet("IT-R", [1, 2]);
    const first = await upload(asFarmA, text, "repeat.csv");
    await commitUpload(asFarmA, first.upload.id, {});
    const before = await storedHarvests(farmA, "IT-R");

    const again = await upload(asFarmA, text, "repeat-again.csv");
    expect(again.alreadyImportedAt).not.toBeNull();
    expect(again.upload.outcome).toBe("already_imported");
    expect(again.canCommit).toBe(false);
    expect(again.report.preview.counts).toMatchObject({
      newBlocks: 0,
      newHarvests: 0,
      changedBlocks: 0,
      changedHarvests: 0,
      untouchedHarvests: 4,
    });
    expect((await refusal(commitUpload(asFarmA, again.upload.id, {}))).message).toContain("already imported on");
    expect(await storedHarvests(farmA, "IT-R")).toEqual(before);
    expect(await historyCount(farmA, "IT-R")).toBe(0);
  });

  it("updates from a grown sheet and keeps each replaced value with who, when and which upload", async () => {
    const first = await upload(asFarmA, sheet("IT-G", [1, 2], { flushes: 1 }));
    await commitUpload(asFarmA, first.upload.id, {});
    const grown = await upload(asFarmA, sheet("IT-G", [1, 2], { flushes: 2, fresh: (block) => (block === 1 ? 480 : 400 + block) }));
    expect(grown.report.preview.counts).toMatchObject({ newHarvests: 2, changedHarvests: 1, untouchedHarvests: 1 });
    expect(grown.report.preview.changes).toEqual([
      { blockCode: "IT-G-1", flush: 1, field: "fresh_weight", oldValue: "401", newValue: "480" },
    ]);
    await commitUpload(asFarmA, grown.upload.id, {});

    expect(await storedHarvests(farmA, "IT-G")).toEqual([
      { code: "-1", flush: 1, fresh: "480" },
      { code: "-1", flush: 2, fresh: "250" },
      { code: "-2", flush: 1, fresh: "402" },
      { code: "-2", flush: 2, fresh: "250" },
    ]);
    const { rows: history } = await inspector.query(
      "select v.field, v.flush, v.old_value, v.new_value, v.upload_id, v.changed_by from value_changes v join blocks b on b.id = v.block_id where b.code = 'IT-G-1'",
    );
    expect(history).toEqual([
      { field: "fresh_weight", flush: 1, old_value: "401", new_value: "480", upload_id: grown.upload.id, changed_by: farmA.managerId },
    ]);
  });

  it("commits what the file says under the commit's own choices, not the rows planned at upload", async () => {
    const text = `${header}\r\nIT-D-1,PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-10,1.500 g,no,\r\n`;
    const view = await upload(asFarmA, text, "decimal.csv", { decimal: "." });
    expect(view.canCommit).toBe(true);
    const kept = async () =>
      (await inspector.query<{ kept: boolean }>("select commit_rows is not null as kept from uploads where id = $1", [view.upload.id]))
        .rows[0].kept;
    expect(await kept()).toBe(true);
    // With a decimal comma, "1.500 g" is 1 500 g; the rows planned at upload (decimal point) said 1.5 g.
    await commitUpload(asFarmA, view.upload.id, { decimal: "," });
    expect(await storedHarvests(farmA, "IT-D")).toEqual([{ code: "-1", flush: 1, fresh: "1500" }]);
    expect(await kept()).toBe(false);
  });

  it("writes the rows planned at upload while nothing changed, without reading the file again", async () => {
    const view = await upload(asFarmA, sheet("IT-KP", [1, 2]), "kept-plan.csv");
    expect(view.canCommit).toBe(true);
    // Were the file read again, this would be committed: an unreadable cell in every row.
    await inspector.query("update uploads set content = convert_to('block_id\nnot a season log', 'UTF8') where id = $1", [view.upload.id]);
    const receipt = await commitUpload(asFarmA, view.upload.id, {});
    expect(receipt.counts).toMatchObject({ newBlocks: 2, newHarvests: 4 });
    expect(await storedHarvests(farmA, "IT-KP")).toEqual([
      { code: "-1", flush: 1, fresh: "401" },
      { code: "-1", flush: 2, fresh: "250" },
      { code: "-2", flush: 1, fresh: "402" },
      { code: "-2", flush: 2, fresh: "250" },
    ]);
  });

  it("plans again when the farm's data changed after the upload: a phone harvest in between is replaced, with history, not doubled", async () => {
    await commitUpload(asFarmA, (await upload(asFarmA, sheet("IT-KQ", [1], { flushes: 1 }), "kq-1.csv")).upload.id, {});
    const view = await upload(asFarmA, sheet("IT-KQ", [1], { flushes: 2 }), "kq-2.csv");
    expect(view.report.preview.counts).toMatchObject({ newHarvests: 1 });
    // The grower weighs flush 2 on the phone before the file is committed: planned at upload, the
    // file's flush 2 was a new row, and inserting it now would break the one-harvest-per-flush key.
    await recordHarvest(
      asFarmA,
      { blockCode: "IT-KQ-1", flush: 2, harvestedOn: "2026-04-20", weight: "333", unit: "g", acceptWarnings: [] },
      "2026-04-20",
    );
    const receipt = await commitUpload(asFarmA, view.upload.id, {});
    expect(receipt.counts).toMatchObject({ newHarvests: 0, changedHarvests: 1 });
    expect(await storedHarvests(farmA, "IT-KQ")).toEqual([
      { code: "-1", flush: 1, fresh: "401" },
      { code: "-1", flush: 2, fresh: "250" },
    ]);
    const { rows } = await inspector.query<{ old_value: string; new_value: string }>(
      `select v.old_value, v.new_value from value_changes v join blocks b on b.id = v.block_id
       where b.code = 'IT-KQ-1' and v.flush = 2 and v.upload_id = $1`,
      [view.upload.id],
    );
    expect(rows).toContainEqual({ old_value: "333", new_value: "250" });
  });

  it("moves a farm's data version with each statement that writes its rows, and shows it to that farm alone", async () => {
    const versionOf = async (member: Member) =>
      withFarmContext(
        farmContextOf(member),
        async (tx) => (await tx.execute<{ version: string }>(sql`select version::text from farm_data_versions`)).rows,
      );
    const before = await versionOf(asFarmA);
    expect(before).toHaveLength(1);
    await recordHarvest(
      asFarmA,
      { blockCode: "IT-KQ-1", flush: 3, harvestedOn: "2026-05-01", weight: "120", unit: "g", acceptWarnings: [] },
      "2026-05-01",
    );
    expect(Number((await versionOf(asFarmA))[0].version)).toBeGreaterThan(Number(before[0].version));
    // Farm B sees its own number only, and cannot move farm A's.
    expect((await versionOf(asFarmB)).length).toBeLessThanOrEqual(1);
    const moved = await withFarmContext(farmContextOf(asFarmB), (tx) =>
      tx.execute(sql`update farm_data_versions set version = version + 1 where farm_id = ${farmA.id}::uuid`),
    );
    expect(moved.rowCount).toBe(0);
  });

  it("refuses to commit a file with errors and saves nothing from it", async () => {
    const view = await upload(asFarmA, `${header}\r\nIT-E-1,PO-01,HWB-20,2026-03-01,2500 g,62 %,,1,2026-04-10,-5 g,no,\r\n`);
    expect(view.report.errorCount).toBeGreaterThan(0);
    expect(view.canCommit).toBe(false);
    expect((await refusal(commitUpload(asFarmA, view.upload.id, {}))).code).toBe("invalid_input");
    const { rows } = await inspector.query<{ count: number }>("select count(*)::int as count from blocks where code like 'IT-E-%'");
    expect(rows[0].count).toBe(0);
  });

  it("leaves nothing behind when the database refuses a row half-way through the commit", async () => {
    // A test-only trigger refuses one harvest, after the blocks have been written in the same transaction.
    await inspector.query(`create function test_refuse_harvest() returns trigger language plpgsql as $$
      begin if new.fresh_mass_g = 777 then raise exception 'test refuses this harvest'; end if; return new; end $$`);
    await inspector.query(
      "create trigger test_refuse_harvest before insert or update on harvests for each row execute function test_refuse_harvest()",
    );
    try {
      const view = await upload(asFarmA, sheet("IT-F", [1, 2, 3], { fresh: (block) => (block === 3 ? 777 : 500) }));
      expect(view.canCommit).toBe(true);
      await expect(commitUpload(asFarmA, view.upload.id, {})).rejects.toThrow();
      const { rows: blocks } = await inspector.query<{ count: number }>(
        "select count(*)::int as count from blocks where code like 'IT-F-%'",
      );
      expect(blocks[0].count).toBe(0);
      const { rows: kept } = await inspector.query("select outcome, committed_at from uploads where id = $1", [view.upload.id]);
      expect(kept[0]).toEqual({ outcome: "received", committed_at: null });
      const { rows: audit } = await inspector.query<{ count: number }>(
        "select count(*)::int as count from audit_events where action = 'season-log.committed' and details->>'uploadId' = $1",
        [view.upload.id],
      );
      expect(audit[0].count).toBe(0);
    } finally {
      await inspector.query("drop trigger if exists test_refuse_harvest on harvests");
      await inspector.query("drop function if exists test_refuse_harvest()");
    }
  });

  it("ends two concurrent overlapping commits for one farm as if they ran one after the other", async () => {
    const first = (prefix: string) =>
      sheet(
        prefix,
        Array.from({ length: 30 }, (_, index) => index + 1),
        { fresh: () => 500 },
      );
    const second = (prefix: string) =>
      sheet(
        prefix,
        Array.from({ length: 30 }, (_, index) => index + 16),
        { fresh: () => 600 },
      );

    const inTurnA = [await upload(asFarmA, first("IT-SA")), await upload(asFarmA, second("IT-SA"))];
    for (const view of inTurnA) await commitUpload(asFarmA, view.upload.id, {});
    const inTurnB = [await upload(asFarmA, second("IT-SB")), await upload(asFarmA, first("IT-SB"))];
    for (const view of inTurnB) await commitUpload(asFarmA, view.upload.id, {});

    const together = [await upload(asFarmA, first("IT-CC")), await upload(asFarmA, second("IT-CC"))];
    // A test-only pause after each block write keeps the first commit open while the second one starts.
    await inspector.query(
      "create function test_slow_commit() returns trigger language plpgsql as $$ begin perform pg_sleep(0.5); return null; end $$",
    );
    await inspector.query("create trigger test_slow_commit after insert on blocks for each statement execute function test_slow_commit()");
    try {
      await Promise.all(together.map((view) => commitUpload(asFarmA, view.upload.id, {})));
    } finally {
      await inspector.query("drop trigger if exists test_slow_commit on blocks");
      await inspector.query("drop function if exists test_slow_commit()");
    }

    const concurrent = { harvests: await storedHarvests(farmA, "IT-CC"), history: await historyCount(farmA, "IT-CC") };
    const oneOrder = { harvests: await storedHarvests(farmA, "IT-SA"), history: await historyCount(farmA, "IT-SA") };
    const otherOrder = { harvests: await storedHarvests(farmA, "IT-SB"), history: await historyCount(farmA, "IT-SB") };
    expect(oneOrder.history).toBe(15);
    expect([oneOrder, otherOrder]).toContainEqual(concurrent);
  });
});

describe("a spreadsheet file", () => {
  it("keeps the .xlsx as sent, asks for the sheet, then commits its typed cells and a re-upload changes nothing", async () => {
    // Written by LibreOffice Calc 7.4 under de-DE (tests/fixtures/spreadsheets/README.md), two sheets.
    const content = new Uint8Array(readFileSync(path.resolve(__dirname, "../fixtures/spreadsheets/e2e-fernbrook-de-DE.xlsx")));
    const setup = await getImportSetup(asFarmA);
    const view = await createUpload(asFarmA, {
      fileName: "fernbrook.xlsx",
      content,
      result: await parseStored(content, setup, {}),
      choices: {},
    });
    expect(view.report.issues.map((issue) => issue.code)).toEqual(["sheet_choice_needed"]);
    expect(view.canCommit).toBe(false);
    expect(new Uint8Array((await getUploadFile(asFarmA, view.upload.id)).content)).toEqual(content);

    const checked = await recheckUpload(asFarmA, view.upload.id, { sheet: "Harvests" });
    expect(checked.report.errorCount).toBe(0);
    expect(checked.report.detected.workbook).toEqual({ kind: "xlsx", sheet: "Harvests", sheets: ["Harvests", "Rooms"] });
    const receipt = await commitUpload(asFarmA, view.upload.id, { sheet: "Harvests" });
    expect(receipt.counts).toMatchObject({ newBlocks: 2, newHarvests: 3 });
    // Checked twice, committed once: one row in the past uploads, the last check folded into it.
    const listed = (await listUploads(asFarmA)).filter((item) => item.id === view.upload.id);
    expect(listed).toHaveLength(1);
    expect(listed[0]).toMatchObject({ sentBy: asFarmA.name, outcomeWords: "Committed" });
    expect(listed[0].details).toEqual(
      expect.arrayContaining([
        { label: "Last check", value: "3 rows, 0 errors and 0 warnings" },
        { label: "The commit changed", value: "2 new blocks and 3 new harvests" },
      ]),
    );
    // The farm's activity log says it in words, with a link to the file.
    const logged = (await listAuditEvents(asFarmA, "farm")).filter(
      (event) => event.link?.href === `/api/season-logs/${view.upload.id}/file`,
    );
    expect(logged.map((event) => event.sentence)).toEqual([
      `${asFarmA.name} committed the season log 'fernbrook.xlsx': 2 new blocks and 3 new harvests.`,
      `${asFarmA.name} uploaded the season log 'fernbrook.xlsx': 3 rows, 1 error and 0 warnings.`,
    ]);
    // 0,612 kg as a number cell is 612 g; the dates came as dates, the moisture as 62 %.
    expect(await storedHarvests(farmA, "XL-")).toEqual([
      { code: "01", flush: 1, fresh: "612" },
      { code: "01", flush: 2, fresh: "380" },
      { code: "02", flush: 1, fresh: "540" },
    ]);
    const { rows } = await inspector.query<{ inoculated: string; moisture: string; written: string }>(
      "select inoculated_on::text as inoculated, moisture::text, wet_mass_as_written as written from blocks where farm_id = $1 and code = 'XL-01'",
      [farmA.id],
    );
    expect(rows[0]).toMatchObject({ inoculated: "2026-03-02", written: "2500" });
    expect(Number(rows[0].moisture)).toBeCloseTo(0.62, 6);

    const again = await createUpload(asFarmA, {
      fileName: "fernbrook-again.xlsx",
      content,
      result: await parseStored(content, setup, { sheet: "Harvests" }),
      choices: { sheet: "Harvests" },
    });
    expect(again.alreadyImportedAt).not.toBeNull();
    expect(again.canCommit).toBe(false);
  });
});

describe("the downloadable template", () => {
  it("uses the co-op's own codes, so a farm can upload it as it stands", async () => {
    const codes = await getTemplateCodes(asFarmA);
    expect(codes.strains).toContain("PO-01");
    const view = await upload(asFarmA, seasonLogTemplateCsv(codes), "season-log-template.csv");
    expect(view.report.errorCount).toBe(0);
    expect(view.canCommit).toBe(true);
    expect(view.report.preview.counts).toMatchObject({ newBlocks: 2, newHarvests: 2 });
  });
});

describe("season logs between farms", () => {
  it("never shows farm B farm A's uploads, files or rows", async () => {
    const view = await upload(asFarmA, sheet("IT-P", [1]), "private.csv");
    await commitUpload(asFarmA, view.upload.id, {});

    expect((await listUploads(asFarmB)).map((item) => item.id)).not.toContain(view.upload.id);
    expect((await listUploads(asFarmA)).map((item) => item.id)).toContain(view.upload.id);
    expect((await refusal(getUploadFile(asFarmB, view.upload.id))).code).toBe("not_found");
    expect((await refusal(commitUpload(asFarmB, view.upload.id, {}))).code).toBe("not_found");

    // Farm B sends a sheet with farm A's block code: it becomes farm B's own new block, and A's rows do not show.
    const fromB = await upload(asFarmB, sheet("IT-P", [1]), "private.csv");
    expect(fromB.alreadyImportedAt).toBeNull();
    expect(fromB.report.preview.counts).toMatchObject({ newBlocks: 1, newHarvests: 2 });
  });
});

describe("the quick harvest form's data", () => {
  it("suggests the next flush, records it, refuses the same flush twice and keeps farms apart", async () => {
    const view = await upload(asFarmA, sheet("IT-Q", [1], { flushes: 1 }), "quick.csv");
    await commitUpload(asFarmA, view.upload.id, {});
    expect((await listHarvestTargets(asFarmA)).find((target) => target.code === "IT-Q-1")?.nextFlush).toBe(2);

    const saved = await recordHarvest(
      asFarmA,
      { blockCode: "IT-Q-1", flush: 2, harvestedOn: "2026-05-01", weight: "310", unit: "g", acceptWarnings: [] },
      "2026-05-01",
    );
    if (saved.status !== "saved") throw new Error(`expected the flush saved, got ${JSON.stringify(saved)}`);
    const blockId = saved.blockId;
    const block = await getBlock(asFarmA, blockId);
    expect(block.harvests.map((harvest) => [harvest.flush, harvest.freshMassG])).toEqual([
      [1, 401],
      [2, 310],
    ]);
    // 2500 g wet at 62 % moisture is 950 g dry substrate; 711 g fresh over it is 74.8 % biological efficiency.
    expect(block.biologicalEfficiency).toBeCloseTo((711 / 950) * 100, 6);
    expect((await listBlocks(asFarmA)).find((row) => row.code === "IT-Q-1")?.flushes).toBe(2);

    const again = await refusal(
      recordHarvest(
        asFarmA,
        { blockCode: "IT-Q-1", flush: 2, harvestedOn: "2026-05-02", weight: "999", unit: "g", acceptWarnings: [] },
        "2026-05-02",
      ),
    );
    expect(again.code).toBe("invalid_input");
    const fromB = await refusal(
      recordHarvest(
        asFarmB,
        { blockCode: "IT-Q-1", flush: 3, harvestedOn: "2026-05-02", weight: "100", unit: "g", acceptWarnings: [] },
        "2026-05-02",
      ),
    );
    expect(fromB.code).toBe("invalid_input");
    expect((await refusal(getBlock(asFarmB, blockId))).code).toBe("not_found");
  });
});

/** Temporary tables a commit staged its rows in, in any session: they must not outlive its transaction. */
async function stagingTablesLeft(): Promise<number> {
  const { rows } = await inspector.query<{ count: number }>(
    "select count(*)::int as count from pg_class where relpersistence = 't' and relname like 'commit\\_%'",
  );
  return rows[0].count;
}

describe("the commit's rows staged by COPY", () => {
  it("leaves nothing when a constraint refuses a row half-way through a large commit, and commits once the row may go in", async () => {
    // A test-only check refuses one harvest in the middle of 3 000, so the COPY and the block insert have run by then.
    await inspector.query("alter table harvests add constraint test_refuse_777 check (fresh_mass_g <> 777) not valid");
    const blockNumbers = Array.from({ length: 1500 }, (_, index) => index + 1);
    const view = await upload(asFarmA, sheet("IT-K", blockNumbers, { fresh: (block) => (block === 750 ? 777 : 500) }), "large.csv");
    expect(view.canCommit).toBe(true);
    try {
      expect(await databaseRefusal(commitUpload(asFarmA, view.upload.id, {}))).toContain("test_refuse_777");
      const { rows } = await inspector.query<{ blocks: number; harvests: number; history: number }>(
        `select (select count(*)::int from blocks where code like 'IT-K-%') as blocks,
           (select count(*)::int from harvests where upload_id = $1) as harvests,
           (select count(*)::int from value_changes where upload_id = $1) as history`,
        [view.upload.id],
      );
      expect(rows[0]).toEqual({ blocks: 0, harvests: 0, history: 0 });
      const { rows: kept } = await inspector.query("select outcome, committed_at from uploads where id = $1", [view.upload.id]);
      expect(kept[0]).toEqual({ outcome: "received", committed_at: null });
      expect(await stagingTablesLeft()).toBe(0);
    } finally {
      await inspector.query("alter table harvests drop constraint if exists test_refuse_777");
    }
    const receipt = await commitUpload(asFarmA, view.upload.id, {});
    expect(receipt.counts).toMatchObject({ newBlocks: 1500, newHarvests: 3000 });
    expect(await stagingTablesLeft()).toBe(0);
    const { rows: stored } = await inspector.query<{ count: number }>(
      "select count(*)::int as count from harvests h join blocks b on b.id = h.block_id and b.farm_id = h.farm_id where h.upload_id = $1 and b.farm_id = $2",
      [view.upload.id, farmA.id],
    );
    expect(stored[0].count).toBe(3000);
  });

  it("changes nothing when the same rows come again in another file", async () => {
    const text = sheet("IT-S", [1, 2, 3, 4]);
    await commitUpload(asFarmA, (await upload(asFarmA, text, "same-rows.csv")).upload.id, {});
    const stored = async () =>
      (
        await inspector.query<Record<string, unknown>>(
          `select b.code, b.updated_at, b.last_upload_id, h.flush, h.fresh_mass_g::text, h.updated_at as harvest_updated, h.upload_id
           from blocks b join harvests h on h.block_id = b.id where b.farm_id = $1 and b.code like 'IT-S-%' order by 1, 4`,
          [farmA.id],
        )
      ).rows;
    const before = await stored();
    // The same rows in another order: another file (another SHA-256), so it is not refused as already imported.
    const [head, ...lines] = text.trimEnd().split("\r\n");
    const again = await upload(asFarmA, `${[head, ...lines.reverse()].join("\r\n")}\r\n`, "same-rows-reordered.csv");
    expect(again.canCommit).toBe(true);
    const receipt = await commitUpload(asFarmA, again.upload.id, {});
    expect(receipt.counts).toMatchObject({ newBlocks: 0, changedBlocks: 0, newHarvests: 0, changedHarvests: 0, untouchedHarvests: 8 });
    expect(receipt.changedValues).toBe(0);
    expect(await stored()).toEqual(before);
    expect(await historyCount(farmA, "IT-S-")).toBe(0);
  });

  it("keeps history as the plan says it, value for value, and a note's tab, backslash and line break as written", async () => {
    const first = `${header}\r\nIT-H-1,PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-10,500 g,no,first note\r\n`;
    await commitUpload(asFarmA, (await upload(asFarmA, first, "history-1.csv")).upload.id, {});
    const note = 'bag split\tat the seam\\ see "photo 2"\nsecond line';
    const second = `${header}\r\nIT-H-1,PO-01,HWB-20,2026-03-02,2.6 kg,60 %,SLIT-ACROSS,1,2026-04-11,1 lb,no,"${note.replace(/"/g, '""')}"\r\n`;
    const view = await upload(asFarmA, second, "history-2.csv");
    expect(view.canCommit).toBe(true);
    const receipt = await commitUpload(asFarmA, view.upload.id, {});
    expect(receipt.changedValues).toBe(view.report.preview.changes.length);
    expect(view.report.preview.changes.length).toBeGreaterThanOrEqual(5);
    const { rows: history } = await inspector.query<{
      change: Record<string, unknown>;
      upload_id: string;
      changed_by: string;
      farm_id: string;
    }>(
      `select json_build_object('blockCode', b.code, 'flush', v.flush, 'field', v.field, 'oldValue', v.old_value, 'newValue', v.new_value) as change,
         v.upload_id, v.changed_by, v.farm_id
       from value_changes v join blocks b on b.id = v.block_id where b.code = 'IT-H-1' and b.farm_id = $1 order by v.id`,
      [farmA.id],
    );
    expect(history.map((row) => row.change)).toEqual(view.report.preview.changes);
    for (const row of history) expect(row).toMatchObject({ upload_id: view.upload.id, changed_by: farmA.managerId, farm_id: farmA.id });
    const { rows: block } = await inspector.query(
      `select b.notes, b.wet_mass_as_written, h.fresh_mass_as_written, h.fresh_mass_g::float8 as fresh
       from blocks b join harvests h on h.block_id = b.id where b.code = 'IT-H-1' and b.farm_id = $1`,
      [farmA.id],
    );
    expect(block[0]).toEqual({ notes: note, wet_mass_as_written: "2.6 kg", fresh_mass_as_written: "1 lb", fresh: 453.59237 });
  });
});

describe("the tenant key: a harvest's block is of the harvest's own farm", () => {
  it("refuses the superuser a harvest or a value change of farm A on farm B's block, though it bypasses row-level security", async () => {
    await commitUpload(asFarmB, (await upload(asFarmB, sheet("IT-T", [1], { flushes: 1 }), "tenant.csv")).upload.id, {});
    const { rows } = await inspector.query<{ id: string }>("select id from blocks where farm_id = $1 and code = 'IT-T-1'", [farmB.id]);
    const farmBBlock = rows[0].id;
    expect(
      await databaseRefusal(
        inspector.query("insert into harvests (farm_id, block_id, flush, fresh_mass_g) values ($1, $2, 5, 100)", [farmA.id, farmBBlock]),
      ),
    ).toContain("harvests_block_farm_fk");
    expect(
      await databaseRefusal(
        inspector.query("insert into value_changes (farm_id, block_id, field, old_value, new_value) values ($1, $2, 'notes', 'a', 'b')", [
          farmA.id,
          farmBBlock,
        ]),
      ),
    ).toContain("value_changes_block_farm_fk");
    // Nor may a stored harvest be moved to another farm while its block stays.
    expect(
      await databaseRefusal(inspector.query("update harvests set farm_id = $1 where block_id = $2", [farmA.id, farmBBlock])),
    ).toContain("harvests_block_farm_fk");
    const { rows: kept } = await inspector.query<{ farm_id: string }>("select farm_id from harvests where block_id = $1", [farmBBlock]);
    expect(kept).toEqual([{ farm_id: farmB.id }]);
  });
});
