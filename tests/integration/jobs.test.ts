import { sql } from "drizzle-orm";
import PgBoss from "pg-boss";
import { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDatabase, withFarmContext, type FarmContext } from "@/db/client";
import { farmContextOf } from "@/lib/data/context";
import type { Member } from "@/lib/data/members";
import { jobQueueSchema } from "@/db/job-queue";
import { queueMail } from "@/lib/data/mail";
import { getPooledUpdating } from "@/lib/data/pooled-refresh";
import { commitUpload, createUpload, getImportSetup, parseStored } from "@/lib/data/season-logs";
import { roleChangedMessage } from "@/lib/mail/messages/members";
import { enqueue } from "@/lib/jobs/queue";
import { runQueuedJobs, startJobWorkers, stopJobWorkers, syncSchedules, workerApplicationName } from "@/lib/jobs/worker";
import { mailsTo, mailTo, withMailServerDown } from "../support/mailbox";
import { databaseRefusal, superuserPool, twoDemoFarms, type DemoFarm, memberOf } from "./support/database";

// The job queue (pg-boss as rhizo_jobs, lib/jobs): jobs exist only if the work that queued them
// commits, run once, are retried with backoff, survive a lost attempt, and follow the co-op's
// settings for schedules. A second pg-boss in this file stands in for another app process.

let inspector: Pool;
let farmA: DemoFarm;
let asFarmA: Member;
let otherProcess: PgBoss;
const startedAt = new Date();
const run = Date.now().toString(36);
const coordinatorContext = async (): Promise<FarmContext> => {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = 'coordinator@aldervalley.example'");
  return { userId: rows[0].id, farmId: null, role: "coordinator" };
};

beforeAll(async () => {
  inspector = superuserPool();
  [farmA] = await twoDemoFarms(inspector);
  asFarmA = await memberOf(farmA.managerId);
});

afterAll(async () => {
  await otherProcess?.stop({ graceful: false, wait: true });
  await stopJobWorkers();
  await inspector.end();
  await closeDatabase();
});

async function jobsFor(name: string, field: string, value: string) {
  const { rows } = await inspector.query<{ state: string; retry_count: number; due_in: number }>(
    `select state, retry_count, extract(epoch from start_after - now())::float8 as due_in
     from ${jobQueueSchema}.job where name = $1 and data->>$2 = $3 order by created_on`,
    [name, field, value],
  );
  return rows;
}

describe("who starts workers", () => {
  it("is nobody, for a test or script that imports the data layer and the queue", async () => {
    await withFarmContext(farmContextOf(asFarmA), (tx) => tx.execute(sql`select 1`));
    expect((globalThis as { rhizomorphWorkers?: unknown }).rhizomorphWorkers).toBeUndefined();
    const { rows } = await inspector.query<{ n: number }>(
      "select count(*)::int as n from pg_stat_activity where application_name = $1 and backend_start >= $2",
      [workerApplicationName, startedAt],
    );
    expect(rows[0].n).toBe(0);
  });
});

describe("adding a job inside a request's transaction", () => {
  it("adds it when the transaction commits, and not when it rolls back", async () => {
    const refused = `rolled-back-${run}@example.test`;
    const kept = `committed-${run}@example.test`;
    await expect(
      withFarmContext({ userId: null, farmId: null, role: "anonymous" }, async (tx) => {
        await enqueue(tx, "password-reset", { email: refused, ip: null });
        throw new Error("the request failed after queueing");
      }),
    ).rejects.toThrow(/after queueing/);
    await withFarmContext({ userId: null, farmId: null, role: "anonymous" }, (tx) =>
      enqueue(tx, "password-reset", { email: kept, ip: null }),
    );
    expect(await jobsFor("password-reset", "email", refused)).toEqual([]);
    expect(await jobsFor("password-reset", "email", kept)).toMatchObject([{ state: "created", retry_count: 0 }]);
  });

  it("refuses a payload its job's schema does not allow", async () => {
    await expect(
      withFarmContext(farmContextOf(asFarmA), (tx) => enqueue(tx, "pooled-refresh", { farmId: "not-a-farm" })),
    ).rejects.toThrow();
  });

  it("gives the app's role no way to read, change or take jobs, and the workers' role nothing outside the queue", async () => {
    for (const statement of [
      sql`select data from pgboss.job limit 1`,
      sql`update pgboss.job set state = 'completed'`,
      sql`delete from pgboss.job`,
      sql`select * from pgboss.archive limit 1`,
      sql`insert into pgboss.schedule (name, cron) values ('pooled-refresh', '* * * * *')`,
    ]) {
      expect(await databaseRefusal(withFarmContext(farmContextOf(asFarmA), (tx) => tx.execute(statement)))).toMatch(/permission denied/);
    }
    const workers = new Pool({ connectionString: process.env.JOBS_DATABASE_URL, max: 1 });
    try {
      for (const table of ["users", "blocks", "access_tokens", "outgoing_mail", "pooled_refresh_state"]) {
        expect(await databaseRefusal(workers.query(`select * from public.${table} limit 1`))).toMatch(
          /permission denied for schema public/,
        );
      }
    } finally {
      await workers.end();
    }
  });
});

describe("the pooled refresh after a season-log commit", () => {
  const header =
    "block_id,strain,substrate,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight";

  async function pooledBlocksOf(farmId: string): Promise<number> {
    const { rows } = await inspector.query<{ n: number }>(
      "select coalesce(sum(blocks), 0)::int as n from farm_strain_statistics where farm_id = $1 and flush_window = 'all'",
      [farmId],
    );
    return rows[0].n;
  }

  it("shows results updating from the commit until the job has run, then counts the new blocks", async () => {
    await runQueuedJobs(["pooled-refresh"]);
    await inspector.query("select pooled_refresh_all()");
    await inspector.query("update pooled_refresh_state set completed = requested");
    await vi.waitFor(async () => expect(await getPooledUpdating()).toBe(false), { timeout: 5_000 });
    const before = await pooledBlocksOf(farmA.id);

    const lines = [
      header,
      ...[1, 2, 3, 4].map((n) => `JOB-${run}-${n},PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-10,${500 + n} g`),
    ];
    const content = new TextEncoder().encode(`${lines.join("\r\n")}\r\n`);
    const setup = await getImportSetup(asFarmA);
    const view = await createUpload(asFarmA, { fileName: "job.csv", content, result: await parseStored(content, setup, {}), choices: {} });
    await commitUpload(asFarmA, view.upload.id, {});

    // Earlier commits' jobs (other test files) have run; this commit's is the one waiting.
    expect((await jobsFor("pooled-refresh", "farmId", farmA.id)).filter((job) => job.state !== "completed")).toMatchObject([
      { state: "created" },
    ]);
    expect(await getPooledUpdating()).toBe(true);
    expect(await pooledBlocksOf(farmA.id)).toBe(before);

    expect(await runQueuedJobs(["pooled-refresh"])).toBe(1);
    expect(await pooledBlocksOf(farmA.id)).toBe(before + 4);
    await vi.waitFor(async () => expect(await getPooledUpdating()).toBe(false), { timeout: 5_000 });
  });

  it("queues nothing when the commit is refused", async () => {
    const queued = (await jobsFor("pooled-refresh", "farmId", farmA.id)).length;
    const lines = [header, `JOB-${run}-X,NO-SUCH-STRAIN,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-10,500 g`];
    const content = new TextEncoder().encode(`${lines.join("\r\n")}\r\n`);
    const setup = await getImportSetup(asFarmA);
    const view = await createUpload(asFarmA, { fileName: "bad.csv", content, result: await parseStored(content, setup, {}), choices: {} });
    await expect(commitUpload(asFarmA, view.upload.id, {})).rejects.toThrow();
    expect(await jobsFor("pooled-refresh", "farmId", farmA.id)).toHaveLength(queued);
  });
});

describe("a mail the mail server does not take", () => {
  async function queueRoleMail(to: string) {
    const context = await coordinatorContext();
    await withFarmContext(context, (tx) =>
      queueMail(
        tx,
        "role-changed",
        roleChangedMessage({ to, name: "Retry Test", oldRole: "grower", newRole: "observer", changedBy: "Test", farmName: null }),
      ),
    );
  }

  async function recordOf(to: string) {
    const { rows } = await inspector.query<{ outcome: string; attempts: number; problem: string | null }>(
      "select outcome, attempts, problem from outgoing_mail where recipient = $1",
      [to],
    );
    return rows;
  }

  it("is retried later with a growing delay, says so on the record, and goes out once the server is back", async () => {
    const to = `retry-${run}@example.test`;
    await queueRoleMail(to);
    await withMailServerDown(() => runQueuedJobs(["send-mail"]));
    expect(await recordOf(to)).toEqual([{ outcome: "retrying", attempts: 1, problem: "could not reach the mail server" }]);
    // First retry after 30–60 s (retry delay 30 s, doubled per attempt, with jitter): not yet.
    const [job] = await jobsFor("send-mail", "to", to);
    expect(job).toMatchObject({ state: "retry", retry_count: 0 });
    expect(job.due_in).toBeGreaterThan(20);
    expect(job.due_in).toBeLessThanOrEqual(60);
    expect(await runQueuedJobs(["send-mail"])).toBe(0);

    await inspector.query(`update ${jobQueueSchema}.job set start_after = now() where name = 'send-mail' and data->>'to' = $1`, [to]);
    expect(await runQueuedJobs(["send-mail"])).toBe(1);
    expect(await recordOf(to)).toEqual([{ outcome: "sent", attempts: 2, problem: null }]);
    expect((await mailTo(to, /role/)).text).toContain("from grower to observer");
  });

  it("counts as failed after its last attempt, and is not sent", async () => {
    const to = `failed-${run}@example.test`;
    await queueRoleMail(to);
    // As if every earlier attempt had failed.
    await inspector.query(`update ${jobQueueSchema}.job set retry_count = retry_limit where name = 'send-mail' and data->>'to' = $1`, [to]);
    await withMailServerDown(() => runQueuedJobs(["send-mail"]));
    expect(await recordOf(to)).toEqual([{ outcome: "failed", attempts: 1, problem: "could not reach the mail server" }]);
    expect(await jobsFor("send-mail", "to", to)).toMatchObject([{ state: "failed" }]);
    expect(await runQueuedJobs(["send-mail"])).toBe(0);
    expect(await mailsTo(to)).toEqual([]);
  });
});

describe("a job whose process died while running it", () => {
  it("is taken up again once its attempt has expired, and runs to the end", async () => {
    const to = `lost-${run}@example.test`;
    const context = await coordinatorContext();
    await withFarmContext(context, (tx) =>
      queueMail(
        tx,
        "role-changed",
        roleChangedMessage({ to, name: "Lost Test", oldRole: "grower", newRole: "observer", changedBy: "Test", farmName: null }),
      ),
    );
    otherProcess = new PgBoss({
      connectionString: process.env.JOBS_DATABASE_URL,
      schema: jobQueueSchema,
      migrate: false,
      supervise: false,
      schedule: false,
    });
    await otherProcess.start();
    // The other process takes the job and dies: the job stays active, and no one else takes it.
    const taken = await otherProcess.fetch("send-mail", { batchSize: 10 });
    expect(taken.map((job) => (job.data as { to: string }).to)).toContain(to);
    expect(await runQueuedJobs(["send-mail"])).toBe(0);
    // Its expiry (120 s for mail) passes; the upkeep any live worker runs hands it back.
    await inspector.query(
      `update ${jobQueueSchema}.job set started_on = now() - interval '10 minutes' where name = 'send-mail' and state = 'active'`,
    );
    await otherProcess.expire();
    expect(await jobsFor("send-mail", "to", to)).toMatchObject([{ state: "retry" }]);
    await inspector.query(`update ${jobQueueSchema}.job set start_after = now() where name = 'send-mail' and state = 'retry'`);
    expect(await runQueuedJobs(["send-mail"])).toBeGreaterThanOrEqual(1);
    expect(await mailsTo(to, /role/)).toHaveLength(1);
  });
});

describe("the workers of a process that starts", () => {
  it("refresh every farm still waiting, even when no job for it is left", async () => {
    await runQueuedJobs(["pooled-refresh"]);
    // As after a crash mid-refresh: the farm waits, and its job is gone.
    await inspector.query("update pooled_refresh_state set requested = completed + 1 where farm_id = $1", [farmA.id]);
    expect(await jobsFor("pooled-refresh", "farmId", farmA.id).then((rows) => rows.filter((row) => row.state !== "completed"))).toEqual([]);
    await stopJobWorkers();
    await startJobWorkers({ pollingIntervalSeconds: 0.5 });
    await vi.waitFor(
      async () => {
        const { rows } = await inspector.query<{ waiting: boolean }>(
          "select requested > completed as waiting from pooled_refresh_state where farm_id = $1",
          [farmA.id],
        );
        expect(rows).toEqual([{ waiting: false }]);
      },
      { timeout: 30_000, interval: 200 },
    );
    await stopJobWorkers();
  });
});

describe("jobs scheduled from a co-op setting", () => {
  const settingDriven = [
    {
      job: "pooled-refresh" as const,
      payload: { farmId: "00000000-0000-4000-8000-000000000000" },
      // A stand-in for a real setting such as "cut a release every night at": here, a minimum of four or more farms.
      when: (settings: { minimumFarms: number }) => (settings.minimumFarms >= 4 ? { cron: "30 2 * * *", timezone: "Europe/Berlin" } : null),
    },
  ];

  async function schedules() {
    const { rows } = await inspector.query<{ name: string; cron: string; timezone: string }>(
      `select name, cron, timezone from ${jobQueueSchema}.schedule order by name`,
    );
    return rows;
  }

  it("follow the setting: made when it asks, changed with it, removed when it says none", async () => {
    otherProcess ??= new PgBoss({
      connectionString: process.env.JOBS_DATABASE_URL,
      schema: jobQueueSchema,
      migrate: false,
      supervise: false,
      schedule: false,
    });
    await otherProcess.start();
    const { rows } = await inspector.query<{ minimum: number }>("select minimum_farms as minimum from cooperative_settings");
    const minimum = rows[0].minimum;
    try {
      await inspector.query("update cooperative_settings set minimum_farms = 3");
      await syncSchedules(otherProcess, settingDriven);
      expect(await schedules()).toEqual([]);
      await inspector.query("update cooperative_settings set minimum_farms = 4");
      await syncSchedules(otherProcess, settingDriven);
      expect(await schedules()).toEqual([{ name: "pooled-refresh", cron: "30 2 * * *", timezone: "Europe/Berlin" }]);
      await inspector.query("update cooperative_settings set minimum_farms = 3");
      await syncSchedules(otherProcess, settingDriven);
      expect(await schedules()).toEqual([]);
      // A schedule no job declares (a job since removed) is dropped too.
      await inspector.query("update cooperative_settings set minimum_farms = 4");
      await syncSchedules(otherProcess, settingDriven);
      await syncSchedules(otherProcess, []);
      expect(await schedules()).toEqual([]);
    } finally {
      await inspector.query("update cooperative_settings set minimum_farms = $1", [minimum]);
    }
  });

  it("try to cut a release every ten minutes unless the co-op publishes releases by hand", async () => {
    const { rows } = await inspector.query<{ schedule: string }>("select release_schedule as schedule from cooperative_settings");
    try {
      await inspector.query("update cooperative_settings set release_schedule = 'daily'");
      await syncSchedules(otherProcess!);
      expect(await schedules()).toEqual([
        { name: "pooled-release", cron: "*/10 * * * *", timezone: "UTC" },
        { name: "rejected-upload-files", cron: "30 3 * * *", timezone: "UTC" },
        { name: "trial-reminders", cron: "0 7 * * *", timezone: "UTC" },
      ]);
      await inspector.query("update cooperative_settings set release_schedule = 'manual'");
      await syncSchedules(otherProcess!);
      // Files of rejected uploads are removed every night whatever the release schedule.
      expect(await schedules()).toEqual([
        { name: "rejected-upload-files", cron: "30 3 * * *", timezone: "UTC" },
        { name: "trial-reminders", cron: "0 7 * * *", timezone: "UTC" },
      ]);
    } finally {
      await inspector.query("update cooperative_settings set release_schedule = $1", [rows[0].schedule]);
      await syncSchedules(otherProcess!, []);
    }
  });
});
