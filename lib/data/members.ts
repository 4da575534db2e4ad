import "server-only";
import { and, asc, desc, eq, gt, isNull, sql } from "drizzle-orm";
import { keptUntilChanged } from "@/db/change-feed";
import type { FarmContext, Transaction } from "@/db/client";
import { accessTokens, cooperativeSettings, farms, users } from "@/db/schema";
import type { AuditAction } from "@/lib/audit/actions";
import { hashPassword, unknownUserHash, verifyPassword } from "@/lib/auth/password";
import type { MemberRole } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { enqueue } from "@/lib/jobs/queue";
import { invitationMessage, passwordChangedMessage, passwordResetMessage, roleChangedMessage } from "@/lib/mail/messages/members";
import { deactivationProblem, invitationProblem, roleChangeProblem, transferProblem, type Person } from "@/lib/members/roles";
import { chosenDisplay, type DateStyle } from "@/lib/time/display";
import { hashToken, isWellFormedToken, tokenExpiresAt, type TokenPurpose } from "@/lib/members/tokens";
import { actor, recordAudit } from "./audit";
import { queueMail, secretLink } from "./mail";
import { selfContext, asMember, asNobody, asSelf, continueAsRedeemer } from "./context";

export interface Member {
  id: string;
  email: string;
  name: string;
  role: MemberRole;
  farmId: string | null;
  farmName: string | null;
  active: boolean;
  displayUnits: "metric" | "imperial";
  /** Null until the member chooses one: pages then use the browser's zone (lib/time/member-display.ts). */
  timeZone: string | null;
  dateStyle: DateStyle;
  /** Sessions issued under another version have ended (lib/auth/sessions.ts). */
  sessionVersion: number;
}

/** Reads a member's own row (the `self` policy needs only the user id), then their farm's name as them. */
export async function loadMember(userId: string): Promise<Member | null> {
  const row = await asSelf(userId, async (tx) => {
    const [found] = await tx
      .select({
        id: users.id,
        email: users.email,
        name: users.name,
        role: users.role,
        farmId: users.farmId,
        active: users.active,
        displayUnits: users.displayUnits,
        timeZone: users.timeZone,
        dateStyle: users.dateStyle,
        sessionVersion: users.sessionVersion,
      })
      .from(users)
      .where(eq(users.id, userId));
    return found;
  });
  if (!row) return null;
  if (!row.farmId) return { ...row, farmName: null };
  const [farm] = await asMember({ ...row, farmName: null }, (tx) =>
    tx.select({ name: farms.name, status: farms.status }).from(farms).where(eq(farms.id, row.farmId!)),
  );
  if (!farm || farm.status !== "active") return { ...row, farmName: farm?.name ?? null, active: false };
  return { ...row, farmName: farm.name };
}

/**
 * loadMember for the guard on every request: kept in this process until PostgreSQL says a member
 * or farm changed (db/change-feed.ts), so a role change or deactivation still counts at the next click.
 * The caller is the context loadMember reads in: the member's own id, no farm, no role yet.
 */
const keptMember = keptUntilChanged(
  "the guard's member",
  "members",
  (caller: FarmContext) => loadMember(caller.userId!),
  () => "",
);

export function loadMemberForRequest(userId: string): Promise<Member | null> {
  return keptMember(selfContext(userId));
}

// ---- Membership: farms, people, invitations, roles, passwords, preferences ----

export type FarmSummary = Pick<typeof farms.$inferSelect, "id" | "name" | "region" | "contactEmail" | "status" | "joinedAt">;

export type PersonSummary = Pick<typeof users.$inferSelect, "id" | "email" | "name" | "role" | "farmId" | "active" | "lastSignInAt">;

export interface PendingInvitation {
  id: string;
  email: string;
  role: MemberRole | null;
  farmId: string | null;
  expiresAt: Date;
}

const personColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  role: users.role,
  farmId: users.farmId,
  active: users.active,
  lastSignInAt: users.lastSignInAt,
};

/** Not used, not expired and not cancelled (cancelling an invitation expires it). */
const invitationIsOpen = () => [
  eq(accessTokens.purpose, "invitation"),
  isNull(accessTokens.usedAt),
  gt(accessTokens.expiresAt, sql`now()`),
];

async function pendingInvitations(tx: Transaction, farmId?: string): Promise<PendingInvitation[]> {
  const conditions = invitationIsOpen();
  if (farmId) conditions.push(eq(accessTokens.farmId, farmId));
  return tx
    .select({
      id: accessTokens.id,
      email: accessTokens.email,
      role: accessTokens.role,
      farmId: accessTokens.farmId,
      expiresAt: accessTokens.expiresAt,
    })
    .from(accessTokens)
    .where(and(...conditions))
    .orderBy(desc(accessTokens.createdAt));
}

/** The coordinator's view: every farm, every person and the invitations still open. */
export async function listMembership(member: Member) {
  return asMember(member, async (tx) => ({
    farms: await tx
      .select({
        id: farms.id,
        name: farms.name,
        region: farms.region,
        contactEmail: farms.contactEmail,
        status: farms.status,
        joinedAt: farms.joinedAt,
      })
      .from(farms)
      .orderBy(asc(farms.name)),
    people: await tx.select(personColumns).from(users).orderBy(asc(users.name)),
    invitations: await pendingInvitations(tx),
  }));
}

/** A farm manager's view: their farm's people and open invitations. */
export async function listFarmPeople(member: Member) {
  if (!member.farmId) throw new AppError("forbidden", "Only a farm's own people have a farm to manage.");
  const farmId = member.farmId;
  return asMember(member, async (tx) => ({
    people: await tx.select(personColumns).from(users).where(eq(users.farmId, farmId)).orderBy(asc(users.name)),
    invitations: await pendingInvitations(tx, farmId),
  }));
}

export async function admitFarm(member: Member, input: { name: string; region: string; contactEmail: string }): Promise<string> {
  return asMember(member, async (tx) => {
    const [existing] = await tx
      .select({ id: farms.id })
      .from(farms)
      .where(sql`lower(${farms.name}) = lower(${input.name})`);
    if (existing)
      throw new AppError("conflict", "A farm of that name is already a member.", [
        { field: "name", message: "Choose a name no other member farm uses." },
      ]);
    const [farm] = await tx
      .insert(farms)
      .values({ name: input.name, region: input.region, contactEmail: input.contactEmail || null })
      .returning({ id: farms.id });
    await recordAudit(tx, {
      ...actor(member),
      action: "farm.admitted",
      subject: input.name,
      details: { farmId: farm.id, region: input.region },
    });
    return farm.id;
  });
}

const farmMoves = { active: "farm.reinstated", suspended: "farm.suspended", removed: "farm.removed" } as const;

export async function setFarmStatus(member: Member, farmId: string, status: FarmSummary["status"]): Promise<void> {
  await asMember(member, async (tx) => {
    const [farm] = await tx.update(farms).set({ status }).where(eq(farms.id, farmId)).returning({ name: farms.name });
    if (!farm) throw new AppError("not_found", "That farm is not a member. Reload the page.");
    await recordAudit(tx, {
      ...actor(member),
      action: farmMoves[status],
      subject: farm.name,
      details: { farmId },
    });
  });
}

/**
 * Sends a one-time invitation link (from the mail job, after the commit). The coordinator invites
 * farm managers, observers and coordinators; a farm manager invites growers to their own farm.
 * An address with an invitation still open is refused: resend or cancel that one instead.
 */
export async function inviteMember(member: Member, input: { email: string; role: MemberRole; farmId: string | null }): Promise<void> {
  const problem = invitationProblem(member, input.role, input.farmId);
  if (problem) throw new AppError("invalid_input", problem, [{ field: "role", message: problem }]);
  const expiresAt = tokenExpiresAt("invitation", new Date());
  const email = input.email.trim().toLowerCase();
  await asMember(member, async (tx) => {
    const [taken] = await tx
      .select({ active: users.active })
      .from(users)
      .where(and(sql`lower(${users.email}) = ${email}`, eq(users.active, true)));
    if (taken)
      throw new AppError("conflict", "That address already belongs to an active member.", [
        { field: "email", message: "This person can already sign in; change their role instead." },
      ]);
    let farmName: string | null = null;
    if (input.farmId) {
      const [farm] = await tx.select({ name: farms.name, status: farms.status }).from(farms).where(eq(farms.id, input.farmId));
      if (!farm) throw new AppError("not_found", "That farm is not a member.", [{ field: "farmId", message: "Choose a member farm." }]);
      if (farm.status !== "active")
        throw new AppError("conflict", "That farm is suspended or removed: reinstate it before inviting its people.", [
          { field: "farmId", message: "Choose an active farm." },
        ]);
      farmName = farm.name;
    }
    const [open] = await tx
      .select({ createdAt: accessTokens.createdAt, expiresAt: accessTokens.expiresAt })
      .from(accessTokens)
      .where(and(...invitationIsOpen(), sql`lower(${accessTokens.email}) = ${email}`));
    if (open)
      throw new AppError(
        "conflict",
        `An invitation to ${email} is already open (sent ${day(open.createdAt)}, good until ${day(open.expiresAt)}).`,
        [{ field: "email", message: "Resend or cancel it under Open invitations instead of sending another." }],
      );
    const [token] = await tx
      .insert(accessTokens)
      .values({ purpose: "invitation", email, farmId: input.farmId, role: input.role, createdBy: member.id, expiresAt })
      .returning({ id: accessTokens.id });
    await recordAudit(tx, {
      ...actor(member),
      farmId: member.role === "farm_manager" ? member.farmId : null,
      action: "member.invited",
      subject: email,
      details: { role: input.role, farmId: input.farmId, expiresAt: expiresAt.toISOString() },
    });
    await queueInvitation(tx, member, { tokenId: token.id, email, role: input.role, farmName, expiresAt });
  });
}

const day = (value: Date) => value.toISOString().slice(0, 10);

async function queueInvitation(
  tx: Transaction,
  member: Member,
  invitation: { tokenId: string; email: string; role: MemberRole | null; farmName: string | null; expiresAt: Date },
): Promise<void> {
  const [settings] = await tx.select({ name: cooperativeSettings.name }).from(cooperativeSettings);
  const link = secretLink({ for: "invitation", tokenId: invitation.tokenId });
  const message = invitationMessage({
    to: invitation.email,
    inviterName: member.name,
    role: invitation.role ?? "member",
    farmName: invitation.farmName,
    cooperativeName: settings?.name ?? "your co-op",
    link: link.slot,
    expiresAt: invitation.expiresAt,
  });
  await queueMail(tx, "invitation", message, link);
}

/** An open invitation the member may see (row-level security: the coordinator's, or a manager's own farm's). */
async function openInvitation(tx: Transaction, invitationId: string) {
  const [invitation] = await tx
    .select({ id: accessTokens.id, email: accessTokens.email, role: accessTokens.role, farmId: accessTokens.farmId })
    .from(accessTokens)
    .where(and(eq(accessTokens.id, invitationId), ...invitationIsOpen()));
  if (!invitation) throw new AppError("not_found", "That invitation is no longer open (accepted, cancelled or expired). Reload the page.");
  return invitation;
}

/** Sends an open invitation again with a new link and a new 7 days; the link sent before stops working at once. */
export async function resendInvitation(member: Member, invitationId: string): Promise<void> {
  const expiresAt = tokenExpiresAt("invitation", new Date());
  await asMember(member, async (tx) => {
    const invitation = await openInvitation(tx, invitationId);
    await tx.update(accessTokens).set({ tokenHash: null, expiresAt }).where(eq(accessTokens.id, invitation.id));
    const [farm] = invitation.farmId ? await tx.select({ name: farms.name }).from(farms).where(eq(farms.id, invitation.farmId)) : [];
    await recordAudit(tx, {
      ...actor(member),
      farmId: member.role === "farm_manager" ? member.farmId : null,
      action: "member.invitation-resent",
      subject: invitation.email,
      details: { role: invitation.role, farmId: invitation.farmId, expiresAt: expiresAt.toISOString() },
    });
    await queueInvitation(tx, member, {
      tokenId: invitation.id,
      email: invitation.email,
      role: invitation.role,
      farmName: farm?.name ?? null,
      expiresAt,
    });
  });
}

/** Withdraws an open invitation: its link stops working and a mail not yet sent is not sent. */
export async function cancelInvitation(member: Member, invitationId: string): Promise<void> {
  await asMember(member, async (tx) => {
    const invitation = await openInvitation(tx, invitationId);
    await tx
      .update(accessTokens)
      .set({ expiresAt: sql`now()` })
      .where(eq(accessTokens.id, invitation.id));
    await recordAudit(tx, {
      ...actor(member),
      farmId: member.role === "farm_manager" ? member.farmId : null,
      action: "member.invitation-cancelled",
      subject: invitation.email,
      details: { role: invitation.role, farmId: invitation.farmId },
    });
  });
}

async function peopleOfFarm(tx: Transaction, farmId: string | null): Promise<Person[]> {
  if (!farmId) return [];
  return tx
    .select({ id: users.id, role: users.role, farmId: users.farmId, active: users.active })
    .from(users)
    .where(eq(users.farmId, farmId));
}

async function findPerson(tx: Transaction, userId: string) {
  const [target] = await tx
    .select({ ...personColumns })
    .from(users)
    .where(eq(users.id, userId));
  if (!target) throw new AppError("not_found", "That person is not a member you can see. Reload the page.");
  return target;
}

/** The coordinator changes someone's role; they are told by e-mail. */
export async function changeRole(member: Member, userId: string, newRole: MemberRole): Promise<void> {
  await asMember(member, async (tx) => {
    const target = await findPerson(tx, userId);
    const problem = roleChangeProblem(asPerson(member), target, newRole, await peopleOfFarm(tx, target.farmId));
    if (problem) throw new AppError("conflict", problem, [{ field: "role", message: problem }]);
    await tx.update(users).set({ role: newRole }).where(eq(users.id, userId));
    await recordAudit(tx, {
      ...actor(member),
      action: "member.role-changed",
      subject: target.email,
      details: { userId, oldRole: target.role, newRole, farmId: target.farmId },
    });
    const [farm] = target.farmId ? await tx.select({ name: farms.name }).from(farms).where(eq(farms.id, target.farmId)) : [];
    const notice = roleChangedMessage({
      to: target.email,
      name: target.name,
      oldRole: target.role,
      newRole,
      changedBy: member.name,
      farmName: farm?.name ?? null,
    });
    await queueMail(tx, "role-changed", notice);
  });
}

/** The coordinator deactivates anyone (but a farm's last manager); a manager removes their growers. */
export async function deactivatePerson(member: Member, userId: string): Promise<void> {
  await asMember(member, async (tx) => {
    const target = await findPerson(tx, userId);
    const problem = deactivationProblem(asPerson(member), target, await peopleOfFarm(tx, target.farmId));
    if (problem) throw new AppError("conflict", problem);
    await tx.update(users).set({ active: false }).where(eq(users.id, userId));
    await recordAudit(tx, {
      ...actor(member),
      farmId: member.role === "farm_manager" ? member.farmId : null,
      action: "member.deactivated",
      subject: target.email,
      details: { userId, role: target.role, farmId: target.farmId },
    });
  });
}

/** A farm manager makes one of their growers the manager and becomes a grower. */
export async function transferManagerRole(member: Member, userId: string): Promise<void> {
  await asMember(member, async (tx) => {
    const target = await findPerson(tx, userId);
    const problem = transferProblem(asPerson(member), target);
    if (problem) throw new AppError("conflict", problem, [{ field: "userId", message: problem }]);
    // Promote first: the farm is never without a manager, and the demotion runs while we still are one.
    await tx.update(users).set({ role: "farm_manager" }).where(eq(users.id, target.id));
    await tx.update(users).set({ role: "grower" }).where(eq(users.id, member.id));
    await recordAudit(tx, {
      ...actor(member),
      farmId: member.farmId,
      action: "member.manager-transferred",
      subject: target.email,
      details: { from: member.id, to: target.id },
    });
    const notice = roleChangedMessage({
      to: target.email,
      name: target.name,
      oldRole: "grower",
      newRole: "farm_manager",
      changedBy: member.name,
      farmName: member.farmName,
    });
    await queueMail(tx, "role-changed", notice);
  });
}

function asPerson(member: Member): Person {
  return { id: member.id, role: member.role, farmId: member.farmId, active: member.active };
}

/**
 * The reset form's request: only queues the "password-reset" job, so the answer comes in the same
 * time, after the same work, whether or not the address belongs to anyone.
 */
export async function requestPasswordReset(email: string, ip: string | null): Promise<void> {
  const address = email.trim().toLowerCase();
  await asNobody((tx) => enqueue(tx, "password-reset", { email: address, ip }));
}

/**
 * The "password-reset" job: a reset for an active member of an active farm (at most three an
 * hour, older unused links voided) and its e-mail; for any other address nothing but the
 * activity-log line. The link itself is made by the mail job.
 */
export async function issuePasswordReset(request: { email: string; ip: string | null }): Promise<void> {
  const expiresAt = tokenExpiresAt("password_reset", new Date());
  await asNobody(async (tx) => {
    const result = await tx.execute<{ user_id: string; name: string; time_zone: string | null; date_style: DateStyle }>(
      sql`select * from app_create_password_reset(${request.email}, ${null}::text, ${expiresAt.toISOString()}::timestamptz)`,
    );
    const found = result.rows[0];
    await recordAudit(tx, {
      action: "password.reset-requested",
      subject: request.email,
      ip: request.ip,
      details: { known: Boolean(found) },
    });
    if (!found) return;
    const link = secretLink({ for: "password-reset", userId: found.user_id });
    // The member's zone only when they chose one: a job knows no browser, so otherwise UTC, named as such.
    const display = chosenDisplay({ timeZone: found.time_zone, dateStyle: found.date_style });
    await queueMail(
      tx,
      "password-reset",
      passwordResetMessage({ to: request.email, name: found.name, link: link.slot, expiresAt, display }),
      link,
    );
  });
}

export interface AccessTokenState {
  purpose: TokenPurpose;
  email: string;
  role: MemberRole | null;
  farmName: string | null;
  state: "valid" | "expired" | "used";
}

/** What the accept or reset page may say about a link before it is used. */
export async function getAccessTokenState(token: string): Promise<AccessTokenState | null> {
  if (!isWellFormedToken(token)) return null;
  return asNobody(async (tx) => {
    const result = await tx.execute<{
      purpose: TokenPurpose;
      email: string;
      role: MemberRole | null;
      farm_name: string | null;
      state: AccessTokenState["state"];
    }>(sql`select * from app_access_token_state(${hashToken(token)})`);
    const row = result.rows[0];
    return row ? { purpose: row.purpose, email: row.email, role: row.role, farmName: row.farm_name, state: row.state } : null;
  });
}

export type RedeemOutcome = { status: "accepted" | "reset"; email: string } | { status: "used" | "expired" | "unknown" | "taken" };

/** Uses a one-time link: sets the password (and, for an invitation, makes the member). */
export async function redeemAccessToken(
  token: string,
  purpose: TokenPurpose,
  input: { name: string; password: string },
): Promise<RedeemOutcome> {
  if (!isWellFormedToken(token)) return { status: "unknown" };
  const passwordHash = await hashPassword(input.password);
  return asNobody(async (tx) => {
    const state = await tx.execute<{ purpose: TokenPurpose }>(sql`select purpose from app_access_token_state(${hashToken(token)})`);
    if (state.rows[0]?.purpose !== purpose) return { status: "unknown" } as const;
    const result = await tx.execute<{
      outcome: RedeemOutcome["status"];
      user_id: string | null;
      farm_id: string | null;
      email: string | null;
      role: MemberRole | null;
    }>(sql`select * from app_redeem_access_token(${hashToken(token)}, ${input.name}, ${passwordHash})`);
    const row = result.rows[0];
    if (!row || (row.outcome !== "accepted" && row.outcome !== "reset")) return { status: row?.outcome ?? "unknown" } as RedeemOutcome;
    // Recorded as the new member, on their farm's log when they have a farm and on the co-op's.
    await continueAsRedeemer(tx, { userId: row.user_id!, farmId: row.farm_id });
    const action: AuditAction = row.outcome === "accepted" ? "member.joined" : "password.reset";
    const entry = {
      action,
      subject: row.email ?? "",
      actorUserId: row.user_id,
      actorLabel: input.name || (row.email ?? ""),
      details: { role: row.role },
    };
    await recordAudit(tx, entry);
    if (row.farm_id) await recordAudit(tx, { ...entry, farmId: row.farm_id });
    return { status: row.outcome, email: row.email ?? "" };
  });
}

export interface AccountSettings {
  email: string;
  name: string;
  displayUnits: "metric" | "imperial";
  notifyReminders: boolean;
  timeZone: string | null;
  dateStyle: DateStyle;
}

export async function getAccountSettings(member: Member): Promise<AccountSettings> {
  return asMember(member, async (tx) => {
    const [row] = await tx
      .select({
        email: users.email,
        name: users.name,
        displayUnits: users.displayUnits,
        notifyReminders: users.notifyReminders,
        timeZone: users.timeZone,
        dateStyle: users.dateStyle,
      })
      .from(users)
      .where(eq(users.id, member.id));
    if (!row) throw new AppError("not_found", "Your account was not found. Sign in again.");
    return row;
  });
}

export async function updatePreferences(
  member: Member,
  input: { displayUnits: "metric" | "imperial"; notifyReminders: boolean; timeZone?: string | null; dateStyle?: DateStyle },
): Promise<void> {
  await asMember(member, async (tx) => {
    await tx.update(users).set(input).where(eq(users.id, member.id));
    await recordAudit(tx, {
      ...actor(member),
      farmId: member.farmId,
      action: "preferences.changed",
      subject: member.email,
      details: input,
    });
  });
}

/** Checks the current password first; wrong answers get the same bcrypt work as right ones. */
export async function changePassword(member: Member, currentPassword: string, newPassword: string): Promise<void> {
  // bcrypt is CPU work: it runs between the transactions, holding no connection.
  const [row] = await asMember(member, (tx) => tx.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, member.id)));
  const [matches, newHash] = await Promise.all([
    verifyPassword(currentPassword, row?.passwordHash ?? (await unknownUserHash())),
    hashPassword(newPassword),
  ]);
  if (!row?.passwordHash || !matches) {
    throw new AppError("invalid_input", "Your current password is not right.", [
      { field: "currentPassword", message: "Type the password you signed in with." },
    ]);
  }
  const checkedHash = row.passwordHash;
  await asMember(member, async (tx) => {
    // Only over the password just checked: a reset that landed in between wins.
    const changed = await tx
      .update(users)
      .set({ passwordHash: newHash })
      .where(and(eq(users.id, member.id), eq(users.passwordHash, checkedHash)))
      .returning({ id: users.id });
    if (changed.length === 0) throw new AppError("conflict", "Your password was changed elsewhere a moment ago. Sign in again.");
    await recordAudit(tx, { ...actor(member), farmId: member.farmId, action: "password.changed", subject: member.email });
    await queueMail(tx, "password-changed", passwordChangedMessage({ to: member.email, name: member.name }));
  });
}
