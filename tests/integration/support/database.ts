import { Pool } from "pg";
import { loadMember, type Member } from "@/lib/data/members";

/**
 * A superuser connection, for tests only: it sees past row-level security (even the owner
 * does not, on the forced tables), to look up fixtures and check what really was stored.
 * The app never connects this way.
 */
export function superuserPool(database = process.env.RHIZO_DATABASE ?? "postgres"): Pool {
  const url = new URL(requireUrl("SUPERUSER_DATABASE_URL"));
  url.pathname = `/${database}`;
  return new Pool({ connectionString: url.toString(), max: 2 });
}

export function ownerUrlFor(database: string): string {
  const url = new URL(requireUrl("OWNER_DATABASE_URL"));
  url.pathname = `/${database}`;
  return url.toString();
}

function requireUrl(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run the integration tests through npm test`);
  return value;
}

export interface DemoFarm {
  id: string;
  name: string;
  managerId: string;
}

/** Two demo farms with their managers, read as the owner. */
export async function twoDemoFarms(pool: Pool): Promise<[DemoFarm, DemoFarm]> {
  const { rows } = await pool.query<DemoFarm>(
    `select f.id, f.name, u.id as "managerId" from farms f join users u on u.farm_id = f.id and u.role = 'farm_manager'
     order by f.name limit 2`,
  );
  if (rows.length < 2) throw new Error("the demo seed should have made at least two farms");
  return [rows[0], rows[1]];
}

/** The database's own message: drizzle wraps it as the cause of a "Failed query" error. */
export async function databaseRefusal(work: Promise<unknown>): Promise<string> {
  try {
    await work;
  } catch (error) {
    const cause = (error as { cause?: unknown }).cause;
    return cause instanceof Error ? cause.message : String(error);
  }
  throw new Error("the database accepted what it should have refused");
}

/**
 * Removes every release of the pooled figures, for tests that must start from a first release
 * equal to the rows they read. Test-only: releases refuse to be changed, so this switches the
 * refusing triggers off (session_replication_role) inside the superuser's own transaction.
 */
export async function removeAllReleases(pool: Pool): Promise<void> {
  const client = await pool.connect();
  try {
    await client.query("begin");
    await client.query("set local session_replication_role = replica");
    await client.query(
      "delete from pooled_release_strain_rows; delete from pooled_release_flush_rows; delete from pooled_release_season_rows; delete from pooled_release_drying_rows; delete from pooled_release_regime_rows; delete from pooled_releases; delete from pooled_release_schedule",
    );
    await client.query("commit");
  } catch (error) {
    await client.query("rollback");
    throw error;
  } finally {
    client.release();
  }
}

/** The member a user id names, as the guard would load them: the data layer acts for a Member. */
export async function memberOf(userId: string): Promise<Member> {
  const member = await loadMember(userId);
  if (!member) throw new Error(`no member with id ${userId}`);
  return member;
}
