import "server-only";
import { desc, eq, isNull } from "drizzle-orm";
import { type Transaction } from "@/db/client";
import { auditEvents } from "@/db/schema";
import type { AuditAction } from "@/lib/audit/actions";
import { foldRepeats } from "@/lib/audit/fold";
import { describeAuditEvent, whoOf, type AuditDescription } from "@/lib/audit/sentences";
import { AppError } from "@/lib/errors";
import type { Member } from "./members";
import { asMember } from "./context";

export interface AuditEntry {
  action: AuditAction;
  subject?: string;
  farmId?: string | null;
  actorUserId?: string | null;
  actorLabel?: string;
  details?: Record<string, unknown>;
  ip?: string | null;
}

/** Who an audited change is by: the member's id, and their name as it was then. */
export function actor(member: Member): Pick<AuditEntry, "actorUserId" | "actorLabel"> {
  return { actorUserId: member.id, actorLabel: member.name };
}

/** Appends to the audit log inside the caller's transaction, so the event and the change land together. */
export async function recordAudit(tx: Transaction, entry: AuditEntry): Promise<void> {
  await tx.insert(auditEvents).values({
    action: entry.action,
    subject: entry.subject ?? "",
    farmId: entry.farmId ?? null,
    actorUserId: entry.actorUserId ?? null,
    actorLabel: entry.actorLabel ?? "",
    details: entry.details ?? {},
    ip: entry.ip ?? null,
  });
}

/** One line of an activity log, in words (lib/audit/sentences.ts); `action` and `subject` are for tests and filters, not shown. */
export interface AuditRow extends AuditDescription {
  id: number;
  occurredAt: string;
  /** The earliest of the events folded into this row; the same as occurredAt when it is one event. */
  firstOccurredAt: string;
  /** How many identical events in a row (same person, same change) this row stands for. */
  times: number;
  who: string;
  action: string;
  subject: string;
}

/** How many of the latest events a log page shows; the CSV export takes the same rows. */
export const auditListLimit = 5000;

/**
 * The activity log a member may read: the coordinator the co-op-level events, a farm manager
 * their farm's own. Row-level security enforces the same split; the filter here says which.
 */
export async function listAuditEvents(member: Member, scope: "coop" | "farm"): Promise<AuditRow[]> {
  if (scope === "coop" && member.role !== "coordinator")
    throw new AppError("forbidden", "Only the coordinator reads the co-op's activity log.");
  if (scope === "farm" && (member.role !== "farm_manager" || !member.farmId))
    throw new AppError("forbidden", "Only a farm manager reads the farm's activity log.");
  return asMember(member, async (tx) => {
    const rows = await tx
      .select()
      .from(auditEvents)
      .where(scope === "coop" ? isNull(auditEvents.farmId) : eq(auditEvents.farmId, member.farmId!))
      .orderBy(desc(auditEvents.occurredAt), desc(auditEvents.id))
      .limit(auditListLimit);
    return foldRepeats(rows).map(({ first, latest, times }) => {
      const described = describeAuditEvent({ ...latest, onFarmLog: scope === "farm" });
      const details = latest.ip ? [...described.details, { label: "Network address", value: latest.ip }] : described.details;
      return {
        ...described,
        details,
        id: latest.id,
        occurredAt: latest.occurredAt.toISOString(),
        firstOccurredAt: first.occurredAt.toISOString(),
        times,
        who: whoOf(latest.actorLabel),
        action: latest.action,
        subject: latest.subject,
      };
    });
  });
}
