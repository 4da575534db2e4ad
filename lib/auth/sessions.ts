/**
 * Sessions that can be ended. A session cookie is a signed, encrypted token the server does not
 * store, so by itself it would work until it expires. Each one therefore names its own session
 * id and the member's session version when it was issued, and the guard checks both against the
 * database on every request (through the per-process copy of the member):
 * - signing out ends that one session (its id is recorded as ended);
 * - "sign out everywhere", a password change or reset, deactivation, a role or farm change and a
 *   farm's suspension raise the member's version, which ends every session issued before.
 * A session also ends a fixed time after sign-in, however often its cookie is re-issued.
 */

/** A working day: a session older than this has to sign in again. */
export const sessionMaxAgeSeconds = 8 * 60 * 60;

/** What a session cookie carries. */
export interface SessionClaims {
  memberId: string;
  sessionId: string;
  sessionVersion: number;
  /** When the member signed in (milliseconds since 1970), kept through any re-issue of the cookie. */
  signedInAt: number;
}

/** What the database says about a member's sessions now. */
export interface MemberSessionState {
  sessionVersion: number;
  endedSessionIds: ReadonlySet<string>;
}

/** The claims of a decoded token, or null when any is missing (a cookie from before sessions could end). */
export function sessionClaimsOf(token: Record<string, unknown> | null): SessionClaims | null {
  if (!token) return null;
  const { memberId, sid, sv, signedInAt } = token;
  if (typeof memberId !== "string" || typeof sid !== "string" || typeof sv !== "number" || typeof signedInAt !== "number") return null;
  return { memberId, sessionId: sid, sessionVersion: sv, signedInAt };
}

/** True while the session may be used: issued under the member's current version, not signed out, not too old. */
export function sessionIsCurrent(state: MemberSessionState, claims: SessionClaims, now: number): boolean {
  if (claims.sessionVersion !== state.sessionVersion) return false;
  if (state.endedSessionIds.has(claims.sessionId)) return false;
  return now - claims.signedInAt < sessionMaxAgeSeconds * 1000 && claims.signedInAt <= now + 60_000;
}
