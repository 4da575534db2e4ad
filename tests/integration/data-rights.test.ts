import { strFromU8, unzipSync } from "fflate";
import { createHash } from "node:crypto";
import Papa from "papaparse";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { exportFarmData, withdrawFarmData } from "@/lib/data/data-rights";
import { refreshPooledStatistics } from "@/lib/data/pooled-refresh";
import { loadMember, type Member } from "@/lib/data/members";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { superuserPool } from "./support/database";

let inspector: Pool;
const run = Date.now().toString(36);
// A farm of this test's own, so that exporting and withdrawing leave the demo farms as they are.
const farmName = `Zinnia Fields ${run}`;
const managerEmail = `manager-${run}@zinnia.example`;
let farmId: string;

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = $1", [email]);
  return (await loadMember(rows[0].id))!;
}

function csvRows(files: Record<string, Uint8Array>, name: string): Record<string, string>[] {
  return Papa.parse<Record<string, string>>(strFromU8(files[name]), { header: true, skipEmptyLines: true }).data;
}

beforeAll(async () => {
  inspector = superuserPool();
  farmId = (await inspector.query<{ id: string }>("insert into farms (name, region) values ($1, 'Alder Heights') returning id", [farmName]))
    .rows[0].id;
  await inspector.query("insert into users (email, name, role, farm_id) values ($1, 'Rosa Vidal', 'farm_manager', $2)", [
    managerEmail,
    farmId,
  ]);
  const strain = (await inspector.query<{ id: string }>("select id from strains where code = 'PO-01'")).rows[0].id;
  for (let index = 1; index <= 4; index += 1) {
    const block = await inspector.query<{ id: string }>(
      "insert into blocks (farm_id, code, strain_id, wet_mass_g, moisture, inoculated_on) values ($1, $2, $3, 2500, 0.62, '2026-03-01') returning id",
      [farmId, `ZF-${index}`, strain],
    );
    await inspector.query(
      "insert into harvests (farm_id, block_id, flush, harvested_on, fresh_mass_g) values ($1, $2, 1, '2026-04-01', $3), ($1, $2, 2, '2026-04-20', $4)",
      [farmId, block.rows[0].id, 500 + index * 10, 200 + index],
    );
  }
  // It ran the published demo trial and has joined the one still open for enrolment.
  await inspector.query(
    `insert into trial_enrolments (trial_id, farm_id, status, blocks_per_arm)
     select id, $1, 'accepted', 2 from trials where code in ('T-2026-01', 'T-2026-02')`,
    [farmId],
  );
  await refreshPooledStatistics(farmId);
});

async function withdrawalsNoted(): Promise<Record<string, { status: string; noted: number }>> {
  const { rows } = await inspector.query<{ code: string; status: string; noted: number }>(
    "select code, status, withdrawals_after_publication as noted from trials where code in ('T-2026-01', 'T-2026-02')",
  );
  return Object.fromEntries(rows.map((row) => [row.code, { status: row.status, noted: row.noted }]));
}

afterAll(async () => {
  await inspector.end();
  await stopJobWorkers();
  await closeDatabase();
});

describe("a farm's data download", () => {
  it("holds exactly the farm's blocks, harvests, uploads and activity, and nothing of other farms", async () => {
    const manager = await memberByEmail(managerEmail);
    // An original file of the farm's own, to find byte for byte in the download.
    const content = Buffer.from("block,strain\r\nFB-X1,PO-01\r\n");
    await inspector.query(
      "insert into uploads (farm_id, file_name, content, sha256, size_bytes) values ($1, 'spring log.csv', $2, $3, $4)",
      [manager.farmId, content, createHash("sha256").update(content).digest("hex"), content.length],
    );

    const hollowOak = await memberByEmail("manager@hollowoak.example");
    // A farm event of another farm, which must stay out of this farm's download.
    await inspector.query(
      "insert into audit_events (farm_id, action, subject) values ($1, 'test.own', 'own-event'), ($2, 'test.other', 'other-farm-event')",
      [manager.farmId, hollowOak.farmId],
    );

    const { fileName, zip } = await exportFarmData(manager);
    expect(fileName).toMatch(new RegExp(`^zinnia-fields-${run}-data-\\d{4}-\\d{2}-\\d{2}\\.zip$`));
    const files = unzipSync(zip);
    expect(Object.keys(files)).toEqual(
      expect.arrayContaining(["README.txt", "blocks.csv", "harvests.csv", "uploads.csv", "value-changes.csv", "activity.csv"]),
    );

    const own = await inspector.query<{ code: string }>("select code from blocks where farm_id = $1 order by code", [manager.farmId]);
    const others = await inspector.query<{ code: string }>("select code from blocks where farm_id <> $1", [manager.farmId]);
    expect(csvRows(files, "blocks.csv").map((row) => row.block)).toEqual(own.rows.map((row) => row.code));
    const ownCodes = new Set(own.rows.map((row) => row.code));
    const foreign = others.rows.map((row) => row.code).filter((code) => !ownCodes.has(code));
    const exportedText = Object.values(files)
      .map((bytes) => strFromU8(bytes))
      .join("\n");
    for (const code of foreign.slice(0, 50)) expect(exportedText).not.toContain(`${code},`);

    const harvestCount = await inspector.query<{ n: number; grams: number }>(
      "select count(*)::int as n, sum(fresh_mass_g)::float as grams from harvests where farm_id = $1",
      [manager.farmId],
    );
    const harvests = csvRows(files, "harvests.csv");
    expect(harvests.length).toBe(harvestCount.rows[0].n);
    expect(harvests.reduce((sum, row) => sum + Number(row.fresh_mass_g), 0)).toBeCloseTo(harvestCount.rows[0].grams, 3);

    const uploadsCsv = csvRows(files, "uploads.csv");
    const mine = uploadsCsv.find((row) => row.file_name === "spring log.csv")!;
    expect(Buffer.from(files[mine.file_in_download]).equals(content)).toBe(true);

    const activity = csvRows(files, "activity.csv").map((row) => row.subject);
    expect(activity).toContain("own-event");
    expect(activity).not.toContain("other-farm-event");
    expect(strFromU8(files["README.txt"])).toContain("fresh_mass_g: ");

    const logged = await inspector.query("select 1 from audit_events where farm_id = $1 and action = 'farm.data-exported'", [
      manager.farmId,
    ]);
    expect(logged.rowCount).toBeGreaterThan(0);
  });

  it("is refused to a grower", async () => {
    const grower = await memberByEmail("grower@fernbrook.example");
    await expect(exportFarmData(grower)).rejects.toThrow(/farm manager/);
  });
});

describe("withdrawing a farm's data", () => {
  it("needs the farm's name typed, and changes nothing without it", async () => {
    const manager = await memberByEmail(managerEmail);
    const before = await inspector.query<{ n: number }>("select count(*)::int as n from blocks where farm_id = $1", [manager.farmId]);
    await expect(withdrawFarmData(manager, "yes")).rejects.toThrow(/does not match/);
    const after = await inspector.query<{ n: number }>("select count(*)::int as n from blocks where farm_id = $1", [manager.farmId]);
    expect(after.rows[0].n).toBe(before.rows[0].n);
  });

  it("deletes the farm's rows, drops it from the pooled statistics, and keeps the record of the withdrawal", async () => {
    const manager = await memberByEmail(managerEmail);
    const otherFarms = await inspector.query<{ n: number }>("select count(*)::int as n from blocks where farm_id <> $1", [farmId]);
    const pooledTable = await inspector.query("select 1 from pg_tables where tablename = 'farm_strain_statistics'");
    if (pooledTable.rowCount) {
      const pooledBefore = await inspector.query<{ n: number }>(
        "select count(*)::int as n from farm_strain_statistics where farm_id = $1",
        [farmId],
      );
      expect(pooledBefore.rows[0].n).toBeGreaterThan(0);
    }

    const notedBefore = await withdrawalsNoted();
    expect(notedBefore["T-2026-01"].status).toBe("published");
    expect(notedBefore["T-2026-02"].status).not.toBe("published");

    const summary = await withdrawFarmData(manager, farmName.toLowerCase());
    expect(summary.blocks).toBeGreaterThan(0);
    // The published report keeps its figures and now says a farm withdrew; the open trial does not.
    expect(summary.publishedTrialsNoted).toBe(1);
    const notedAfter = await withdrawalsNoted();
    expect(notedAfter["T-2026-01"].noted).toBe(notedBefore["T-2026-01"].noted + 1);
    expect(notedAfter["T-2026-02"].noted).toBe(notedBefore["T-2026-02"].noted);
    expect(summary.harvests).toBeGreaterThan(0);

    for (const table of ["blocks", "harvests", "uploads", "value_changes", "farm_import_preferences"]) {
      const left = await inspector.query<{ n: number }>(`select count(*)::int as n from ${table} where farm_id = $1`, [farmId]);
      expect(left.rows[0].n, table).toBe(0);
    }
    expect((await inspector.query<{ n: number }>("select count(*)::int as n from blocks where farm_id <> $1", [farmId])).rows[0].n).toBe(
      otherFarms.rows[0].n,
    );
    if (pooledTable.rowCount) {
      // The recompute is a job queued with the withdrawal: the farm shows as waiting until it has run.
      const waiting = await inspector.query<{ waiting: boolean }>(
        "select requested > completed as waiting from pooled_refresh_state where farm_id = $1",
        [farmId],
      );
      expect(waiting.rows).toEqual([{ waiting: true }]);
      await runQueuedJobs(["pooled-refresh"]);
      const pooledAfter = await inspector.query<{ n: number }>("select count(*)::int as n from farm_strain_statistics where farm_id = $1", [
        farmId,
      ]);
      expect(pooledAfter.rows[0].n).toBe(0);
    }
    const enrolments = await inspector.query<{ status: string }>("select status from trial_enrolments where farm_id = $1", [farmId]);
    expect(enrolments.rows.every((row) => row.status === "dropped")).toBe(true);

    const records = await inspector.query<{ farm_id: string | null; details: { blocks: number } }>(
      "select farm_id, details from audit_events where action = 'farm.withdrew-data' and subject = $1",
      [farmName],
    );
    expect(records.rows.map((row) => row.farm_id).sort()).toEqual([farmId, null].sort());
    expect(records.rows[0].details.blocks).toBe(summary.blocks);
  });
});
