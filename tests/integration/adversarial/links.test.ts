import { sql } from "drizzle-orm";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext, type FarmContext } from "@/db/client";
import { listAuditEvents } from "@/lib/data/audit";
import { farmContextOf } from "@/lib/data/context";
import { listOutgoingMail, queueMail, secretLink } from "@/lib/data/mail";
import {
  cancelInvitation,
  getAccessTokenState,
  inviteMember,
  listFarmPeople,
  listMembership,
  loadMember,
  redeemAccessToken,
  requestPasswordReset,
  resendInvitation,
  type Member,
} from "@/lib/data/members";
import { isAppError } from "@/lib/errors";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { invitationMessage } from "@/lib/mail/messages/members";
import { hashToken } from "@/lib/members/tokens";
import { mailsTo, mailTo, tokenIn } from "../../support/mailbox";
import { databaseRefusal, superuserPool } from "../support/database";

// Attack: take over someone else's account or invitation by finding their one-time link. Until
// this round the coordinator's Outgoing mail page showed every e-mail in full. Now a link's token
// exists only in the e-mail (here: the local mail server's inbox) and, hashed, in access_tokens.

let inspector: Pool;
let coordinator: Member;
let fernbrookManager: Member;
let fernbrookGrower: Member;
let observer: Member;
let hollowOakManager: Member;
const run = Date.now().toString(36);
const observerInvitee = `observer-${run}@extension.example`;
const growerInvitee = `grower-${run}@fernbrook.example`;
const resetMember = "manager@millcreek.example";
let tokens: string[] = [];

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where lower(email) = lower($1)", [email]);
  const member = await loadMember(rows[0].id);
  if (!member) throw new Error(`no member ${email}`);
  return member;
}

async function invitationId(email: string): Promise<string> {
  const { rows } = await inspector.query<{ id: string }>(
    "select id from access_tokens where email = $1 and purpose = 'invitation' order by created_at desc limit 1",
    [email],
  );
  return rows[0].id;
}

async function codeOf(work: Promise<unknown>): Promise<string> {
  try {
    await work;
  } catch (error) {
    if (isAppError(error)) return error.code;
    throw error;
  }
  return "done";
}

beforeAll(async () => {
  inspector = superuserPool();
  coordinator = await memberByEmail("coordinator@aldervalley.example");
  fernbrookManager = await memberByEmail("manager@fernbrook.example");
  fernbrookGrower = await memberByEmail("grower@fernbrook.example");
  observer = await memberByEmail("observer@extension.example");
  hollowOakManager = await memberByEmail("manager@hollowoak.example");

  // Three live links of three people: an observer invited by the coordinator, a grower invited
  // by Fernbrook's manager, and a reset of Mill Creek's manager's password.
  const resetsBefore = (await mailsTo(resetMember, /Reset/)).length;
  await inviteMember(coordinator, { email: observerInvitee, role: "observer", farmId: null });
  await inviteMember(fernbrookManager, { email: growerInvitee, role: "grower", farmId: fernbrookManager.farmId });
  await requestPasswordReset(resetMember, "203.0.113.7");
  await runQueuedJobs();
  tokens = [
    tokenIn((await mailTo(observerInvitee, /invited/)).text, "accept-invitation"),
    tokenIn((await mailTo(growerInvitee, /invited/)).text, "accept-invitation"),
    tokenIn((await mailTo(resetMember, /Reset/, { count: resetsBefore + 1 })).text, "reset-password"),
  ];
});

afterAll(async () => {
  await inspector.end();
  await stopJobWorkers();
  await closeDatabase();
});

describe("another person's reset or invitation link", () => {
  it("is in no stored row of any table, in any schema, job queue and its archive included", async () => {
    const { rows: tables } = await inspector.query<{ schema: string; table: string }>(
      `select schemaname as schema, tablename as table from pg_tables
       where schemaname not in ('pg_catalog', 'information_schema') order by 1, 2`,
    );
    expect(tables.map((row) => `${row.schema}.${row.table}`)).toEqual(
      expect.arrayContaining(["public.outgoing_mail", "public.audit_events", "public.access_tokens", "pgboss.job", "pgboss.archive"]),
    );
    const found = async (needle: string) => {
      const hits: string[] = [];
      for (const { schema, table } of tables) {
        const { rows } = await inspector.query<{ n: number }>(
          `select count(*)::int as n from "${schema}"."${table}" t where strpos(t::text, $1) > 0`,
          [needle],
        );
        if (rows[0].n > 0) hits.push(`${schema}.${table}`);
      }
      return hits;
    };
    for (const token of tokens) {
      expect(await found(token)).toEqual([]);
      // The search works: the token's hash is where it should be, and only there.
      expect(await found(hashToken(token))).toEqual(["public.access_tokens"]);
    }
  });

  it("is on no list the data layer gives any role, nor in any row a role can read", async () => {
    const people: [string, Member | null][] = [
      ["the coordinator", coordinator],
      ["Fernbrook's manager (who sent one invitation)", fernbrookManager],
      ["Fernbrook's grower", fernbrookGrower],
      ["an observer", observer],
      ["Hollow Oak's manager", hollowOakManager],
      ["someone signed out", null],
    ];
    for (const [who, member] of people) {
      const context: FarmContext = member ? farmContextOf(member) : { userId: null, farmId: null, role: "anonymous" };
      const seen: unknown[] = [];
      if (member) {
        seen.push(await listOutgoingMail(member));
        seen.push(await listMembership(member));
        if (member.farmId) seen.push(await listFarmPeople(member).catch(() => null));
        for (const scope of ["coop", "farm"] as const) seen.push(await listAuditEvents(member, scope).catch(() => null));
      }
      seen.push(
        await withFarmContext(context, async (tx) => ({
          tokens: (await tx.execute(sql`select * from access_tokens`)).rows,
          mail: (await tx.execute(sql`select * from outgoing_mail`)).rows,
          events: (await tx.execute(sql`select * from audit_events`)).rows,
        })),
      );
      const text = JSON.stringify(seen);
      for (const token of tokens) expect(text.includes(token), `${who} saw a link`).toBe(false);
      for (const statement of [sql`select data from pgboss.job`, sql`select data from pgboss.archive`]) {
        expect(await databaseRefusal(withFarmContext(context, (tx) => tx.execute(statement))), who).toMatch(/permission denied/);
      }
    }
    // What the coordinator does see: the record of each message, and the hash, which opens nothing.
    const record = await listOutgoingMail(coordinator);
    expect(record.find((row) => row.recipient === growerInvitee)).toMatchObject({ kind: "invitation", outcome: "sent", attempts: 1 });
    for (const token of tokens) {
      expect(await redeemAccessToken(hashToken(token), "invitation", { name: "Intruder", password: "taken-over-1" })).toEqual({
        status: "unknown",
      });
      expect(await getAccessTokenState(hashToken(token))).toBeNull();
    }
  });

  it("cannot be sent to another address, even by a forged job", async () => {
    const attacker = `intruder-${run}@example.test`;
    const target = await invitationId(growerInvitee);
    const before = await inspector.query<{ token_hash: string }>("select token_hash from access_tokens where id = $1", [target]);
    const link = secretLink({ for: "invitation", tokenId: target });
    await withFarmContext(farmContextOf(coordinator), (tx) =>
      queueMail(
        tx,
        "invitation",
        invitationMessage({
          to: attacker,
          inviterName: "Someone",
          role: "grower",
          farmName: "Fernbrook Farm",
          cooperativeName: "the co-op",
          link: link.slot,
          expiresAt: new Date(),
        }),
        link,
      ),
    );
    await runQueuedJobs();
    expect(await mailsTo(attacker)).toEqual([]);
    const { rows } = await inspector.query<{ outcome: string }>("select outcome from outgoing_mail where recipient = $1", [attacker]);
    expect(rows).toEqual([{ outcome: "failed" }]);
    // The grower's own link still works: the forged attempt changed nothing.
    expect((await inspector.query("select token_hash from access_tokens where id = $1", [target])).rows).toEqual(before.rows);
    expect(await getAccessTokenState(tokens[1])).toMatchObject({ state: "valid", email: growerInvitee });
  });
});

describe("cancelling and sending an invitation again", () => {
  it("stops a cancelled invitation's link from working", async () => {
    const email = `cancelled-${run}@example.test`;
    await inviteMember(coordinator, { email, role: "observer", farmId: null });
    await runQueuedJobs();
    const token = tokenIn((await mailTo(email, /invited/)).text, "accept-invitation");
    expect(await getAccessTokenState(token)).toMatchObject({ state: "valid" });

    await cancelInvitation(coordinator, await invitationId(email));
    expect(await getAccessTokenState(token)).toMatchObject({ state: "expired" });
    expect(await redeemAccessToken(token, "invitation", { name: "Too Late", password: "cancelled-link-1" })).toEqual({ status: "expired" });
    expect((await inspector.query("select 1 from users where email = $1", [email])).rowCount).toBe(0);
    expect((await listMembership(coordinator)).invitations.map((invitation) => invitation.email)).not.toContain(email);
    const log = await listAuditEvents(coordinator, "coop");
    expect(log.find((event) => event.action === "member.invitation-cancelled" && event.subject === email)).toBeTruthy();
  });

  it("never sends an invitation cancelled before its e-mail went out", async () => {
    const email = `withdrawn-${run}@example.test`;
    await inviteMember(fernbrookManager, { email, role: "grower", farmId: fernbrookManager.farmId });
    await cancelInvitation(fernbrookManager, await invitationId(email));
    await runQueuedJobs();
    expect(await mailsTo(email)).toEqual([]);
    const { rows } = await inspector.query<{ outcome: string; attempts: number }>(
      "select outcome, attempts from outgoing_mail where recipient = $1",
      [email],
    );
    expect(rows).toEqual([{ outcome: "cancelled", attempts: 0 }]);
  });

  it("sends a new link that works, and the earlier link stops working at once", async () => {
    const email = `resent-${run}@example.test`;
    await inviteMember(coordinator, { email, role: "observer", farmId: null });
    await runQueuedJobs();
    const first = tokenIn((await mailTo(email, /invited/)).text, "accept-invitation");
    await resendInvitation(coordinator, await invitationId(email));
    expect(await getAccessTokenState(first)).toBeNull();
    await runQueuedJobs();
    const second = tokenIn((await mailTo(email, /invited/, { count: 2 })).text, "accept-invitation");
    expect(second).not.toBe(first);
    expect(await redeemAccessToken(first, "invitation", { name: "Old Link", password: "old-link-pass-1" })).toEqual({ status: "unknown" });
    expect(await redeemAccessToken(second, "invitation", { name: "New Link", password: "new-link-pass-1" })).toEqual({
      status: "accepted",
      email,
    });
  });

  it("refuses a second invitation to an address that has one open, and says what to do instead", async () => {
    const email = `twice-${run}@example.test`;
    await inviteMember(coordinator, { email, role: "observer", farmId: null });
    const refused = await inviteMember(coordinator, { email: email.toUpperCase(), role: "coordinator", farmId: null }).catch(
      (error: unknown) => error,
    );
    expect(isAppError(refused) && refused.code).toBe("conflict");
    expect((refused as Error).message).toMatch(/already open/);
    expect(isAppError(refused) && refused.fieldProblems[0]?.message).toMatch(/Resend or cancel/);
    const { rows } = await inspector.query<{ n: number }>("select count(*)::int as n from access_tokens where email = $1", [email]);
    expect(rows[0].n).toBe(1);
  });

  it("lets nobody cancel or resend an invitation they cannot see", async () => {
    const growerInvitation = await invitationId(growerInvitee);
    const observerInvitation = await invitationId(observerInvitee);
    for (const member of [hollowOakManager, fernbrookGrower, observer]) {
      for (const invitation of [growerInvitation, observerInvitation]) {
        expect(await codeOf(cancelInvitation(member, invitation)), member.email).toBe("not_found");
        expect(await codeOf(resendInvitation(member, invitation)), member.email).toBe("not_found");
      }
    }
    // Fernbrook's manager sees their own farm's invitation only.
    expect(await codeOf(cancelInvitation(fernbrookManager, observerInvitation))).toBe("not_found");
    expect(await getAccessTokenState(tokens[0])).toMatchObject({ state: "valid" });
    expect(await getAccessTokenState(tokens[1])).toMatchObject({ state: "valid" });
  });
});
