import { eq, sql } from "drizzle-orm";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext, type FarmContext } from "@/db/client";
import { auditEvents, blocks, harvests, strains, uploads } from "@/db/schema";
import { databaseRefusal, superuserPool, twoDemoFarms, type DemoFarm } from "./support/database";

let inspector: Pool;
let farmA: DemoFarm;
let farmB: DemoFarm;
let asFarmA: FarmContext;

beforeAll(async () => {
  inspector = superuserPool();
  [farmA, farmB] = await twoDemoFarms(inspector);
  asFarmA = { userId: farmA.managerId, farmId: farmA.id, role: "farm_manager" };
});

afterAll(async () => {
  await inspector.end();
  await closeDatabase();
});

async function someBlockOf(farm: DemoFarm) {
  const { rows } = await inspector.query<{ id: string; strain_id: string }>("select id, strain_id from blocks where farm_id = $1 limit 1", [
    farm.id,
  ]);
  return rows[0];
}

describe("row-level security between farms", () => {
  it("shows farm A its own blocks and harvests and none of farm B's", async () => {
    const seen = await withFarmContext(asFarmA, async (tx) => ({
      blocks: await tx.select({ farmId: blocks.farmId }).from(blocks),
      harvests: await tx.select({ farmId: harvests.farmId }).from(harvests),
      farmBBlocks: await tx.select().from(blocks).where(eq(blocks.farmId, farmB.id)),
      farmBHarvests: await tx.select().from(harvests).where(eq(harvests.farmId, farmB.id)),
    }));
    expect(seen.blocks.length).toBeGreaterThan(0);
    expect(seen.harvests.length).toBeGreaterThan(0);
    expect(new Set(seen.blocks.map((row) => row.farmId))).toEqual(new Set([farmA.id]));
    expect(new Set(seen.harvests.map((row) => row.farmId))).toEqual(new Set([farmA.id]));
    expect(seen.farmBBlocks).toEqual([]);
    expect(seen.farmBHarvests).toEqual([]);
  });

  it("refuses to insert a block for farm B from farm A's context", async () => {
    const sample = await someBlockOf(farmB);
    expect(
      await databaseRefusal(
        withFarmContext(asFarmA, (tx) => tx.insert(blocks).values({ farmId: farmB.id, code: "PLANTED-1", strainId: sample.strain_id })),
      ),
    ).toMatch(/row-level security/);
  });

  it("changes nothing of farm B's when farm A updates or deletes it", async () => {
    const target = await someBlockOf(farmB);
    const outcome = await withFarmContext(asFarmA, async (tx) => ({
      updated: await tx.update(blocks).set({ notes: "changed by farm A" }).where(eq(blocks.id, target.id)).returning(),
      deleted: await tx.delete(harvests).where(eq(harvests.farmId, farmB.id)).returning(),
    }));
    expect(outcome.updated).toEqual([]);
    expect(outcome.deleted).toEqual([]);
    const { rows } = await inspector.query<{ notes: string | null }>("select notes from blocks where id = $1", [target.id]);
    expect(rows[0].notes).not.toBe("changed by farm A");
  });

  it("refuses to move farm A's own block over to farm B", async () => {
    const own = await someBlockOf(farmA);
    expect(
      await databaseRefusal(withFarmContext(asFarmA, (tx) => tx.update(blocks).set({ farmId: farmB.id }).where(eq(blocks.id, own.id)))),
    ).toMatch(/row-level security/);
  });

  it("shows nothing and accepts nothing when no context is set", async () => {
    const sample = await someBlockOf(farmA);
    const seen = await withFarmContext({ userId: null, farmId: null, role: null }, async (tx) => ({
      blocks: await tx.select().from(blocks),
      harvests: await tx.select().from(harvests),
      uploads: await tx.select().from(uploads),
      strains: await tx.select().from(strains),
    }));
    expect(seen).toEqual({ blocks: [], harvests: [], uploads: [], strains: [] });
    expect(
      await databaseRefusal(
        withFarmContext({ userId: null, farmId: null, role: null }, (tx) =>
          tx.insert(blocks).values({ farmId: farmA.id, code: "NO-CONTEXT", strainId: sample.strain_id }),
        ),
      ),
    ).toMatch(/row-level security/);
  });

  it("shows the coordinator and an observer no farm's raw rows", async () => {
    for (const role of ["coordinator", "observer"] as const) {
      const seen = await withFarmContext({ userId: null, farmId: null, role }, async (tx) => ({
        blocks: await tx.select().from(blocks),
        harvests: await tx.select().from(harvests),
      }));
      expect(seen, role).toEqual({ blocks: [], harvests: [] });
    }
  });

  it("forgets the context when the transaction ends, so a pooled connection never carries it over", async () => {
    await withFarmContext(asFarmA, (tx) => tx.select().from(blocks).limit(1));
    const settings = await withFarmContext({ userId: null, farmId: null, role: null }, async (tx) => {
      const result = await tx.execute<{ farm: string | null }>(sql`select current_setting('app.farm_id', true) as farm`);
      return result.rows[0];
    });
    expect(settings.farm ?? "").toBe("");
  });
});

describe("the roles the app connects as", () => {
  it("is rhizo_app: not the owner, not a superuser, and cannot bypass row-level security", async () => {
    const role = await withFarmContext(asFarmA, async (tx) => {
      const result = await tx.execute<{ user: string; superuser: boolean; bypass: boolean; owns: number }>(sql`
        select current_user as user, r.rolsuper as superuser, r.rolbypassrls as bypass,
          (select count(*)::int from pg_tables where schemaname = 'public' and tableowner = current_user) as owns
        from pg_roles r where r.rolname = current_user`);
      return result.rows[0];
    });
    expect(role).toEqual({ user: "rhizo_app", superuser: false, bypass: false, owns: 0 });
  });

  it("forces row-level security on every table that holds a farm's own rows", async () => {
    const { rows } = await inspector.query<{ table: string; enabled: boolean; forced: boolean }>(`
      select c.relname as table, c.relrowsecurity as enabled, c.relforcerowsecurity as forced
      from pg_class c join pg_namespace n on n.oid = c.relnamespace
      where n.nspname = 'public' and c.relkind = 'r'
        and exists (select 1 from information_schema.columns k where k.table_schema = 'public' and k.table_name = c.relname and k.column_name = 'farm_id')`);
    const coopLevel = new Set(["users", "access_tokens"]);
    expect(rows.length).toBeGreaterThan(5);
    for (const row of rows) {
      expect(row.enabled, `${row.table} has row-level security`).toBe(true);
      if (!coopLevel.has(row.table)) expect(row.forced, `${row.table} forces row-level security`).toBe(true);
    }
  });

  it("keeps the audit log append-only for the app", async () => {
    const denied = /permission denied/;
    // Without a where clause on purpose: the whole table is what an attacker would try.
    /* eslint-disable drizzle/enforce-update-with-where, drizzle/enforce-delete-with-where */
    expect(await databaseRefusal(withFarmContext(asFarmA, (tx) => tx.update(auditEvents).set({ action: "rewritten" })))).toMatch(denied);
    expect(await databaseRefusal(withFarmContext(asFarmA, (tx) => tx.delete(auditEvents)))).toMatch(denied);
    /* eslint-enable drizzle/enforce-update-with-where, drizzle/enforce-delete-with-where */
  });
});
