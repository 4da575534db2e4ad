import type { NextAuthConfig } from "next-auth";
import { getToken } from "next-auth/jwt";
import { sessionClaimsOf, sessionMaxAgeSeconds, type SessionClaims } from "@/lib/auth/sessions";
import { env } from "@/lib/env";

/** Paths anyone may open without signing in. */
export const publicPaths = ["/sign-in", "/forbidden", "/accept-invitation", "/reset-password", "/cautions", "/glossary", "/unsubscribe"];

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

/** Session cookies already decoded, with the claims and expiry they carry (a bounded map). */
const decodedSessions = new Map<string, { claims: SessionClaims | null; expiresAt: number }>();

/**
 * What the session cookie in a Cookie header says (member, session id and version, time of
 * sign-in), or null. Only
 * decodes the cookie: it is never re-issued here, and whether the session may still be used is
 * the guard's question (lib/auth/sessions.ts), asked of the database on every request. A cookie
 * seen before is not decrypted again until it expires.
 */
export async function readSession(cookie: string | null): Promise<SessionClaims | null> {
  if (!cookie) return null;
  const seen = decodedSessions.get(cookie);
  if (seen && seen.expiresAt > Date.now()) return seen.claims;
  // Browsers keep a __Secure- cookie only for https, so its presence tells which name was used.
  const secureCookie = cookie.includes("__Secure-authjs.session-token");
  const token = await getToken({ req: { headers: new Headers({ cookie }) }, secret: env("AUTH_SECRET"), secureCookie });
  if (!token?.exp) return null;
  const claims = sessionClaimsOf(token);
  if (decodedSessions.size >= 1000) decodedSessions.delete(decodedSessions.keys().next().value!);
  decodedSessions.set(cookie, { claims, expiresAt: token.exp * 1000 });
  return claims;
}
