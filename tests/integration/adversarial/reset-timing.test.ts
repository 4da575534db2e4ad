import { Client, type Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { inviteMember, loadMember, requestPasswordReset, type Member } from "@/lib/data/members";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { mailsTo, mailTo, withMailServerDown } from "../../support/mailbox";
import { superuserPool } from "../support/database";

// Attack: tell members' addresses from strangers' by how long the reset form (or an invitation)
// takes to answer. Before, a known address made the request write a reset link and wait for the
// mail server; an unknown one did neither. Now the request only queues a job, and this test holds
// the work done before the answer identical: the same statements, in the same order, whatever
// the address. (A timing measurement would be noise on a shared machine; equal work is the cause.)

let inspector: Pool;
const run = Date.now().toString(36);

/** The SQL text of every statement the app sends while `work` runs, parameters left out. */
async function statementsOf(work: () => Promise<unknown>): Promise<string[]> {
  const seen: string[] = [];
  // Every pooled connection is a pg Client; its query method sees each statement drizzle sends.
  const clients = Client.prototype as unknown as { query: (...args: unknown[]) => unknown };
  const original = clients.query;
  clients.query = function (this: unknown, ...args: unknown[]) {
    const query = args[0] as string | { text: string };
    seen.push(typeof query === "string" ? query : query.text);
    return original.apply(this, args);
  };
  try {
    await work();
  } finally {
    clients.query = original;
  }
  return seen.filter((text) => !/^LISTEN /.test(text));
}

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where lower(email) = lower($1)", [email]);
  return (await loadMember(rows[0].id))!;
}

beforeAll(async () => {
  inspector = superuserPool();
  await runQueuedJobs();
});

afterAll(async () => {
  await inspector.end();
  await stopJobWorkers();
  await closeDatabase();
});

describe("the password-reset form", () => {
  it("does the same work before answering, for a member's address and a stranger's", async () => {
    const member = "manager@wrenfield.example";
    const stranger = `stranger-${run}@nowhere.example`;
    const resetsBefore = (await mailsTo(member, /Reset/)).length;
    const tokensBefore = await inspector.query<{ n: number }>(
      "select count(*)::int as n from access_tokens where purpose = 'password_reset'",
    );

    // The answer waits on nothing about the address: not even on the mail server, which is down here.
    const forMember = await withMailServerDown(() => statementsOf(() => requestPasswordReset(member, "198.51.100.4")));
    const forStranger = await withMailServerDown(() => statementsOf(() => requestPasswordReset(stranger, "198.51.100.4")));
    expect(forMember.length).toBeGreaterThan(0);
    expect(forStranger).toEqual(forMember);
    // Nothing about the address was looked up yet: no link made, no mail sent.
    const tokensAfter = await inspector.query<{ n: number }>(
      "select count(*)::int as n from access_tokens where purpose = 'password_reset'",
    );
    expect(tokensAfter.rows[0].n).toBe(tokensBefore.rows[0].n);
    expect(forMember.join("\n")).not.toMatch(/app_create_password_reset|users/);

    // The job, after the answer, does the rest: the member gets a link, the stranger nothing.
    expect(await runQueuedJobs()).toBeGreaterThanOrEqual(3);
    expect((await mailTo(member, /Reset/, { count: resetsBefore + 1 })).text).toMatch(/reset-password\?token=/);
    expect(await mailsTo(stranger)).toEqual([]);
  });
});

describe("an invitation", () => {
  it("takes the same work from a farm manager whether or not the address belongs to someone on another farm", async () => {
    const manager = await memberByEmail("manager@fernbrook.example");
    const newcomer = `newcomer-${run}@example.test`;
    // An active member of another farm, whom row-level security hides from Fernbrook's manager.
    const elsewhere = "manager@stonebank.example";
    // With the mail server down both still answer: the e-mail goes out from a job after the commit.
    const forNewcomer = await withMailServerDown(() =>
      statementsOf(() => inviteMember(manager, { email: newcomer, role: "grower", farmId: manager.farmId })),
    );
    const forElsewhere = await withMailServerDown(() =>
      statementsOf(() => inviteMember(manager, { email: elsewhere, role: "grower", farmId: manager.farmId })),
    );
    expect(forNewcomer.length).toBeGreaterThan(0);
    expect(forElsewhere).toEqual(forNewcomer);
  });
});
