import "server-only";
import { and, eq, gt, lt, sql } from "drizzle-orm";
import { keptUntilChanged } from "@/db/change-feed";
import { type FarmContext } from "@/db/client";
import { endedSessions, users } from "@/db/schema";
import { sessionIsCurrent, type SessionClaims } from "@/lib/auth/sessions";
import { actor, recordAudit } from "./audit";
import { loadMemberForRequest, type Member } from "./members";
import { selfContext, asMember, asSelf } from "./context";

/** Signing out: this session ends for good, in every process (the change feed drops their copies). */
export async function endSession(claims: SessionClaims, expiresAt: Date): Promise<void> {
  await asSelf(claims.memberId, async (tx) => {
    await tx.insert(endedSessions).values({ sessionId: claims.sessionId, userId: claims.memberId, expiresAt }).onConflictDoNothing();
    // Rows of sessions that would have expired by now say nothing any more.
    await tx.delete(endedSessions).where(and(eq(endedSessions.userId, claims.memberId), lt(endedSessions.expiresAt, sql`now()`)));
  });
}

/** "Sign out everywhere": every session of the member, this one included, ends. */
export async function endEverySession(member: Member): Promise<void> {
  await asMember(member, async (tx) => {
    await tx
      .update(users)
      .set({ sessionVersion: sql`${users.sessionVersion} + 1` })
      .where(eq(users.id, member.id));
    await recordAudit(tx, {
      ...actor(member),
      farmId: member.farmId,
      action: "sessions.ended-everywhere",
      subject: member.email,
    });
  });
}

async function listEndedSessions(caller: FarmContext): Promise<ReadonlySet<string>> {
  return asSelf(caller.userId!, async (tx) => {
    const rows = await tx
      .select({ sessionId: endedSessions.sessionId })
      .from(endedSessions)
      .where(and(eq(endedSessions.userId, caller.userId!), gt(endedSessions.expiresAt, sql`now()`)));
    return new Set(rows.map((row) => row.sessionId));
  });
}

/** The member's signed-out sessions, for the guard on every request; kept until a member's rows change. */
const keptEndedSessions = keptUntilChanged("the guard's ended sessions", "members", listEndedSessions, () => "");

/**
 * The guard's question on every request: the member a session cookie names, as the database has
 * them now, or null when they are deactivated or the session has ended. Both reads are copies
 * kept until PostgreSQL announces a change, so another process's sign-out counts here at once.
 */
export async function memberForSession(claims: SessionClaims, now = Date.now()): Promise<Member | null> {
  const [member, endedSessionIds] = await Promise.all([
    loadMemberForRequest(claims.memberId),
    keptEndedSessions(selfContext(claims.memberId)),
  ]);
  if (!member?.active) return null;
  return sessionIsCurrent({ sessionVersion: member.sessionVersion, endedSessionIds }, claims, now) ? member : null;
}
