import { Client, type Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
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
  it("cannot be made by the app role: rhizo_app has no TEMPORARY privilege on the database", async () => {
    const { rows } = await inspector.query<{ allowed: boolean }>(
      "select has_database_privilege('rhizo_app', current_database(), 'TEMPORARY') as allowed",
    );
    expect(rows[0].allowed).toBe(false);
    await expect(asApp(shadowAccessTokens)).rejects.toThrow(/permission denied to create temporary tables/);
    expect(await victimHash()).toBe(victim.passwordHash);
    expect(await checkPassword(victim.email, attackerPassword, "10.9.0.1")).toEqual({ status: "refused" });
  });

  it("would not be read by a definer function even where the role could make one (search_path puts pg_temp last)", async () => {
    const database = process.env.RHIZO_DATABASE!;
    await inspector.query(`grant temporary on database "${database}" to rhizo_app`);
    try {
      const outcome = await asApp(shadowAccessTokens);
      expect(outcome).toBe("unknown");
    } finally {
      await inspector.query(`revoke temporary on database "${database}" from rhizo_app`);
    }
    expect(await victimHash()).toBe(victim.passwordHash);
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
