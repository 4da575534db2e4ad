import { execFile } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { superuserPool } from "./support/database";

const run = promisify(execFile);
const source = process.env.RHIZO_DATABASE ?? "rhizomorph_test";
const restored = `${source}_restored`;
const folder = mkdtempSync(path.join(tmpdir(), "rhizomorph-backup-"));
const backupFile = path.join(folder, "round-trip.dump");
const env = { ...process.env, RHIZO_DB_NAME: source };

let admin: Pool;
let original: Pool;
let copy: Pool;

async function tableFingerprints(pool: Pool): Promise<Record<string, string>> {
  const { rows: tables } = await pool.query<{ name: string }>(
    "select tablename as name from pg_tables where schemaname = 'public' order by tablename",
  );
  const prints: Record<string, string> = {};
  for (const { name } of tables) {
    // Every row, every column: the md5 of the table's rows in a fixed order.
    const { rows } = await pool.query<{ n: number; digest: string | null }>(
      `select count(*)::int as n, md5(string_agg(t::text, '|' order by t::text)) as digest from "${name}" t`,
    );
    prints[name] = `${rows[0].n}:${rows[0].digest ?? ""}`;
  }
  return prints;
}

beforeAll(async () => {
  admin = superuserPool("postgres");
  await admin.query(`drop database if exists "${restored}" with (force)`);
  original = superuserPool(source);
});

afterAll(async () => {
  await copy?.end();
  await original?.end();
  await admin.query(`drop database if exists "${restored}" with (force)`);
  await admin.end();
  rmSync(folder, { recursive: true, force: true });
});

describe("db:backup and db:restore", () => {
  it("restores into a fresh database with every row of every table, the policies and the grants", async () => {
    await run("bash", ["scripts/db-backup.sh", backupFile], { env });
    await run("bash", ["scripts/db-restore.sh", backupFile, restored], { env });
    copy = superuserPool(restored);
    // The database is dropped with FORCE at the end; a connection it ends is expected then.
    copy.on("error", () => undefined);

    const before = await tableFingerprints(original);
    const after = await tableFingerprints(copy);
    expect(Object.keys(before).length).toBeGreaterThan(15);
    expect(after).toEqual(before);
    // The farm tables' rows are really there (forced row-level security did not empty them).
    expect(Number(after.blocks.split(":")[0])).toBeGreaterThan(100);
    expect(Number(after.harvests.split(":")[0])).toBeGreaterThan(100);

    const policies = "select tablename, policyname, roles::text, cmd from pg_policies order by 1, 2";
    expect((await copy.query(policies)).rows).toEqual((await original.query(policies)).rows);
    const forced = "select relname from pg_class where relforcerowsecurity order by 1";
    expect((await copy.query(forced)).rows).toEqual((await original.query(forced)).rows);
    const grants =
      "select table_name, grantee, privilege_type from information_schema.role_table_grants where grantee like 'rhizo_%' order by 1, 2, 3";
    expect((await copy.query(grants)).rows).toEqual((await original.query(grants)).rows);
    const columnGrants =
      "select table_name, column_name, grantee, privilege_type from information_schema.column_privileges where grantee like 'rhizo_%' order by 1, 2, 3, 4";
    expect((await copy.query(columnGrants)).rows).toEqual((await original.query(columnGrants)).rows);
    // A dump carries no database privileges: the restore must take TEMPORARY from PUBLIC (so from
    // the analyst) again, and give it to the app role, whose commits stage rows in temporary tables.
    const temporary = `select has_database_privilege('rhizo_app', current_database(), 'TEMPORARY') as app,
      has_database_privilege('rhizo_analyst', current_database(), 'TEMPORARY') as analyst`;
    expect((await copy.query(temporary)).rows).toEqual([{ app: true, analyst: false }]);
  });

  it("refuses to restore over a database that exists", async () => {
    await expect(run("bash", ["scripts/db-restore.sh", backupFile, restored], { env })).rejects.toMatchObject({
      stderr: expect.stringContaining("already exists") as string,
    });
  });
});
