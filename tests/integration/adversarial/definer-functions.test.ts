import { Client, type Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { closeDatabase, withFarmContext } from "@/db/client";
import { blocks } from "@/db/schema";
import { hashPassword } from "@/lib/auth/password";
import { checkPassword } from "@/lib/data/sign-in";
import { superuserPool } from "../support/database";

/**
 * An attacker who can run SQL as rhizo_app (an injection, a compromised app process) makes a
 * temporary table named like a real one. PostgreSQL searches pg_temp first unless a function's
 * search_path puts it last, so an owner-run (SECURITY DEFINER) function that reads
 * "access_tokens" would read the attacker's table: a reset "token" the attacker made up for the
 * victim, and the victim's password hash overwritten with the attacker's. PostgreSQL
 * documentation, "Writing SECURITY DEFINER Functions Safely" (CREATE FUNCTION).
 * Migration 0016 fixed every such function's search_path with pg_temp last and took TEMPORARY
 * from the app role; 0025 gave TEMPORARY back to rhizo_app alone (a commit stages its rows in
 * temporary tables). What must hold now: the attack fails with the grant in place, no definer
 * function searches pg_temp before public, the app's own queries in a farm transaction do not
 * read a temporary table named like a real one, and the analyst still cannot make one.
 */

let inspector: Pool;
let victim: { id: string; email: string; passwordHash: string };
const attackerPassword = "attacker-chose-this";

beforeAll(async () => {
  inspector = superuserPool();
  // A member of its own, so the demo sign-ins other tests use stay as they are.
  const email = "shadowing-victim@aldervalley.example";
  const { rows } = await inspector.query<{ id: string; password_hash: string }>(
    `insert into users (email, name, role, password_hash)
     select $1, 'Shadowing victim', 'observer', password_hash from users where email = 'observer@extension.example'
     returning id, password_hash`,
    [email],
  );
  victim = { id: rows[0].id, email, passwordHash: rows[0].password_hash };
});

afterAll(async () => {
  await inspector.query("delete from users where id = $1", [victim.id]);
  await inspector.end();
  await closeDatabase();
});

/** A session of its own as rhizo_app, as the app's pool would open it. */
async function asApp<T>(work: (client: Client) => Promise<T>): Promise<T> {
  const client = new Client({ connectionString: process.env.DATABASE_URL });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

/** The attack: a temp access_tokens table holding a reset "token" for the victim, then the redeem function. */
async function shadowAccessTokens(client: Client): Promise<string> {
  await client.query(`create temp table access_tokens (
    id uuid, purpose token_purpose, token_hash text, email text, user_id uuid, farm_id uuid, role member_role,
    created_by uuid, created_at timestamptz, expires_at timestamptz, used_at timestamptz)`);
  // The function runs as its owner, so the attacker lets everyone use the table they own.
  await client.query("grant all on pg_temp.access_tokens to public");
  await client.query(
    `insert into access_tokens values (gen_random_uuid(), 'password_reset', 'made-up-token', $2, $1, null, 'observer', null, now(), now() + interval '1 hour', null)`,
    [victim.id, victim.email],
  );
  const { rows } = await client.query<{ outcome: string }>("select outcome from app_redeem_access_token('made-up-token', '', $1)", [
    await hashPassword(attackerPassword),
  ]);
  return rows[0].outcome;
}

async function victimHash(): Promise<string> {
  const { rows } = await inspector.query<{ password_hash: string }>("select password_hash from users where id = $1", [victim.id]);
  return rows[0].password_hash;
}

describe("a temporary table named like a real one", () => {
  it("is not read by a definer function although the app role may make one (search_path puts pg_temp last)", async () => {
    const { rows } = await inspector.query<{ app: boolean; analyst: boolean; everyone: boolean }>(
      `select has_database_privilege('rhizo_app', current_database(), 'TEMPORARY') as app,
        has_database_privilege('rhizo_analyst', current_database(), 'TEMPORARY') as analyst,
        exists (select 1 from pg_database d, aclexplode(d.datacl) a
                where d.datname = current_database() and a.grantee = 0 and a.privilege_type = 'TEMPORARY') as everyone`,
    );
    expect(rows[0]).toEqual({ app: true, analyst: false, everyone: false });
    expect(await asApp(shadowAccessTokens)).toBe("unknown");
    expect(await victimHash()).toBe(victim.passwordHash);
    expect(await checkPassword(victim.email, attackerPassword, "10.9.0.1")).toEqual({ status: "refused" });
  });

  it("is not read by the app's own queries in a farm transaction, even left behind in a pooled connection", async () => {
    const { rows: managers } = await inspector.query<{ userId: string; farmId: string }>(
      `select u.id as "userId", u.farm_id as "farmId" from users u
       where u.role = 'farm_manager' and exists (select 1 from blocks b where b.farm_id = u.farm_id) limit 1`,
    );
    const context = { ...managers[0], role: "farm_manager" as const };
    const farmId = context.farmId;
    const seen = await withFarmContext(context, async (tx) => {
      // What an attacker with one statement as rhizo_app would leave for the connection's next user.
      await tx.execute(sql`create temporary table blocks (id uuid, farm_id uuid, code text)`);
      await tx.execute(sql`insert into pg_temp.blocks values (gen_random_uuid(), ${farmId}::uuid, 'SHADOW-1')`);
      const read = await tx.select({ code: blocks.code }).from(blocks).where(eq(blocks.farmId, farmId));
      await tx.execute(sql`drop table pg_temp.blocks`);
      return read.map((row) => row.code);
    });
    expect(seen.length).toBeGreaterThan(0);
    expect(seen).not.toContain("SHADOW-1");
  });

  it("cannot be made by the analyst role", async () => {
    const client = new Client({ connectionString: process.env.ANALYST_DATABASE_URL });
    await client.connect();
    try {
      await expect(client.query("create temp table access_tokens (id uuid)")).rejects.toThrow(
        /permission denied to create temporary tables/,
      );
    } finally {
      await client.end();
    }
  });

  it("every SECURITY DEFINER function of the app sets search_path with pg_temp last", async () => {
    const { rows } = await inspector.query<{ name: string; config: string[] | null }>(
      `select p.oid::regprocedure::text as name, p.proconfig as config
       from pg_proc p join pg_namespace n on n.oid = p.pronamespace
       where n.nspname = 'public' and p.prosecdef order by 1`,
    );
    expect(rows.length).toBeGreaterThan(5);
    const unsafe = rows.filter((row) => {
      const setting = (row.config ?? []).find((entry) => entry.startsWith("search_path="));
      const path =
        setting
          ?.slice("search_path=".length)
          .split(",")
          .map((part) => part.trim()) ?? [];
      return path.at(-1) !== "pg_temp" || !path.includes("pg_catalog");
    });
    expect(unsafe.map((row) => `${row.name}: ${(row.config ?? []).join(" ")}`)).toEqual([]);
  });

  it("cannot be replaced by an object the app role makes in the public schema (no CREATE there)", async () => {
    const { rows } = await inspector.query<{ allowed: boolean }>("select has_schema_privilege('rhizo_app', 'public', 'CREATE') as allowed");
    expect(rows[0].allowed).toBe(false);
  });
});
