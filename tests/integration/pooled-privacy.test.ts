import { sql } from "drizzle-orm";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withAnalystAccess, withFarmContext, type FarmContext } from "@/db/client";
import { farmFlushStatistics, farmStrainStatistics } from "@/db/schema";
import { queuePooledRefresh } from "@/lib/data/pooled-refresh";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { databaseRefusal, superuserPool, twoDemoFarms, type DemoFarm } from "./support/database";

let inspector: Pool;
let farmA: DemoFarm;
let farmB: DemoFarm;

beforeAll(async () => {
  inspector = superuserPool();
  [farmA, farmB] = await twoDemoFarms(inspector);
  // Other test files change farms' rows and refresh in the background; start from settled figures.
  await inspector.query("select pooled_refresh_all()");
});

afterAll(async () => {
  await inspector.end();
  await stopJobWorkers();
  await closeDatabase();
});

// Built when the test runs: the farms are looked up in beforeAll.
const contexts: [string, () => FarmContext][] = [
  ["farm A's manager", () => ({ userId: farmA.managerId, farmId: farmA.id, role: "farm_manager" })],
  ["farm A's grower role", () => ({ userId: farmA.managerId, farmId: farmA.id, role: "grower" })],
  ["the coordinator", () => ({ userId: farmA.managerId, farmId: null, role: "coordinator" })],
  ["an observer", () => ({ userId: farmA.managerId, farmId: null, role: "observer" })],
  ["a coordinator claiming farm B", () => ({ userId: farmA.managerId, farmId: farmB.id, role: "coordinator" })],
  ["no context", () => ({ userId: null, farmId: null, role: null })],
];

describe("per-farm sufficient statistics under row-level security", () => {
  it("exist for every farm that has blocks", async () => {
    const { rows } = await inspector.query<{ farms: number }>("select count(distinct farm_id)::int as farms from farm_strain_statistics");
    const { rows: farms } = await inspector.query<{ farms: number }>("select count(distinct farm_id)::int as farms from blocks");
    expect(farms[0].farms).toBeGreaterThanOrEqual(5);
    expect(rows[0].farms).toBe(farms[0].farms);
  });

  it.each(contexts)("show %s no other farm's rows", async (_name, makeContext) => {
    const context = makeContext();
    const seen = await withFarmContext(context, async (tx) => ({
      strains: await tx.select({ farmId: farmStrainStatistics.farmId }).from(farmStrainStatistics),
      flushes: await tx.select({ farmId: farmFlushStatistics.farmId }).from(farmFlushStatistics),
      state: await tx.execute(sql`select count(*) from pooled_refresh_state`).then(
        () => "readable",
        (error: Error) => (error.cause as Error)?.message ?? error.message,
      ),
    }));
    const own = context.farmId && (context.role === "farm_manager" || context.role === "grower") ? context.farmId : null;
    const farmsSeen = new Set([...seen.strains, ...seen.flushes].map((row) => row.farmId));
    expect([...farmsSeen]).toEqual(own ? [own] : []);
    if (own) expect(seen.strains.length).toBeGreaterThan(0);
    expect(seen.state).toMatch(/permission denied/);
  });

  it("refuses writes from the application role, even to its own farm's rows", async () => {
    const asFarmA: FarmContext = { userId: farmA.managerId, farmId: farmA.id, role: "farm_manager" };
    expect(await databaseRefusal(withFarmContext(asFarmA, (tx) => tx.execute(sql`delete from farm_strain_statistics`)))).toMatch(
      /permission denied/,
    );
    expect(await databaseRefusal(withFarmContext(asFarmA, (tx) => tx.execute(sql`update farm_strain_statistics set blocks = 0`)))).toMatch(
      /permission denied/,
    );
    expect(await databaseRefusal(withFarmContext(asFarmA, (tx) => tx.execute(sql`select pooled_refresh_farm(${farmA.id}::uuid)`)))).toMatch(
      /permission denied/,
    );
  });

  it("lets the analyst role read every farm's statistics but not the farms' names", async () => {
    const farms = await withAnalystAccess(
      async (tx) =>
        (await tx.execute<{ farms: number }>(sql`select count(distinct farm_id)::int as farms from farm_strain_statistics`)).rows[0].farms,
    );
    expect(farms).toBeGreaterThan(2);
    expect(await databaseRefusal(withAnalystAccess((tx) => tx.execute(sql`select name from farms`)))).toMatch(/permission denied/);
  });
});

describe("the background refresh", () => {
  /** What a commit does in its transaction, as the farm's manager; then the queued job runs. */
  async function commitAndRefresh(farmId: string) {
    await withFarmContext({ userId: null, farmId, role: "farm_manager" }, (tx) => queuePooledRefresh(tx, farmId));
    await runQueuedJobs(["pooled-refresh"]);
  }

  it("adds a new farm's blocks, and drops the farm once its rows are gone", async () => {
    const {
      rows: [farm],
    } = await inspector.query<{ id: string }>("insert into farms (name) values ('Test Refresh Farm') returning id");
    const {
      rows: [strain],
    } = await inspector.query<{ id: string }>("select id from strains order by code limit 1");
    try {
      const { rows: made } = await inspector.query<{ id: string }>(
        `insert into blocks (farm_id, code, strain_id, wet_mass_g, moisture, inoculated_on, spent_mass_g)
         select $1, 'R-' || n, $2, 2500, 0.6, date '2026-01-01', 1800 from generate_series(1, 3) n returning id`,
        [farm.id, strain.id],
      );
      for (const [index, block] of made.entries()) {
        await inspector.query(
          `insert into harvests (farm_id, block_id, flush, harvested_on, fresh_mass_g) values ($1, $2, 1, date '2026-01-30', $3), ($1, $2, 2, date '2026-02-14', 200)`,
          [farm.id, block.id, 500 + 100 * index],
        );
      }
      await commitAndRefresh(farm.id);
      const { rows: stats } = await inspector.query(
        "select blocks, efficiency_blocks, efficiency_sum, first_harvest_days_sum from farm_strain_statistics where farm_id = $1 and flush_window = 'all'",
        [farm.id],
      );
      // BE = fresh ÷ (2500 g × (1 − 0.6)) × 100: blocks gave 700, 800 and 900 g → 70, 80, 90.
      expect(stats).toEqual([{ blocks: 3, efficiency_blocks: 3, efficiency_sum: 240, first_harvest_days_sum: 87 }]);
      const { rows: state } = await inspector.query("select requested, completed from pooled_refresh_state where farm_id = $1", [farm.id]);
      expect(state).toEqual([{ requested: 1, completed: 1 }]);

      await inspector.query("delete from blocks where farm_id = $1", [farm.id]);
      await commitAndRefresh(farm.id);
      const { rows: left } = await inspector.query(
        "select (select count(*)::int from farm_strain_statistics where farm_id = $1) as strains, (select count(*)::int from farm_flush_statistics where farm_id = $1) as flushes",
        [farm.id],
      );
      expect(left).toEqual([{ strains: 0, flushes: 0 }]);
    } finally {
      await inspector.query("delete from farms where id = $1", [farm.id]);
    }
  });
});
