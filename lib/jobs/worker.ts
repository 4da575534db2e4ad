import "server-only";
import PgBoss from "pg-boss";
import { jobQueueSchema } from "@/db/job-queue";
import { farmsAwaitingRefresh } from "@/lib/data/pooled-refresh";
import { settingsForSchedules } from "@/lib/data/schedules";
import { jobNames, jobs, scheduledJobs, type JobName, type ScheduledJob } from "./definitions";
import { jobHandlers } from "./handlers";
import { env } from "@/lib/env";

/** How the workers' connections show in pg_stat_activity. */
export const workerApplicationName = "rhizomorph jobs";

interface Workers {
  boss: PgBoss;
  timers: NodeJS.Timeout[];
}

// One pg-boss instance per process, kept on globalThis like the pools.
const globalForWorkers = globalThis as unknown as { rhizomorphWorkers?: Promise<Workers> };

function newBoss(working: boolean): PgBoss {
  const connectionString = env("JOBS_DATABASE_URL");
  const boss = new PgBoss({
    connectionString,
    schema: jobQueueSchema,
    application_name: workerApplicationName,
    max: 4,
    // The schema is the owner's, set up by scripts/migrate.ts; this role can only use it.
    migrate: false,
    supervise: working,
    schedule: working,
    // Finished jobs leave the queue after a day and the archive after a week.
    archiveCompletedAfterSeconds: 24 * 60 * 60,
    deleteAfterDays: 7,
  });
  boss.on("error", (error: unknown) => console.error("Job queue:", error));
  return boss;
}

/** Runs one job's handler on its checked payload. */
async function runJob(name: JobName, job: PgBoss.JobWithMetadata<unknown>): Promise<void> {
  const payload: unknown = jobs[name].payload.parse(job.data);
  const handler = jobHandlers[name] as (payload: unknown, attempt: { retryCount: number; retryLimit: number }) => Promise<void>;
  await handler(payload, { retryCount: job.retryCount, retryLimit: job.retryLimit });
}

/**
 * Starts this process's workers: one per queue, each taking one job at a time (pg-boss takes a
 * job with FOR UPDATE SKIP LOCKED, so with several processes each job runs in one), plus pg-boss's
 * upkeep (lost attempts retried after the job's expireInSeconds, old jobs archived), the co-op's
 * schedules, and a refresh for every farm still waiting for one. Called by instrumentation.ts when
 * `next start` boots; nothing else starts workers, so scripts and tests that import the data
 * layer run none unless they call this.
 */
export function startJobWorkers(options: { pollingIntervalSeconds?: number } = {}): Promise<Workers> {
  globalForWorkers.rhizomorphWorkers ??= (async () => {
    const boss = newBoss(true);
    const pollingIntervalSeconds = options.pollingIntervalSeconds ?? env("RHIZO_JOB_POLL_SECONDS");
    try {
      await boss.start();
      for (const name of jobNames) {
        await boss.work(name, { batchSize: 1, includeMetadata: true, pollingIntervalSeconds }, async ([job]) => runJob(name, job));
      }
    } catch (error) {
      await boss.stop({ graceful: false, wait: true }).catch(() => undefined);
      throw error;
    }
    // Schedules and the refresh catch-up, now and every minute; a failure is logged and tried again.
    const upkeep = () =>
      Promise.all([syncSchedules(boss), queueAwaitedRefreshes(boss)]).catch((error: unknown) => console.error("Job upkeep:", error));
    await upkeep();
    return { boss, timers: [setInterval(() => void upkeep(), 60_000).unref()] };
  })();
  const starting = globalForWorkers.rhizomorphWorkers;
  // A start that failed (the database was down) may be tried again.
  starting.catch(() => {
    if (globalForWorkers.rhizomorphWorkers === starting) globalForWorkers.rhizomorphWorkers = undefined;
  });
  return starting;
}

/**
 * A refresh job for each farm whose statistics are still waiting, in case the job that should have
 * covered it was lost (its process was killed mid-refresh: pg-boss would retry it only once it
 * expires). A farm already covered is skipped by the handler, so a duplicate costs one query.
 */
async function queueAwaitedRefreshes(boss: PgBoss): Promise<void> {
  for (const farmId of await farmsAwaitingRefresh()) await boss.send("pooled-refresh", { farmId });
}

/** Makes pg-boss's schedules match what the co-op's settings say for each scheduled job. */
export async function syncSchedules(boss: PgBoss, declared: readonly ScheduledJob[] = scheduledJobs): Promise<void> {
  const settings = await settingsForSchedules();
  const wanted = new Map(declared.map((entry) => [entry.job, { entry, schedule: settings ? entry.when(settings) : null }]));
  // pg-boss's rows carry the time zone they were made with, which its type leaves out.
  const current = new Map(
    (await boss.getSchedules()).map((schedule) => [schedule.name, schedule as PgBoss.Schedule & { timezone?: string }]),
  );
  for (const [name, { entry, schedule }] of wanted) {
    const now = current.get(name);
    const timezone = schedule?.timezone ?? "UTC";
    if (!schedule) {
      if (now) await boss.unschedule(name);
    } else if (!now || now.cron !== schedule.cron || now.timezone !== timezone) {
      await boss.schedule(name, schedule.cron, entry.payload, { tz: timezone });
    }
  }
  for (const name of current.keys()) if (!wanted.has(name as JobName)) await boss.unschedule(name);
}

/**
 * For tests and scripts: runs every job waiting now (those added while running too) in this
 * process, one after another, the way a worker would, and returns how many ran. A failed attempt
 * is recorded as pg-boss's worker would record it (retried later, or failed for good).
 */
export async function runQueuedJobs(names: readonly JobName[] = jobNames): Promise<number> {
  globalForWorkers.rhizomorphWorkers ??= (async () => {
    const boss = newBoss(false);
    await boss.start();
    return { boss, timers: [] };
  })();
  const { boss } = await globalForWorkers.rhizomorphWorkers;
  let ran = 0;
  for (let found = true; found;) {
    found = false;
    for (const name of names) {
      const [job] = await boss.fetch<unknown>(name, { includeMetadata: true });
      if (!job) continue;
      found = true;
      ran += 1;
      try {
        await runJob(name, job);
        await boss.complete(name, job.id);
      } catch (error) {
        await boss.fail(name, job.id, error as object);
      }
    }
  }
  return ran;
}

/** Stops this process's workers (or the queue runQueuedJobs opened), finishing the job in hand first. */
export async function stopJobWorkers(): Promise<void> {
  const current = globalForWorkers.rhizomorphWorkers;
  globalForWorkers.rhizomorphWorkers = undefined;
  if (!current) return;
  const { boss, timers } = await current;
  for (const timer of timers) clearInterval(timer);
  await boss.stop({ graceful: true, wait: true, timeout: 10_000 });
}
