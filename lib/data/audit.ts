import "server-only";
import { auditEvents } from "@/db/schema";
import type { Transaction } from "@/db/client";

export interface AuditEntry {
  action: string;
  subject?: string;
  farmId?: string | null;
  actorUserId?: string | null;
  actorLabel?: string;
  details?: Record<string, unknown>;
  ip?: string | null;
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
