import NextAuth, { CredentialsSignin } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import type {} from "next-auth/jwt";
import { z } from "zod";
import { authConfig } from "./auth.config";
import { checkPassword, type SignInOutcome } from "@/lib/data/sign-in";

declare module "next-auth" {
  interface Session {
    user: { id: string; name: string; email: string };
  }
}
declare module "next-auth/jwt" {
  interface JWT {
    memberId?: string;
  }
}

export class RateLimitedSignin extends CredentialsSignin {
  code = "rate_limited";
}

const credentialsSchema = z.object({ email: z.string().trim().toLowerCase().email(), password: z.string().min(1) });

function clientAddress(request: Request): string {
  // Behind a reverse proxy that sets it; on loopback every request is "local".
  return request.headers.get("x-forwarded-for")?.split(",")[0]?.trim() || request.headers.get("x-real-ip") || "local";
}

export const { handlers, auth, signIn, signOut } = NextAuth({
  ...authConfig,
  providers: [
    Credentials({
      credentials: { email: {}, password: {} },
      async authorize(credentials, request) {
        const parsed = credentialsSchema.safeParse(credentials);
        if (!parsed.success) return null;
        const outcome: SignInOutcome = await checkPassword(parsed.data.email, parsed.data.password, clientAddress(request));
        if (outcome.status === "rate_limited") throw new RateLimitedSignin();
        if (outcome.status !== "ok") return null;
        return { id: outcome.userId, name: outcome.name, email: parsed.data.email };
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user?.id) token.memberId = user.id;
      return token;
    },
    session({ session, token }) {
      if (token.memberId) session.user.id = token.memberId;
      return session;
    },
  },
});
