import "server-only";
import { farmContextStatement, withFarmContext, type FarmContext, type Transaction } from "@/db/client";
import { AppError } from "@/lib/errors";
import type { Member } from "./members";

// The row-level-security context of every lib/data function is derived here and nowhere else:
// a function acting for someone takes their Member; the few that act before anyone is signed in
// (sign-in, links in e-mails, the job workers) say so by using `asNobody` or `asSelf`.

/** The member's context: who, which farm, which role. */
export function farmContextOf(member: Member): FarmContext {
  return { userId: member.id, farmId: member.farmId, role: member.role };
}

/** The context of one of a farm's own people: with both a user and a farm. */
export type FarmMemberContext = FarmContext & { userId: string; farmId: string };

/** The context of a farm's own person, or a refusal that says what only they can do (`"see its blocks"`). */
export function farmOf(member: Member, onlyFarmPeopleCan: string): FarmMemberContext {
  if (!member.farmId) throw new AppError("forbidden", `Only a farm's own people can ${onlyFarmPeopleCan}.`);
  return { userId: member.id, farmId: member.farmId, role: member.role };
}

/** One transaction as the member, through the tenant door. */
export function asMember<T>(member: Member, work: (tx: Transaction) => Promise<T>): Promise<T> {
  return withFarmContext(farmContextOf(member), work);
}

const nobody: FarmContext = { userId: null, farmId: null, role: "anonymous" };

/**
 * One transaction as nobody in particular: before sign-in, for the holder of a link, for the job
 * workers. No policy matches it; only the SECURITY DEFINER functions made for these moments answer.
 */
export function asNobody<T>(work: (tx: Transaction) => Promise<T>): Promise<T> {
  return withFarmContext(nobody, work);
}

/** A person whose role is not known yet, or does not matter: their own rows only (the `self` policies). */
export function selfContext(userId: string): FarmContext {
  return { userId, farmId: null, role: null };
}

/** One transaction in selfContext. */
export function asSelf<T>(userId: string, work: (tx: Transaction) => Promise<T>): Promise<T> {
  return withFarmContext(selfContext(userId), work);
}

/**
 * The one change of context inside a transaction: a link has just made a member (an invitation)
 * or given one a new password, in a transaction begun as nobody, and what follows (the audit
 * entries, on their farm's log and the co-op's) must be written as that person, in the same
 * transaction, so the change and its record land together.
 */
export async function continueAsRedeemer(tx: Transaction, person: { userId: string; farmId: string | null }): Promise<void> {
  await tx.execute(farmContextStatement({ userId: person.userId, farmId: person.farmId, role: "anonymous" }));
}
