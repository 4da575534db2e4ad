import "server-only";
import { sql } from "drizzle-orm";
import PgBoss from "pg-boss";
import type { Transaction } from "@/db/client";
import { jobQueueSchema } from "@/db/job-queue";
import { jobs, type JobName, type JobPayload } from "./definitions";

/**
 * pg-boss's insert, run on the caller's transaction instead of a connection of its own, so the
 * job exists if and only if the request's work commits (and no worker sees it before then).
 * pg-boss writes positional parameters ($1 …); they become drizzle parameters here.
 */
function onTransaction(tx: Transaction): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      const parts = text.split(/\$(\d+)/);
      const query = sql.join(parts.map((part, index) => (index % 2 === 1 ? sql.param(values[Number(part) - 1]) : sql.raw(part))));
      return { rows: (await tx.execute(query)).rows };
    },
  };
}

const globalForQueue = globalThis as unknown as { rhizomorphJobSender?: PgBoss };

// Only ever sends on a transaction it is given; it never opens a connection of its own.
function sender(): PgBoss {
  globalForQueue.rhizomorphJobSender ??= new PgBoss({
    schema: jobQueueSchema,
    db: {
      executeSql: () => Promise.reject(new Error("Jobs are added on the request's own transaction: call enqueue(tx, …)")),
    },
  });
  return globalForQueue.rhizomorphJobSender;
}

/** Adds a job inside `tx`: it runs after the transaction commits, and never if it rolls back. */
export async function enqueue<Name extends JobName>(tx: Transaction, name: Name, payload: JobPayload<Name>): Promise<void> {
  const data = jobs[name].payload.parse(payload) as object;
  await sender().send(name, data, { db: onTransaction(tx) });
}
