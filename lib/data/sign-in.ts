import "server-only";
import { eq, sql } from "drizzle-orm";
import { signInAttempts, users } from "@/db/schema";
import { passwordWorkersBusy, unknownUserHash, verifyPassword } from "@/lib/auth/password";
import { signInPace, waitBeforeNextTry } from "@/lib/auth/sign-in-pace";
import { keyedTurns } from "@/lib/async/keyed-turns";
import { recordAudit } from "./audit";
import { asNobody } from "./context";

export type SignInOutcome =
  | { status: "ok"; userId: string; name: string; sessionVersion: number }
  | { status: "refused" }
  | { status: "rate_limited"; retryAfterSeconds: number };

interface SignInRow extends Record<string, unknown> {
  id: string;
  name: string;
  password_hash: string | null;
  active: boolean;
  farm_active: boolean;
}

/** How long to come back after when the password workers are swamped (a burst of sign-ins). */
const busyRetrySeconds = 30;

const admissionTurn = keyedTurns();

/**
 * Checks an e-mail and password. An unknown e-mail, a wrong password, a deactivated member
 * and a suspended farm all give the same answer after the same bcrypt work. Guessing is slowed
 * per (e-mail, network address) and per address with growing waits (lib/auth/sign-in-pace.ts),
 * so guesses from elsewhere never lock the owner out. The bcrypt work runs between two short
 * transactions, on a worker thread, with no database connection held.
 */
export async function checkPassword(email: string, password: string, ip: string): Promise<SignInOutcome> {
  if (passwordWorkersBusy()) return { status: "rate_limited", retryAfterSeconds: busyRetrySeconds };

  // Tries from one address are admitted one at a time, so a burst sent at once is paced like one
  // sent in turn: in turn within this process (waiting without a connection), then under a lock
  // in PostgreSQL for other processes.
  const admitted = await admissionTurn(ip, () =>
    asNobody(async (tx) => {
      await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`sign-in:${ip}`}, 0))`);
      const pair = signInPace.accountAndAddress;
      const address = signInPace.address;
      // In-flight tries count as failures until they succeed; a success forgives the pair's earlier failures.
      const counted = await tx.execute<{
        pair_failures: number;
        pair_since: number | null;
        address_failures: number;
        address_since: number | null;
      }>(sql`
      with pair as (
        select count(*)::int as failures, extract(epoch from now() - max(attempted_at))::float8 as since
        from sign_in_attempts
        where email = ${email} and ip = ${ip} and not succeeded
          and attempted_at > now() - make_interval(secs => ${pair.windowSeconds})
          and attempted_at > coalesce((select max(attempted_at) from sign_in_attempts
                                       where email = ${email} and ip = ${ip} and succeeded), '-infinity')
      ), address as (
        select count(*)::int as failures, extract(epoch from now() - max(attempted_at))::float8 as since
        from sign_in_attempts
        where ip = ${ip} and not succeeded and attempted_at > now() - make_interval(secs => ${address.windowSeconds})
      )
      select pair.failures as pair_failures, pair.since as pair_since, address.failures as address_failures, address.since as address_since
      from pair, address`);
      const row = counted.rows[0];
      const wait = Math.max(
        waitBeforeNextTry(pair, row.pair_failures, row.pair_since ?? Infinity),
        waitBeforeNextTry(address, row.address_failures, row.address_since ?? Infinity),
      );
      if (wait > 0) {
        await recordAudit(tx, { action: "sign-in.rate-limited", subject: email, ip, details: { waitSeconds: wait } });
        return { admitted: false, wait } as const;
      }
      const found = await tx.execute<SignInRow>(sql`select * from app_sign_in_lookup(${email})`);
      const [attempt] = await tx.insert(signInAttempts).values({ email, ip, succeeded: false }).returning({ id: signInAttempts.id });
      return { admitted: true, attemptId: attempt.id, member: found.rows.at(0) } as const;
    }),
  );
  if (!admitted.admitted) return { status: "rate_limited", retryAfterSeconds: admitted.wait };

  const { member, attemptId } = admitted;
  const passwordMatches = await verifyPassword(password, member?.password_hash ?? (await unknownUserHash()));
  const succeeded = Boolean(member && member.password_hash && passwordMatches && member.active && member.farm_active);

  return asNobody(async (tx) => {
    if (!succeeded || !member) {
      await recordAudit(tx, { action: "sign-in.failed", subject: email, ip });
      return { status: "refused" } as const;
    }
    await tx.update(signInAttempts).set({ succeeded: true }).where(eq(signInAttempts.id, attemptId));
    await tx.execute(sql`select set_config('app.user_id', ${member.id}, true)`);
    const [signedIn] = await tx
      .update(users)
      .set({ lastSignInAt: new Date() })
      .where(eq(users.id, member.id))
      .returning({ sessionVersion: users.sessionVersion });
    await recordAudit(tx, { action: "sign-in", subject: email, actorUserId: member.id, actorLabel: member.name, ip });
    return { status: "ok", userId: member.id, name: member.name, sessionVersion: signedIn.sessionVersion } as const;
  });
}
