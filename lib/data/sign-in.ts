import "server-only";
import { and, count, eq, gt, sql } from "drizzle-orm";
import { withFarmContext } from "@/db/client";
import { signInAttempts, users } from "@/db/schema";
import { unknownUserHash, verifyPassword } from "@/lib/auth/password";
import { recordAudit } from "./audit";

export type SignInOutcome = { status: "ok"; userId: string; name: string } | { status: "refused" } | { status: "rate_limited" };

/** Failed attempts allowed in the window, per e-mail address and per network address. */
export const signInLimits = { windowMinutes: 15, perEmail: 5, perAddress: 30 };

interface SignInRow extends Record<string, unknown> {
  id: string;
  name: string;
  password_hash: string | null;
  active: boolean;
  farm_active: boolean;
}

/**
 * Checks an e-mail and password. An unknown e-mail, a wrong password, a deactivated member
 * and a suspended farm all give the same answer after the same bcrypt work.
 */
export async function checkPassword(email: string, password: string, ip: string): Promise<SignInOutcome> {
  return withFarmContext({ userId: null, farmId: null, role: "anonymous" }, async (tx) => {
    const since = sql`now() - make_interval(mins => ${signInLimits.windowMinutes})`;
    const [byEmail] = await tx
      .select({ failures: count() })
      .from(signInAttempts)
      .where(and(eq(signInAttempts.email, email), eq(signInAttempts.succeeded, false), gt(signInAttempts.attemptedAt, since)));
    const [byAddress] = await tx
      .select({ failures: count() })
      .from(signInAttempts)
      .where(and(eq(signInAttempts.ip, ip), eq(signInAttempts.succeeded, false), gt(signInAttempts.attemptedAt, since)));
    if (byEmail.failures >= signInLimits.perEmail || byAddress.failures >= signInLimits.perAddress) {
      await recordAudit(tx, { action: "sign-in.rate-limited", subject: email, ip });
      return { status: "rate_limited" } as const;
    }

    const found = await tx.execute<SignInRow>(sql`select * from app_sign_in_lookup(${email})`);
    const member = found.rows[0];
    const passwordMatches = await verifyPassword(password, member?.password_hash ?? (await unknownUserHash()));
    const succeeded = Boolean(member && member.password_hash && passwordMatches && member.active && member.farm_active);

    await tx.insert(signInAttempts).values({ email, ip, succeeded });
    if (!succeeded || !member) {
      await recordAudit(tx, { action: "sign-in.failed", subject: email, ip });
      return { status: "refused" } as const;
    }
    await tx.execute(sql`select set_config('app.user_id', ${member.id}, true)`);
    await tx.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, member.id));
    await recordAudit(tx, { action: "sign-in", subject: email, actorUserId: member.id, actorLabel: member.name, ip });
    return { status: "ok", userId: member.id, name: member.name } as const;
  });
}
