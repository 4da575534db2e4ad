import PgBoss from "pg-boss";
import type { Pool } from "pg";
import { jobs, type JobName } from "@/lib/jobs/definitions";

/** pg-boss keeps its tables in a schema of its own. */
export const jobQueueSchema = "pgboss";
/** pg-boss's own queue for cron schedules; created here because only the owner may create queues. */
const cronQueue = "__pgboss__send-it";

/** A queue's pg-boss options, from the job's definition. */
export function queueOptions(name: JobName): PgBoss.Queue {
  const job = jobs[name];
  return {
    name,
    policy: "standard",
    retryLimit: job.retryLimit,
    retryDelay: job.retryDelaySeconds,
    retryBackoff: job.backoff,
    expireInSeconds: job.expireInSeconds,
  };
}

/**
 * Run by scripts/migrate.ts as the owner, after the drizzle migrations (the migrations test
 * applies those to a bare database, so nothing in them may need this schema). pg-boss creates or
 * upgrades its own schema; every queue of lib/jobs/definitions.ts is created or updated (a queue
 * is a table partition, so creating one is DDL, which no app role may do); then the grants, the
 * least each role needs:
 * - rhizo_jobs, the workers' role, runs pg-boss: it fetches, completes, retries, archives and
 *   schedules jobs, and has nothing outside this schema.
 * - rhizo_app adds jobs inside a request's own transaction (pg-boss's insert joins the queue's
 *   options and returns the job's id). It cannot read any job's payload or change a job.
 */
export async function installJobQueue(ownerUrl: string, ownerPool: Pool): Promise<void> {
  const boss = new PgBoss({ connectionString: ownerUrl, schema: jobQueueSchema, max: 1, migrate: true, supervise: false, schedule: false });
  boss.on("error", (error) => console.error("pg-boss (migration)", error));
  await boss.start();
  try {
    const existing = new Set((await boss.getQueues()).map((queue) => queue.name));
    for (const name of Object.keys(jobs) as JobName[]) {
      if (existing.has(name)) await boss.updateQueue(name, queueOptions(name));
      else await boss.createQueue(name, queueOptions(name));
    }
    if (!existing.has(cronQueue)) await boss.createQueue(cronQueue);
  } finally {
    await boss.stop({ graceful: false, wait: true });
  }
  const s = jobQueueSchema;
  await ownerPool.query(`
    REVOKE ALL ON SCHEMA ${s} FROM PUBLIC;
    GRANT USAGE ON SCHEMA ${s} TO rhizo_jobs, rhizo_app;
    REVOKE ALL ON ALL TABLES IN SCHEMA ${s} FROM rhizo_jobs, rhizo_app;
    GRANT SELECT, INSERT, UPDATE, DELETE ON ${s}.job, ${s}.archive, ${s}.schedule TO rhizo_jobs;
    GRANT SELECT, UPDATE ON ${s}.version TO rhizo_jobs;
    GRANT SELECT ON ${s}.queue, ${s}.subscription TO rhizo_jobs;
    GRANT INSERT, SELECT (id) ON ${s}.job TO rhizo_app;
    GRANT SELECT ON ${s}.queue TO rhizo_app;
  `);
}
