import type { NextAuthConfig } from "next-auth";
import { getToken } from "next-auth/jwt";

/** Paths anyone may open without signing in. */
export const publicPaths = ["/sign-in", "/forbidden", "/accept-invitation", "/reset-password", "/cautions", "/unsubscribe"];

export const sessionMaxAgeSeconds = 8 * 60 * 60;

export function isPublicPath(pathname: string): boolean {
  return publicPaths.some((path) => pathname === path || pathname.startsWith(`${path}/`));
}

/** Settings shared by auth.ts and the proxy; no database, no password hashing. */
export const authConfig = {
  pages: { signIn: "/sign-in" },
  // A working day; a session older than this has to sign in again.
  session: { strategy: "jwt", maxAge: sessionMaxAgeSeconds },
  providers: [],
  logger: {
    // Failed sign-ins are expected and audited; they need no stack trace in the server log.
    error(error) {
      if ((error as { type?: string }).type === "CredentialsSignin") return;
      console.error(error);
    },
  },
} satisfies NextAuthConfig;

/** Session cookies already decoded, with the member and expiry they carry (a bounded map). */
const decodedSessions = new Map<string, { memberId: string | null; expiresAt: number }>();

/**
 * The signed-in member's id from the session cookie, or null. Only decodes the cookie: it is
 * never re-issued, so a session ends a fixed time after sign-in and a sign-out cannot be undone
 * by a request still in flight (next-auth's own auth() re-encrypts the cookie on every call).
 * A cookie seen before is not decrypted again until it expires.
 */
export async function sessionMemberId(headers: Headers): Promise<string | null> {
  const cookie = headers.get("cookie");
  if (!cookie) return null;
  const seen = decodedSessions.get(cookie);
  if (seen && seen.expiresAt > Date.now()) return seen.memberId;
  // Browsers keep a __Secure- cookie only for https, so its presence tells which name was used.
  const secureCookie = cookie.includes("__Secure-authjs.session-token");
  const token = await getToken({ req: { headers }, secret: process.env.AUTH_SECRET, secureCookie });
  if (!token?.exp) return null;
  if (decodedSessions.size >= 1000) decodedSessions.delete(decodedSessions.keys().next().value!);
  decodedSessions.set(cookie, { memberId: token.memberId ?? null, expiresAt: token.exp * 1000 });
  return token.memberId ?? null;
}
