import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { Pool } from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { ownerUrlFor, superuserPool } from "./support/database";

const scratch = `rhizomorph_migrations_${process.pid}`;
const admin = superuserPool("postgres");

afterAll(async () => {
  await admin.query(`drop database if exists ${scratch} with (force)`);
  await admin.query(`drop database if exists ${scratch}_versions with (force)`);
  await admin.end();
});

// Dropping the scratch database ends its connections; an idle one may hear of it late.
function scratchPool(database = scratch): Pool {
  const pool = new Pool({ connectionString: ownerUrlFor(database), max: 1 });
  pool.on("error", (error: Error & { code?: string }) => {
    if (error.code !== "57P01") throw error;
  });
  return pool;
}

async function applyMigrations(database = scratch, migrationsFolder = "db/migrations"): Promise<number> {
  const pool = scratchPool(database);
  try {
    await migrate(drizzle(pool), { migrationsFolder });
    const { rows } = await pool.query<{ applied: number }>("select count(*)::int as applied from drizzle.__drizzle_migrations");
    return rows[0].applied;
  } finally {
    await pool.end();
  }
}

async function emptyDatabase(database: string) {
  await admin.query(`drop database if exists ${database} with (force)`);
  await admin.query(`create database ${database} owner rhizo_owner`);
  const scratchAdmin = superuserPool(database);
  await scratchAdmin.query(
    "revoke all on schema public from public; grant usage on schema public to rhizo_app, rhizo_analyst; alter schema public owner to rhizo_owner",
  );
  await scratchAdmin.end();
}

/** A copy of the migrations folder that stops before the migration tagged `before`. */
function migrationsBefore(before: string): string {
  const folder = mkdtempSync(path.join(tmpdir(), "rhizomorph-migrations-"));
  cpSync("db/migrations", folder, { recursive: true });
  const journalFile = path.join(folder, "meta", "_journal.json");
  const journal = JSON.parse(readFileSync(journalFile, "utf8")) as { entries: { tag: string }[] };
  journal.entries = journal.entries.slice(
    0,
    journal.entries.findIndex((entry) => entry.tag === before),
  );
  writeFileSync(journalFile, JSON.stringify(journal));
  return folder;
}

describe("the committed migrations", () => {
  it("apply cleanly to an empty database and a second run changes nothing", async () => {
    await emptyDatabase(scratch);

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

  it("keep a trial's analysis stored before runs were kept as its run 1, published as version 1 where the trial was", async () => {
    const database = `${scratch}_versions`;
    await emptyDatabase(database);
    const before = migrationsBefore("0026_trial_analysis_versions");
    try {
      await applyMigrations(database, before);
    } finally {
      rmSync(before, { recursive: true });
    }
    const scratchAdmin = superuserPool(database);
    try {
      const {
        rows: [{ species_id, farm_id }],
      } = await scratchAdmin.query<{ species_id: string; farm_id: string }>(
        `with s as (insert into species (scientific_name, common_name) values ('Pleurotus ostreatus', 'Oyster') returning id),
              f as (insert into farms (name) values ('Fernbrook') returning id)
         select s.id as species_id, f.id as farm_id from s, f`,
      );
      const stored = (answer: string) => JSON.stringify({ analysedAt: "2026-10-01T09:00:00.000Z", analysis: { answer } });
      const { rows: made } = await scratchAdmin.query<{ id: string; status: string }>(
        `insert into trials (code, title, species_id, status, published_results, published_at) values
           ('T-2026-01', 'Published', $1, 'published', $2::jsonb, '2026-10-03T12:00:00Z'),
           ('T-2026-02', 'Closed', $1, 'collecting', $3::jsonb, null)
         returning id, status`,
        [species_id, stored("Published answer"), stored("Closed answer")],
      );
      for (const trial of made)
        await scratchAdmin.query(
          "insert into trial_report_farms (trial_id, farm_id, pseudonym, own_estimates) values ($1, $2, 'Farm B', '[]')",
          [trial.id, farm_id],
        );

      await applyMigrations(database);

      const { rows: runs } = await scratchAdmin.query<{ code: string; run: number; ran_at: Date; answer: string; version: number | null }>(
        `select t.code, a.run, a.ran_at, a.results->'analysis'->>'answer' as answer, p.version
         from trial_analyses a join trials t on t.id = a.trial_id left join trial_publications p on p.analysis_id = a.id order by t.code`,
      );
      expect(runs).toEqual([
        { code: "T-2026-01", run: 1, ran_at: new Date("2026-10-01T09:00:00Z"), answer: "Published answer", version: 1 },
        { code: "T-2026-02", run: 1, ran_at: new Date("2026-10-01T09:00:00Z"), answer: "Closed answer", version: null },
      ]);
      const { rows: farms } = await scratchAdmin.query<{ same: boolean }>(
        "select r.analysis_id = a.id as same from trial_report_farms r join trial_analyses a on a.trial_id = r.trial_id",
      );
      expect(farms).toEqual([{ same: true }, { same: true }]);
      const { rows: columns } = await scratchAdmin.query(
        "select 1 from information_schema.columns where table_name = 'trials' and column_name = 'published_results'",
      );
      expect(columns).toEqual([]);
    } finally {
      await scratchAdmin.end();
    }
  });
});
