import { randomUUID } from "node:crypto";
import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import type {} from "next-auth/jwt";
import { z } from "zod";
import { authConfig } from "./auth.config";
import { clientAddress } from "@/lib/auth/client-address";
import { sessionClaimsOf, sessionMaxAgeSeconds } from "@/lib/auth/sessions";
import { endSession } from "@/lib/data/sessions";
import { checkPassword, type SignInOutcome } from "@/lib/data/sign-in";
import { env } from "@/lib/env";

declare module "next-auth" {
  interface Session {
    user: { id: string; name: string; email: string };
  }
  interface User {
    sessionVersion?: number;
  }
}
declare module "next-auth/jwt" {
  interface JWT {
    memberId?: string;
    /** This session's id, recorded as ended when it signs out. */
    sid?: string;
    /** The member's session version when it was issued (lib/auth/sessions.ts). */
    sv?: number;
    /** When the member signed in (ms); a re-issued cookie keeps it. */
    signedInAt?: number;
  }
}

/** Too many tries from this network address: the person is told how long to wait. */
export class RateLimitedSignin extends CredentialsSignin {
  code = "rate_limited";
  constructor(readonly retryAfterSeconds: number) {
    super();
  }
}

const credentialsSchema = z.object({ email: z.string().trim().toLowerCase().email(), password: z.string().min(1) });

export const { handlers, auth, signIn, signOut } = NextAuth({
  ...authConfig,
  providers: [
    Credentials({
      credentials: { email: {}, password: {} },
      async authorize(credentials, request) {
        const parsed = credentialsSchema.safeParse(credentials);
        if (!parsed.success) return null;
        const address = clientAddress(request.headers, env("RHIZO_TRUSTED_PROXIES"));
        const outcome: SignInOutcome = await checkPassword(parsed.data.email, parsed.data.password, address);
        if (outcome.status === "rate_limited") throw new RateLimitedSignin(outcome.retryAfterSeconds);
        if (outcome.status !== "ok") return null;
        return { id: outcome.userId, name: outcome.name, email: parsed.data.email, sessionVersion: outcome.sessionVersion };
      },
    }),
  ],
  events: {
    // Signing out ends this session on the server too, so a copy of the cookie no longer works.
    async signOut(message) {
      const claims = "token" in message ? sessionClaimsOf(message.token) : null;
      if (claims) await endSession(claims, new Date(claims.signedInAt + sessionMaxAgeSeconds * 1000));
    },
  },
  callbacks: {
    jwt({ token, user }) {
      if (user?.id) {
        token.memberId = user.id;
        token.sid = randomUUID();
        token.sv = user.sessionVersion;
        token.signedInAt = Date.now();
      }
      return token;
    },
    session({ session, token }) {
      if (token.memberId) session.user.id = token.memberId;
      return session;
    },
  },
});
