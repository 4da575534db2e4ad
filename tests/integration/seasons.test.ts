/**
 * Seasons against the real database: a block's season from its inoculation date under the co-op's
 * season start (the start day itself in the new season) and from the season log's season column,
 * the Blocks & harvests and My farm filters, the setting's audit and who may change it.
 * Calendar facts (common practice): 28 February 2026 is the day before 1 March 2026.
 */
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { listBlocks } from "@/lib/data/blocks";
import type { Member } from "@/lib/data/members";
import { getMyFarm } from "@/lib/data/my-farm";
import { commitUpload, createUpload, getImportSetup, parseStored } from "@/lib/data/season-logs";
import { farmsAwaitingRefresh, refreshPooledStatistics } from "@/lib/data/pooled-refresh";
import { getSeasonStart, listFarmSeasons, updateSeasonStart } from "@/lib/data/seasons";
import { isAppError } from "@/lib/errors";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { memberOf, superuserPool, twoDemoFarms } from "./support/database";

let inspector: Pool;
let asManager: Member;
let asOtherFarm: Member;
let asCoordinator: Member;
let startBefore: { month: number; day: number };

const header = "block_id,strain,substrate,inoculated_on,season,block_wet_weight,substrate_moisture,flush,harvested_on,fresh_weight";
const sheet = [
  header,
  // The day before a 1 March start, the start day itself, and a block its log puts in the new season.
  "SEA-EVE,PO-01,HWB-20,2026-02-28,,2.5 kg,62 %,1,2026-04-01,500 g",
  "SEA-DAY,PO-01,HWB-20,2026-03-01,,2.5 kg,62 %,1,2026-04-10,450 g",
  "SEA-NAMED,PO-01,HWB-20,2026-02-20,2026/27,2.5 kg,62 %,,,",
  "SEA-UNDATED,PO-01,HWB-20,,,2.5 kg,62 %,,,",
].join("\n");

async function upload(member: Member, fileName: string, text: string) {
  const content = new TextEncoder().encode(text);
  const setup = await getImportSetup(member);
  return createUpload(member, { fileName, content, result: await parseStored(content, setup, {}), choices: {} });
}

const seasonsOf = (rows: { code: string; season: number | null }[]) =>
  Object.fromEntries(rows.filter((row) => row.code.startsWith("SEA-")).map((row) => [row.code, row.season]));

beforeAll(async () => {
  inspector = superuserPool();
  const [own, other] = await twoDemoFarms(inspector);
  const { rows } = await inspector.query<{ id: string; farmId: string | null; role: string }>(
    `select id, farm_id as "farmId", role from users where role in ('farm_manager', 'coordinator') and active order by email`,
  );
  asManager = await memberOf(rows.find((row) => row.role === "farm_manager" && row.farmId === own.id)!.id);
  asOtherFarm = await memberOf(rows.find((row) => row.role === "farm_manager" && row.farmId === other.id)!.id);
  asCoordinator = await memberOf(rows.find((row) => row.role === "coordinator")!.id);
  startBefore = await getSeasonStart(asCoordinator);
  await updateSeasonStart(asCoordinator, { month: 3, day: 1 });
  const view = await upload(asManager, "seasons.csv", sheet);
  expect(view.report.issues.filter((issue) => issue.severity === "error")).toEqual([]);
  await commitUpload(asManager, view.upload.id, {});
});

afterAll(async () => {
  await updateSeasonStart(asCoordinator, startBefore);
  await runQueuedJobs(["pooled-refresh"]);
  // Moving the start marked every farm as waiting; the workers' sweep would refresh them, but none
  // runs here, and a later file would see "results updating" for good.
  for (const farmId of await farmsAwaitingRefresh()) await refreshPooledStatistics(farmId);
  await stopJobWorkers();
  await inspector.end();
  await closeDatabase();
});

describe("a block's season", () => {
  it("follows its inoculation date, the start day itself in the new season, unless its season log names one", async () => {
    expect(seasonsOf(await listBlocks(asManager))).toEqual({ "SEA-EVE": 2025, "SEA-DAY": 2026, "SEA-NAMED": 2026, "SEA-UNDATED": null });
    const { rows } = await inspector.query<{ code: string; season_year: number | null }>(
      `select code, season_year from blocks where code like 'SEA-%' order by code`,
    );
    // Only the season the file named is stored; the others are computed from the date when read.
    expect(rows).toEqual([
      { code: "SEA-DAY", season_year: null },
      { code: "SEA-EVE", season_year: null },
      { code: "SEA-NAMED", season_year: 2026 },
      { code: "SEA-UNDATED", season_year: null },
    ]);
  });

  it("moves with the co-op's season start, except where the season log named it", async () => {
    await updateSeasonStart(asCoordinator, { month: 1, day: 1 });
    try {
      expect(seasonsOf(await listBlocks(asManager))).toEqual({ "SEA-EVE": 2026, "SEA-DAY": 2026, "SEA-NAMED": 2026, "SEA-UNDATED": null });
      await updateSeasonStart(asCoordinator, { month: 3, day: 2 });
      expect(seasonsOf(await listBlocks(asManager))).toMatchObject({ "SEA-DAY": 2025, "SEA-NAMED": 2026 });
    } finally {
      await updateSeasonStart(asCoordinator, { month: 3, day: 1 });
    }
  });

  it("marks every farm's pooled statistics for a refresh when the season start moves, and the refresh sums BE by the new seasons", async () => {
    const waiting = async () =>
      (
        await inspector.query<{ farm_id: string; requested: number; completed: number }>(
          "select f.id as farm_id, coalesce(s.requested, 0) as requested, coalesce(s.completed, 0) as completed from farms f left join pooled_refresh_state s on s.farm_id = f.id",
        )
      ).rows;
    await runQueuedJobs(["pooled-refresh"]);
    const before = new Map((await waiting()).map((row) => [row.farm_id, row.requested]));
    await updateSeasonStart(asCoordinator, { month: 1, day: 1 });
    try {
      for (const row of await waiting()) {
        expect(row.requested, row.farm_id).toBe((before.get(row.farm_id) ?? 0) + 1);
        expect(row.requested).toBeGreaterThan(row.completed);
      }
      await refreshPooledStatistics(asManager.farmId!);
      // Season by season, the farm's blocks with a BE as block_season_year counts them under the new start.
      const bySeason = async (statement: string) =>
        Object.fromEntries(
          (await inspector.query<{ season: number | null; blocks: number }>(statement, [asManager.farmId])).rows.map((row) => [
            String(row.season),
            Number(row.blocks),
          ]),
        );
      const stored = await bySeason(
        "select season_year as season, sum(efficiency_blocks) as blocks from farm_season_statistics where farm_id = $1 and flush_window = 'all' group by 1",
      );
      const counted = await bySeason(`
        select block_season_year(b.inoculated_on, b.season_year) as season, count(*) as blocks from blocks b
        where b.farm_id = $1 and not b.contaminated and b.wet_mass_g > 0 and b.moisture < 1
          and exists (select 1 from harvests h where h.block_id = b.id)
        group by 1`);
      expect(stored).toEqual(counted);
      expect(Object.keys(stored)).not.toContain("2025");
    } finally {
      await updateSeasonStart(asCoordinator, { month: 3, day: 1 });
    }
  });

  it("is kept when a later file leaves the season blank, and changed (with history) when it names another", async () => {
    const blank = await upload(asManager, "seasons-blank.csv", [header, "SEA-NAMED,PO-01,HWB-20,2026-02-20,,2.5 kg,62 %,,,"].join("\n"));
    await commitUpload(asManager, blank.upload.id, {});
    expect(seasonsOf(await listBlocks(asManager))["SEA-NAMED"]).toBe(2026);
    const other = await upload(
      asManager,
      "seasons-other.csv",
      [header, "SEA-NAMED,PO-01,HWB-20,2026-02-20,2025,2.5 kg,62 %,,,"].join("\n"),
    );
    expect(other.report.preview.changes).toContainEqual(expect.objectContaining({ field: "season", oldValue: "2026", newValue: "2025" }));
    await commitUpload(asManager, other.upload.id, {});
    expect(seasonsOf(await listBlocks(asManager))["SEA-NAMED"]).toBe(2025);
    const { rows } = await inspector.query<{ old_value: string; new_value: string }>(
      `select vc.old_value, vc.new_value from value_changes vc join blocks b on b.id = vc.block_id
       where b.code = 'SEA-NAMED' and vc.field = 'season'`,
    );
    expect(rows).toEqual([{ old_value: "2026", new_value: "2025" }]);
  });

  it("cannot be committed when the file's season cannot be read; the error names the cell", async () => {
    const view = await upload(
      asManager,
      "seasons-bad.csv",
      [header, "SEA-BAD,PO-01,HWB-20,2026-04-01,spring 26,2.5 kg,62 %,,,"].join("\n"),
    );
    expect(view.report.issues).toContainEqual(
      expect.objectContaining({ code: "season_unreadable", severity: "error", line: 2, column: "season", value: "spring 26" }),
    );
    await expect(commitUpload(asManager, view.upload.id, {})).rejects.toSatisfy(isAppError);
    const { rows } = await inspector.query(`select 1 from blocks where code = 'SEA-BAD'`);
    expect(rows).toEqual([]);
  });
});

describe("the season filter", () => {
  it("lists on Blocks & harvests only the blocks of the season asked for", async () => {
    const season2025 = await listBlocks(asManager, { season: 2025 });
    expect(season2025.length).toBeGreaterThan(0);
    expect(season2025.every((row) => row.season === 2025)).toBe(true);
    expect(Object.keys(seasonsOf(season2025)).sort()).toEqual(["SEA-EVE", "SEA-NAMED"]);
    expect(Object.keys(seasonsOf(await listBlocks(asManager, { season: 2026 })))).toEqual(["SEA-DAY"]);
    expect(await listBlocks(asManager, { season: 1990 })).toEqual([]);
    // Every block is either in a season or has none: the filter loses nothing.
    const all = await listBlocks(asManager);
    const seasons = (await listFarmSeasons(asManager)).seasons;
    expect(seasons).toEqual([...seasons].sort((a, b) => b - a));
    let filtered = all.filter((row) => row.season === null).length;
    for (const season of seasons) filtered += (await listBlocks(asManager, { season })).length;
    expect(filtered).toBe(all.length);
  });

  it("never shows another farm's blocks", async () => {
    expect(seasonsOf(await listBlocks(asOtherFarm, { season: 2025 }))).toEqual({});
    expect(seasonsOf(await listBlocks(asOtherFarm))).toEqual({});
  });

  it("gives My farm one season's blocks, named as the co-op names seasons", async () => {
    const season = await getMyFarm(asManager, { season: 2026 });
    expect(season).toMatchObject({ season: 2026, seasonLabel: "2026/27" });
    const onlyDay = await listBlocks(asManager, { season: 2026 });
    expect(season.strains.reduce((sum, strain) => sum + strain.blocks, 0)).toBe(onlyDay.length);
    expect((await getMyFarm(asManager, { season: 1990 })).strains).toEqual([]);
    expect(await getMyFarm(asManager)).toMatchObject({ season: null, seasonLabel: null });
  });
});

describe("the season start", () => {
  it("is changed by the coordinator only, and each change is in the activity log", async () => {
    await expect(updateSeasonStart(asManager, { month: 9, day: 1 })).rejects.toSatisfy(
      (error: unknown) => isAppError(error) && error.code === "forbidden",
    );
    expect(await getSeasonStart(asManager)).toEqual({ month: 3, day: 1 });
    const { rows } = await inspector.query<{ details: { after: { seasonStart: unknown } } }>(
      `select details from audit_events where action = 'cooperative-settings.updated' and subject = 'Season start' order by id desc limit 1`,
    );
    expect(rows[0].details.after.seasonStart).toEqual({ month: 3, day: 1 });
  });

  it("refuses 29 February and days a month lacks, whoever writes it", async () => {
    for (const [month, day] of [
      [2, 29],
      [4, 31],
      [0, 1],
    ]) {
      await expect(
        inspector.query(`update cooperative_settings set season_start_month = $1, season_start_day = $2`, [month, day]),
      ).rejects.toThrow(/season_start_every_year/);
    }
  });
});
