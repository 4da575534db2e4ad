import { randomUUID } from "node:crypto";
import PgBoss from "pg-boss";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { mailsTo } from "../support/mailbox";
import { as, commitSeasonLog, copyOfTestDatabase, seasonLog, signIn, signOut, startApp, type App, type Database } from "./support/apps";

/**
 * Two `next start` processes of one build on one database, as behind a load balancer. Each keeps
 * copies of what it reads until PostgreSQL announces a change (db/change-feed.ts), and each runs
 * job workers. A change made through one must show in the other's next answer, and a job must run
 * in exactly one of them.
 */

let database: Database;
let one: App;
let other: App;
let oysterId: string;
const run = Date.now().toString(36);

beforeAll(async () => {
  database = await copyOfTestDatabase("two_apps");
  oysterId = (await database.superuser.query<{ id: string }>("select id from species where common_name ilike '%oyster%'")).rows[0].id;
  [one, other] = await Promise.all([startApp(database), startApp(database)]);
});

afterAll(async () => {
  await Promise.all([one?.stop(), other?.stop()]);
  await database?.drop();
});

async function ownOysterBlocks(session: string, app: App): Promise<number> {
  const response = await as(session, app, `/api/results?species=${oysterId}&window=all`);
  expect(response.status).toBe(200);
  const page = (await response.json()) as { ownBlocks: { blocks: number }[] };
  return page.ownBlocks.reduce((sum, strain) => sum + strain.blocks, 0);
}

describe("two app processes on one database", () => {
  it("show in one a season log committed through the other, at once", async () => {
    const manager = await signIn(one, "manager@fernbrook.example");
    // The other process has the farm's blocks in hand (and keeps them) before the commit.
    const before = await ownOysterBlocks(manager, other);
    expect(await ownOysterBlocks(manager, other)).toBe(before);
    await commitSeasonLog(manager, one, seasonLog(`TWO-${run}`, 12));
    // PostgreSQL's notice reaches the other process within milliseconds of the commit.
    await vi.waitFor(async () => expect(await ownOysterBlocks(manager, other)).toBe(before + 12), { timeout: 5_000, interval: 50 });
  });

  it("run each job once between them", async () => {
    const recipients = Array.from({ length: 30 }, (_, index) => `once-${run}-${index}@example.test`);
    // Thirty e-mails queued at once, as requests queue them: a record and a send-mail job each.
    const queue = new PgBoss({
      connectionString: database.env.JOBS_DATABASE_URL,
      schema: "pgboss",
      migrate: false,
      supervise: false,
      schedule: false,
    });
    await queue.start();
    try {
      for (const to of recipients) {
        const mailId = randomUUID();
        await database.superuser.query(
          "insert into outgoing_mail (id, kind, recipient, subject) values ($1, 'role-changed', $2, 'Once only')",
          [mailId, to],
        );
        await queue.send("send-mail", {
          mailId,
          to,
          subject: "Once only",
          text: "Sent by one process only.",
          html: "<p>Sent by one process only.</p>",
        });
      }
    } finally {
      await queue.stop({ graceful: false, wait: true });
    }
    await vi.waitFor(
      async () => {
        const { rows } = await database.superuser.query<{ n: number }>(
          "select count(*)::int as n from outgoing_mail where subject = 'Once only' and outcome = 'sent'",
        );
        expect(rows[0].n).toBe(recipients.length);
      },
      { timeout: 60_000, interval: 250 },
    );
    const { rows: attempts } = await database.superuser.query<{ attempts: number; n: number }>(
      "select attempts, count(*)::int as n from outgoing_mail where subject = 'Once only' group by attempts",
    );
    expect(attempts).toEqual([{ attempts: 1, n: recipients.length }]);
    const { rows: jobs } = await database.superuser.query<{ state: string; retry_count: number; n: number }>(
      "select state, retry_count, count(*)::int as n from pgboss.job where name = 'send-mail' and data->>'subject' = 'Once only' group by 1, 2",
    );
    expect(jobs).toEqual([{ state: "completed", retry_count: 0, n: recipients.length }]);
    for (const to of recipients) await vi.waitFor(async () => expect(await mailsTo(to)).toHaveLength(1), { timeout: 5_000 });
  });

  it("end a session in both when the member signs out in one", async () => {
    const manager = await signIn(one, "manager@fernbrook.example");
    // The other process has the member in hand (and keeps the copy) before the sign-out.
    expect((await as(manager, other, "/api/results?window=all")).status).toBe(200);
    await signOut(manager, one);
    expect((await as(manager, one, "/api/results?window=all")).status).toBe(401);
    await vi.waitFor(async () => expect((await as(manager, other, "/api/results?window=all")).status).toBe(401), {
      timeout: 5_000,
      interval: 50,
    });
  });
});
