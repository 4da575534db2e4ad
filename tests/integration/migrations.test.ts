import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { Pool } from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { ownerUrlFor, superuserPool } from "./support/database";

const scratch = `rhizomorph_migrations_${process.pid}`;
const admin = superuserPool("postgres");

afterAll(async () => {
  await admin.query(`drop database if exists ${scratch} with (force)`);
  await admin.end();
});

// Dropping the scratch database ends its connections; an idle one may hear of it late.
function scratchPool(): Pool {
  const pool = new Pool({ connectionString: ownerUrlFor(scratch), max: 1 });
  pool.on("error", (error: Error & { code?: string }) => {
    if (error.code !== "57P01") throw error;
  });
  return pool;
}

async function applyMigrations(): Promise<number> {
  const pool = scratchPool();
  try {
    await migrate(drizzle(pool), { migrationsFolder: "db/migrations" });
    const { rows } = await pool.query<{ applied: number }>("select count(*)::int as applied from drizzle.__drizzle_migrations");
    return rows[0].applied;
  } finally {
    await pool.end();
  }
}

describe("the committed migrations", () => {
  it("apply cleanly to an empty database and a second run changes nothing", async () => {
    await admin.query(`drop database if exists ${scratch} with (force)`);
    await admin.query(`create database ${scratch} owner rhizo_owner`);
    const scratchAdmin = superuserPool(scratch);
    await scratchAdmin.query(
      "revoke all on schema public from public; grant usage on schema public to rhizo_app, rhizo_analyst; alter schema public owner to rhizo_owner",
    );
    await scratchAdmin.end();

    const journal = (await import("@/db/migrations/meta/_journal.json")).default as { entries: unknown[] };
    expect(await applyMigrations()).toBe(journal.entries.length);
    expect(await applyMigrations()).toBe(journal.entries.length);

    const check = scratchPool();
    const { rows } = await check.query<{ name: string }>("select tablename as name from pg_tables where schemaname = 'public' order by 1");
    await check.end();
    expect(rows.map((row) => row.name)).toEqual(
      expect.arrayContaining(["blocks", "harvests", "uploads", "farms", "users", "trials", "audit_events"]),
    );
  });
});
