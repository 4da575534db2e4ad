import "server-only";
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";
import { and, eq, isNull, lt, sql } from "drizzle-orm";
import { type Transaction } from "@/db/client";
import { cooperativeSettings, uploadReservations, uploads } from "@/db/schema";
import { byteBudget } from "@/lib/async/byte-budget";
import { AppError } from "@/lib/errors";
import { storageFullMessage, tooManyUploadsMessage, uploadLimits } from "@/lib/season-logs/limits";
import { largestUploadBytes } from "@/lib/season-logs/report";
import { actor, recordAudit } from "./audit";
import { type Member } from "./members";
import { asMember, asNobody, farmOf } from "./context";

// One per process, on globalThis like the pools (dev reloads share it).
const globalForUploads = globalThis as unknown as {
  rhizomorphUploadMemory?: ReturnType<typeof byteBudget>;
  rhizomorphCollectGarbage?: () => void;
};
const uploadMemory = (globalForUploads.rhizomorphUploadMemory ??= byteBudget(uploadLimits.processingBytesPerProcess));

async function retentionDays(tx: Transaction): Promise<number> {
  const [settings] = await tx.select({ days: cooperativeSettings.rejectedUploadRetentionDays }).from(cooperativeSettings);
  return settings?.days ?? 30;
}

async function storedBytes(tx: Transaction, farmId: string): Promise<number> {
  const [row] = await tx
    .select({ bytes: sql<number>`coalesce(sum(${uploads.sizeBytes}), 0)::float8` })
    .from(uploads)
    .where(and(eq(uploads.farmId, farmId), isNull(uploads.filePurgedAt)));
  return Number(row?.bytes ?? 0);
}

/** Inside the transaction that stores a file: refuses it if the farm's stored files would pass the limit. */
export async function assertStorageRoom(tx: Transaction, farmId: string, addingBytes: number): Promise<void> {
  // Two uploads of one farm finishing together must not both fit in the last room left.
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`upload-room:${farmId}`}, 0))`);
  const used = await storedBytes(tx, farmId);
  if (used + addingBytes > uploadLimits.storedBytesPerFarm) {
    throw new AppError("too_large", storageFullMessage(used, addingBytes, uploadLimits.storedBytesPerFarm, await retentionDays(tx)));
  }
}

/**
 * Runs the reading and parsing of one season log (an upload, or a stored file read again) for
 * a farm: refused at once when the farm already has its limit of files on the way or, from the
 * size the request declares, no room to keep another; then it waits, holding no connection,
 * until this process has the memory for it. The reservation holds across app processes.
 */
export async function withUploadSlot<T>(member: Member, declaredBytes: number, work: () => Promise<T>): Promise<T> {
  const farm = farmOf(member, "work with its season logs");
  const reservation = await asMember(member, async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`upload-slots:${farm.farmId}`}, 0))`);
    await tx
      .delete(uploadReservations)
      .where(and(eq(uploadReservations.farmId, farm.farmId), lt(uploadReservations.expiresAt, sql`now()`)));
    const [{ open }] = await tx
      .select({ open: sql<number>`count(*)::int` })
      .from(uploadReservations)
      .where(eq(uploadReservations.farmId, farm.farmId));
    if (open >= uploadLimits.concurrentPerFarm) throw new AppError("rate_limited", tooManyUploadsMessage(uploadLimits.concurrentPerFarm));
    if (declaredBytes > 0) {
      const used = await storedBytes(tx, farm.farmId);
      if (used + declaredBytes > uploadLimits.storedBytesPerFarm) {
        throw new AppError("too_large", storageFullMessage(used, declaredBytes, uploadLimits.storedBytesPerFarm, await retentionDays(tx)));
      }
    }
    const [row] = await tx
      .insert(uploadReservations)
      .values({ farmId: farm.farmId, expiresAt: sql`now() + make_interval(mins => ${uploadLimits.reservationMinutes})` })
      .returning({ id: uploadReservations.id });
    return row.id;
  });
  try {
    // A request that declares no size may grow to the largest file allowed.
    const bytes = declaredBytes > 0 ? declaredBytes : largestUploadBytes;
    return await uploadMemory.use(bytes, async () => {
      try {
        return await work();
      } finally {
        // A large file leaves hundreds of megabytes of garbage; collect it before the next one
        // starts, or the process grows by that much for each file waiting its turn.
        if (bytes >= uploadLimits.collectGarbageAfterBytes) collectGarbage();
      }
    });
  } finally {
    await asMember(member, (tx) => tx.delete(uploadReservations).where(eq(uploadReservations.id, reservation)));
  }
}

/**
 * Between reading a large file and planning its rows: the reading's garbage (every cell's text)
 * is collected before the plan and the kept rows are made, so the two never add up to one peak.
 */
export function collectReadingGarbage(bytes: number): void {
  if (bytes >= uploadLimits.collectGarbageAfterBytes) collectGarbage();
}

/** V8's full collection, which Node only offers with --expose-gc: the flag is set for this once, and the function kept. */
function collectGarbage(): void {
  globalForUploads.rhizomorphCollectGarbage ??= (() => {
    setFlagsFromString("--expose-gc");
    return runInNewContext("gc") as () => void;
  })();
  globalForUploads.rhizomorphCollectGarbage();
}

/**
 * Removes the stored files of rejected uploads older than the co-op's retention period (their
 * records and reports stay). For the scheduled job; safe to run at any time, as often as wanted.
 */
export async function purgeRejectedUploadFiles(): Promise<{ files: number; bytes: number }> {
  return asNobody(async (tx) => {
    const result = await tx.execute<{ files: number; bytes: string }>(sql`select * from app_purge_rejected_upload_files()`);
    const row = result.rows[0];
    return { files: row?.files ?? 0, bytes: Number(row?.bytes ?? 0) };
  });
}

export async function getUploadRetentionDays(member: Member): Promise<number> {
  return asMember(member, retentionDays);
}

/** The coordinator sets how long rejected files are kept; audited. */
export async function updateUploadRetentionDays(member: Member, days: number): Promise<void> {
  await asMember(member, async (tx) => {
    const before = await retentionDays(tx);
    const updated = await tx
      .update(cooperativeSettings)
      .set({ rejectedUploadRetentionDays: days, updatedAt: sql`now()` })
      .where(eq(cooperativeSettings.id, 1))
      .returning({ id: cooperativeSettings.id });
    if (updated.length === 0) throw new AppError("forbidden", "Only the co-op coordinator may change this setting.");
    await recordAudit(tx, {
      action: "cooperative-settings.updated",
      subject: "Rejected upload files",
      farmId: null,
      ...actor(member),
      details: { before: { rejectedUploadRetentionDays: before }, after: { rejectedUploadRetentionDays: days } },
    });
  });
}
