import { eq } from "drizzle-orm";
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, withFarmContext } from "@/db/client";
import { accessTokens, auditEvents, users } from "@/db/schema";
import {
  admitFarm,
  changePassword,
  changeRole,
  deactivatePerson,
  setFarmStatus,
  updatePreferences,
  getAccessTokenState,
  inviteMember,
  listFarmPeople,
  listMembership,
  loadMember,
  redeemAccessToken,
  requestPasswordReset,
  transferManagerRole,
  type Member,
} from "@/lib/data/members";
import { listAuditEvents } from "@/lib/data/audit";
import { checkPassword } from "@/lib/data/sign-in";
import { runQueuedJobs, stopJobWorkers } from "@/lib/jobs/worker";
import { hashToken, newAccessToken } from "@/lib/members/tokens";
import { mailsTo, mailTo as mailArrived, tokenIn } from "../support/mailbox";
import { databaseRefusal, superuserPool } from "./support/database";

let inspector: Pool;
let coordinator: Member;
const run = Date.now().toString(36);

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where lower(email) = lower($1)", [email]);
  const member = await loadMember(rows[0].id);
  if (!member) throw new Error(`no member ${email}`);
  return member;
}

/** Sends what the last steps queued (the mail job), then the newest message to `to` in the local inbox. */
async function mailTo(to: string, subject: RegExp, count = 1) {
  await runQueuedJobs();
  return mailArrived(to, subject, { count });
}

beforeAll(async () => {
  inspector = superuserPool();
  coordinator = await memberByEmail("coordinator@aldervalley.example");
});

afterAll(async () => {
  await inspector.end();
  await stopJobWorkers();
  await closeDatabase();
});

describe("admitting a farm and inviting its people by e-mail", () => {
  const farmName = `Yew Knoll ${run}`;
  const managerEmail = `manager-${run}@yewknoll.example`;
  const growerEmail = `grower-${run}@yewknoll.example`;
  let farmId: string;
  let managerToken: string;

  it("admits the farm and e-mails its manager a one-time link", async () => {
    farmId = await admitFarm(coordinator, { name: farmName, region: "Alder Heights", contactEmail: managerEmail });
    await inviteMember(coordinator, { email: managerEmail, role: "farm_manager", farmId });
    const mail = await mailTo(managerEmail, /invited/);
    expect(mail.subject).toContain(farmName);
    expect(mail.html).toContain("accept-invitation?token=");
    managerToken = tokenIn(mail.text, "accept-invitation");

    const stored = await inspector.query("select token_hash, used_at from access_tokens where email = $1", [managerEmail]);
    expect(stored.rows).toEqual([{ token_hash: hashToken(managerToken), used_at: null }]);
    expect(JSON.stringify(stored.rows)).not.toContain(managerToken);
    expect(await getAccessTokenState(managerToken)).toMatchObject({
      purpose: "invitation",
      email: managerEmail,
      role: "farm_manager",
      farmName,
      state: "valid",
    });

    const membership = await listMembership(coordinator);
    expect(membership.farms.map((farm) => farm.name)).toContain(farmName);
    expect(membership.invitations.map((invitation) => invitation.email)).toContain(managerEmail);
  });

  it("lets the manager accept once, sign in, and invite a grower who accepts too", async () => {
    expect(await redeemAccessToken(managerToken, "invitation", { name: "Noor Castell", password: "birch-knoll-2026" })).toEqual({
      status: "accepted",
      email: managerEmail,
    });
    expect(await redeemAccessToken(managerToken, "invitation", { name: "Someone Else", password: "another-password" })).toEqual({
      status: "used",
    });
    expect((await checkPassword(managerEmail, "birch-knoll-2026", "127.0.0.1")).status).toBe("ok");

    const manager = await memberByEmail(managerEmail);
    expect(manager).toMatchObject({ role: "farm_manager", farmId, farmName, name: "Noor Castell" });

    await inviteMember(manager, { email: growerEmail, role: "grower", farmId });
    const growerToken = tokenIn((await mailTo(growerEmail, /invited/)).text, "accept-invitation");
    expect(await redeemAccessToken(growerToken, "invitation", { name: "Eli Marsh", password: "grows-oysters-1" })).toMatchObject({
      status: "accepted",
    });

    const people = await listFarmPeople(manager);
    expect(people.people.map((person) => [person.email, person.role])).toEqual(
      expect.arrayContaining([
        [managerEmail, "farm_manager"],
        [growerEmail, "grower"],
      ]),
    );
    const farmLog = await listAuditEvents(manager, "farm");
    expect(farmLog.map((event) => event.action)).toEqual(expect.arrayContaining(["member.invited", "member.joined"]));
    // Once each in the farm's log, though a joining is recorded on the co-op's log as well.
    expect(farmLog.filter((event) => event.subject === growerEmail).map((event) => [event.who, event.sentence])).toEqual([
      ["Eli Marsh", "Eli Marsh accepted the invitation and joined as a grower."],
      ["Noor Castell", `Noor Castell invited ${growerEmail} to join as a grower.`],
    ]);
  });

  it("refuses a manager inviting to another farm or into a role above a grower", async () => {
    const manager = await memberByEmail(managerEmail);
    const fernbrook = await memberByEmail("manager@fernbrook.example");
    await expect(inviteMember(manager, { email: `x-${run}@example.test`, role: "grower", farmId: fernbrook.farmId })).rejects.toThrow(
      /own farm/,
    );
    await expect(inviteMember(manager, { email: `y-${run}@example.test`, role: "farm_manager", farmId })).rejects.toThrow(/cannot invite/);
    await expect(inviteMember(coordinator, { email: "grower@fernbrook.example", role: "observer", farmId: null })).rejects.toThrow(
      /already belongs/,
    );
  });

  it("hands the manager role to a grower, who is told by e-mail, and the old manager becomes a grower", async () => {
    const manager = await memberByEmail(managerEmail);
    const grower = await memberByEmail(growerEmail);
    await transferManagerRole(manager, grower.id);
    expect((await memberByEmail(growerEmail)).role).toBe("farm_manager");
    expect((await memberByEmail(managerEmail)).role).toBe("grower");
    expect((await mailTo(growerEmail, /role/)).text).toMatch(/from grower to farm manager/);
  });

  it("lets the coordinator change a role with an e-mail, but never leave a farm without a manager", async () => {
    const newManager = await memberByEmail(growerEmail);
    await expect(changeRole(coordinator, newManager.id, "grower")).rejects.toThrow(/only manager/);
    const oldManager = await memberByEmail(managerEmail);
    await changeRole(coordinator, oldManager.id, "farm_manager");
    expect((await memberByEmail(managerEmail)).role).toBe("farm_manager");
    expect((await mailTo(managerEmail, /role/)).text).toContain("from grower to farm manager");
    const coopLog = await listAuditEvents(coordinator, "coop");
    expect(coopLog.find((event) => event.action === "member.role-changed" && event.subject === managerEmail)).toBeTruthy();
  });

  it("deactivates a person so they can no longer sign in", async () => {
    const grower = await memberByEmail(growerEmail);
    await deactivatePerson(coordinator, grower.id);
    expect((await checkPassword(growerEmail, "grows-oysters-1", "127.0.0.2")).status).toBe("refused");
  });
});

describe("suspending a farm and changing one's own password", () => {
  it("keeps a suspended farm's people out until the coordinator reinstates it", async () => {
    const wrenfield = await memberByEmail("manager@wrenfield.example");
    await setFarmStatus(coordinator, wrenfield.farmId!, "suspended");
    expect((await checkPassword("manager@wrenfield.example", "alder-valley-demo", "127.0.0.4")).status).toBe("refused");
    expect((await loadMember(wrenfield.id))?.active).toBe(false);
    await setFarmStatus(coordinator, wrenfield.farmId!, "active");
    expect((await checkPassword("manager@wrenfield.example", "alder-valley-demo", "127.0.0.4")).status).toBe("ok");
  });

  it("changes a password only with the current one, and says so by e-mail", async () => {
    const observer = await memberByEmail("observer@extension.example");
    await expect(changePassword(observer, "wrong-password", "observer-new-pass")).rejects.toMatchObject({
      fieldProblems: [{ field: "currentPassword" }],
    });
    await changePassword(observer, "alder-valley-demo", "observer-new-pass");
    expect((await mailTo("observer@extension.example", /password was changed/)).text).toContain("reset it from the sign-in page");
    expect((await checkPassword("observer@extension.example", "observer-new-pass", "127.0.0.5")).status).toBe("ok");
    await changePassword(observer, "observer-new-pass", "alder-valley-demo");
    await updatePreferences(observer, { displayUnits: "imperial", notifyReminders: false });
    expect(await loadMember(observer.id)).toMatchObject({ displayUnits: "imperial" });
    await updatePreferences(observer, { displayUnits: "metric", notifyReminders: true });
  });
});

describe("expired, reused and unknown links", () => {
  it("refuses an expired invitation and changes nothing", async () => {
    const email = `late-${run}@example.test`;
    const { token, tokenHash } = newAccessToken();
    await inspector.query(
      "insert into access_tokens (purpose, token_hash, email, role, expires_at) values ('invitation', $1, $2, 'observer', now() - interval '1 minute')",
      [tokenHash, email],
    );
    expect(await getAccessTokenState(token)).toMatchObject({ state: "expired" });
    expect(await redeemAccessToken(token, "invitation", { name: "Late", password: "too-late-now-1" })).toEqual({ status: "expired" });
    expect((await inspector.query("select 1 from users where email = $1", [email])).rowCount).toBe(0);
  });

  it("refuses an unknown token, a malformed one, and a reset token used as an invitation", async () => {
    expect(await redeemAccessToken(newAccessToken().token, "invitation", { name: "X", password: "whatever-123" })).toEqual({
      status: "unknown",
    });
    expect(await redeemAccessToken("not-a-token", "invitation", { name: "X", password: "whatever-123" })).toEqual({ status: "unknown" });
    expect(await getAccessTokenState("not-a-token")).toBeNull();
  });

  it("gives the anonymous context no direct way into tokens or people", async () => {
    const seen = await withFarmContext({ userId: null, farmId: null, role: "anonymous" }, async (tx) => ({
      tokens: await tx.select().from(accessTokens),
      people: await tx.select({ id: users.id }).from(users),
      events: await tx.select({ id: auditEvents.id }).from(auditEvents),
    }));
    expect(seen).toEqual({ tokens: [], people: [], events: [] });
  });
});

describe("password reset by e-mail", () => {
  const email = "manager@hollowoak.example";

  it("answers the same for an unknown address and sends nothing", async () => {
    const nobody = `nobody-${run}@nowhere.example`;
    await runQueuedJobs();
    const before = await inspector.query<{ n: number }>("select count(*)::int as n from outgoing_mail");
    await expect(requestPasswordReset(nobody, "127.0.0.1")).resolves.toBeUndefined();
    expect(await runQueuedJobs()).toBe(1);
    const after = await inspector.query<{ n: number }>("select count(*)::int as n from outgoing_mail");
    expect(after.rows[0].n).toBe(before.rows[0].n);
    expect(await mailsTo(nobody)).toEqual([]);
  });

  it("sets a new password once from the e-mailed link; the old password and the link then stop working", async () => {
    await requestPasswordReset(email.toUpperCase(), "127.0.0.1");
    const token = tokenIn((await mailTo(email, /Reset/)).text, "reset-password");
    expect(await redeemAccessToken(token, "invitation", { name: "", password: "hollow-oak-new-1" })).toEqual({ status: "unknown" });
    expect(await redeemAccessToken(token, "password_reset", { name: "", password: "hollow-oak-new-1" })).toEqual({
      status: "reset",
      email,
    });
    expect(await redeemAccessToken(token, "password_reset", { name: "", password: "hollow-oak-new-2" })).toEqual({ status: "used" });
    expect((await checkPassword(email, "hollow-oak-new-1", "127.0.0.3")).status).toBe("ok");
    expect((await checkPassword(email, "alder-valley-demo", "127.0.0.3")).status).toBe("refused");
  });

  it("lets a newer reset link replace an older one", async () => {
    const sent = (await mailsTo(email, /Reset/)).length;
    await requestPasswordReset(email, "127.0.0.1");
    const first = tokenIn((await mailTo(email, /Reset/, sent + 1)).text, "reset-password");
    await requestPasswordReset(email, "127.0.0.1");
    const second = tokenIn((await mailTo(email, /Reset/, sent + 2)).text, "reset-password");
    expect(second).not.toBe(first);
    expect(await redeemAccessToken(first, "password_reset", { name: "", password: "hollow-oak-new-3" })).toEqual({ status: "used" });
    expect(await redeemAccessToken(second, "password_reset", { name: "", password: "alder-valley-demo" })).toMatchObject({
      status: "reset",
    });
  });
});

describe("password reset limits", () => {
  it("sends at most three reset links an hour to one member, answering the same", async () => {
    const email = "manager@stonebank.example";
    for (let request = 0; request < 5; request += 1) await requestPasswordReset(email, "127.0.0.1");
    await runQueuedJobs();
    const { rows } = await inspector.query<{ n: number }>(
      "select count(*)::int as n from outgoing_mail where recipient = $1 and kind = 'password-reset' and outcome = 'sent'",
      [email],
    );
    expect(rows[0].n).toBe(3);
    await mailArrived(email, /Reset/, { count: 3 });
    expect(await mailsTo(email, /Reset/)).toHaveLength(3);
  });
});

describe("the activity log stays as written", () => {
  it("refuses every role, and the signed-out context, an update or delete of past events", async () => {
    const [event] = (await inspector.query<{ id: string }>("select id from audit_events where farm_id is null order by id limit 1")).rows;
    for (const role of ["coordinator", "observer", "anonymous"] as const) {
      const context = { userId: role === "coordinator" ? coordinator.id : null, farmId: null, role };
      expect(
        await databaseRefusal(
          withFarmContext(context, (tx) =>
            tx
              .update(auditEvents)
              .set({ action: "rewritten" })
              .where(eq(auditEvents.id, Number(event.id))),
          ),
        ),
      ).toMatch(/permission denied/);
      expect(
        await databaseRefusal(withFarmContext(context, (tx) => tx.delete(auditEvents).where(eq(auditEvents.id, Number(event.id))))),
      ).toMatch(/permission denied/);
    }
  });

  it("shows the coordinator co-op events only and a farm manager their farm's only", async () => {
    const fernbrook = await memberByEmail("manager@fernbrook.example");
    expect(
      await databaseRefusal(
        withFarmContext({ userId: fernbrook.id, farmId: fernbrook.farmId, role: "farm_manager" }, (tx) =>
          tx.insert(auditEvents).values({ action: "forged", farmId: coordinator.id }),
        ),
      ),
    ).toMatch(/row-level security|foreign key/);
    const farmIds = await withFarmContext({ userId: fernbrook.id, farmId: fernbrook.farmId, role: "farm_manager" }, (tx) =>
      tx.selectDistinct({ farmId: auditEvents.farmId }).from(auditEvents),
    );
    expect(farmIds.every((row) => row.farmId === fernbrook.farmId)).toBe(true);
    const coopIds = await withFarmContext({ userId: coordinator.id, farmId: null, role: "coordinator" }, (tx) =>
      tx.selectDistinct({ farmId: auditEvents.farmId }).from(auditEvents),
    );
    expect(coopIds).toEqual([{ farmId: null }]);
    await expect(listAuditEvents(fernbrook, "coop")).rejects.toThrow(/coordinator/);
  });
});
