import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { sql, type SQL } from "drizzle-orm";
import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import { Pool, type PoolClient } from "pg";
import { from as copyFrom } from "pg-copy-streams";
import { listenForChanges, stopChangeFeed } from "./change-feed";
import * as schema from "./schema";
import type { MemberRole } from "@/lib/auth/permissions";
import { env } from "@/lib/env";

export type Database = NodePgDatabase<typeof schema>;
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];

/** Who is asking. Policies read these three settings; an unset one matches nothing. */
export interface FarmContext {
  userId: string | null;
  farmId: string | null;
  role: MemberRole | "anonymous" | null;
}

interface Pools {
  app: Database;
  analyst: Database;
  appPool: Pool;
  analystPool: Pool;
}

// One pool per role, kept on globalThis so dev reloads and test files share it.
const globalForDb = globalThis as unknown as { rhizomorphPools?: Pools };

function pools(): Pools {
  if (!globalForDb.rhizomorphPools) {
    // pg-pool waits for the promise onConnect returns (pg-pool's index.js); @types/pg types it as void.
    /* eslint-disable @typescript-eslint/no-misused-promises */
    const appPool = new Pool({ connectionString: env("DATABASE_URL"), max: 10, onConnect: listenForChanges });
    const analystPool = new Pool({ connectionString: env("ANALYST_DATABASE_URL"), max: 4, onConnect: listenForChanges });
    /* eslint-enable @typescript-eslint/no-misused-promises */
    globalForDb.rhizomorphPools = {
      appPool,
      analystPool,
      app: drizzle(appPool, { schema }),
      analyst: drizzle(analystPool, { schema }),
    };
  }
  return globalForDb.rhizomorphPools;
}

/** The statement that sets the member context; exported so tests can check it binds its values. */
export function farmContextStatement(context: FarmContext) {
  // pg_temp last: the app may make temporary tables (a commit's COPY target, migration 0025), and
  // one left in a pooled connection under a real table's name must never stand in for it.
  return sql`select set_config('app.user_id', ${context.userId ?? ""}, true),
    set_config('app.farm_id', ${context.farmId ?? ""}, true),
    set_config('app.role', ${context.role ?? ""}, true),
    set_config('search_path', 'public, pg_temp', true)`;
}

/**
 * The one way into the database for a request: a transaction as rhizo_app with the caller's
 * user, farm and role set for row-level security. The settings are transaction-local, so they
 * never leak to the next user of a pooled connection.
 */
export async function withFarmContext<T>(context: FarmContext, work: (tx: Transaction) => Promise<T>): Promise<T> {
  return pools().app.transaction(async (tx) => {
    await tx.execute(farmContextStatement(context));
    return work(tx);
  });
}

/**
 * `COPY … FROM STDIN` on the transaction's own connection (pg-copy-streams), so it runs inside
 * the farm's transaction, as rhizo_app, and rolls back with it. `chunks` are rows in COPY's text
 * format (lib/season-logs/copy-text.ts). Drizzle's session keeps that connection as `client`.
 */
export async function copyInto(tx: Transaction, statement: string, chunks: Iterable<string | Uint8Array>): Promise<void> {
  const { client } = tx._.session as unknown as { client: PoolClient };
  await pipeline(Readable.from(chunks), client.query(copyFrom(statement)));
}

/**
 * The pooled-analysis path: rhizo_analyst reads across farms. Only data-layer functions that
 * compute co-op aggregates may call it (pooled results, trial analysis and progress counts,
 * registry usage counts), and what they return must be aggregates, never a farm's rows.
 */
export async function withAnalystAccess<T>(work: (tx: Transaction) => Promise<T>): Promise<T> {
  return pools().analyst.transaction(async (tx) => work(tx));
}

/** One statement on the pooled-analysis path: no transaction, as one statement reads one snapshot anyway. */
export async function readAsAnalyst<Row extends Record<string, unknown>>(query: SQL): Promise<Row[]> {
  return (await pools().analyst.execute(query)).rows as Row[];
}

export async function closeDatabase(): Promise<void> {
  const current = globalForDb.rhizomorphPools;
  globalForDb.rhizomorphPools = undefined;
  if (current) await Promise.all([current.appPool.end(), current.analystPool.end()]);
  await stopChangeFeed();
}
