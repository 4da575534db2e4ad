import type { NextAuthConfig } from "next-auth";

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
