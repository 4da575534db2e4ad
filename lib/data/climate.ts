import "server-only";
import { createHash } from "node:crypto";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import type { Transaction } from "@/db/client";
import { blockRoomMoves, blocks, climateLogs, climateReadings, fruitingRooms, harvests, roomRegimes, users } from "@/db/schema";
import { recordAudit } from "@/lib/data/audit";
import { AppError } from "@/lib/errors";
import { type ClimateParseOptions, type ClimateReading, parseClimateLog } from "@/lib/climate/parse";
import { type WindowSummary, summariseWindow } from "@/lib/climate/summary";
import { flushWindows, nextDay, startOfDay } from "@/lib/climate/windows";
import { chosenDisplay, formatDay } from "@/lib/time/display";
import type { Member } from "./members";
import { asMember, farmOf } from "./context";

/** Rows per INSERT: seven values each, well under PostgreSQL's 65 535 parameters a statement. */
const readingsPerInsert = 5_000;

export interface StoredClimateLog {
  id: string;
  fileName: string;
  uploadedAt: Date;
  uploadedBy: string | null;
  shape: string;
  timeZone: string;
  readingCount: number;
  firstAt: Date;
  lastAt: Date;
}

export interface FlushWindowSummary {
  blockId: string;
  code: string;
  flush: number;
  harvestedOn: string;
  fromDay: string | null;
  startsWith: string | null;
  summary: WindowSummary | null;
}

export interface RoomClimate {
  room: { id: string; name: string };
  logs: StoredClimateLog[];
  readings: ClimateReading[];
  regimeStarts: string[];
  windows: FlushWindowSummary[];
}

/** The room of the member's farm, or not found (another farm's room reads exactly like none). */
async function roomOf(tx: Transaction, roomId: string) {
  const [room] = await tx
    .select({ id: fruitingRooms.id, name: fruitingRooms.name })
    .from(fruitingRooms)
    .where(eq(fruitingRooms.id, roomId));
  if (!room) throw new AppError("not_found", "There is no such room on your farm.");
  return room;
}

/**
 * A room's climate: its logs, every reading (for the chart and the summaries), the days its regime
 * changed, and a summary for each flush picked in the room. Days are read in `timeZone` (the member's).
 */
export async function getRoomClimate(member: Member, roomId: string, timeZone: string): Promise<RoomClimate> {
  farmOf(member, "see its rooms' climate");
  return asMember(member, async (tx) => {
    const room = await roomOf(tx, roomId);
    const logs = await tx
      .select({
        id: climateLogs.id,
        fileName: climateLogs.fileName,
        uploadedAt: climateLogs.uploadedAt,
        uploadedBy: users.name,
        shape: climateLogs.shape,
        timeZone: climateLogs.timeZone,
        readingCount: climateLogs.readingCount,
        firstAt: climateLogs.firstAt,
        lastAt: climateLogs.lastAt,
      })
      .from(climateLogs)
      .leftJoin(users, eq(users.id, climateLogs.uploadedBy))
      .where(eq(climateLogs.roomId, roomId))
      .orderBy(desc(climateLogs.uploadedAt));
    const rows = await tx
      .select({
        takenAt: climateReadings.takenAt,
        temperatureC: climateReadings.temperatureC,
        relativeHumidity: climateReadings.relativeHumidity,
        co2Ppm: climateReadings.co2Ppm,
      })
      .from(climateReadings)
      .where(eq(climateReadings.roomId, roomId))
      .orderBy(asc(climateReadings.takenAt));
    const readings = rows.map((row) => ({ ...row, takenAt: row.takenAt.getTime() }));
    const regimes = await tx
      .select({ startsOn: roomRegimes.startsOn })
      .from(roomRegimes)
      .where(eq(roomRegimes.roomId, roomId))
      .orderBy(asc(roomRegimes.startsOn));

    // Every block that was ever in the room, with all its moves and harvests: a flush's window may start in another room.
    const blockIds = (
      await tx.selectDistinct({ blockId: blockRoomMoves.blockId }).from(blockRoomMoves).where(eq(blockRoomMoves.roomId, roomId))
    ).map((row) => row.blockId);
    let windows: FlushWindowSummary[] = [];
    if (blockIds.length > 0) {
      const [codes, moves, picked] = await Promise.all([
        tx.select({ id: blocks.id, code: blocks.code }).from(blocks).where(inArray(blocks.id, blockIds)),
        tx
          .select({ blockId: blockRoomMoves.blockId, roomId: blockRoomMoves.roomId, movedOn: blockRoomMoves.movedOn })
          .from(blockRoomMoves)
          .where(inArray(blockRoomMoves.blockId, blockIds)),
        tx
          .select({ blockId: harvests.blockId, flush: harvests.flush, harvestedOn: harvests.harvestedOn })
          .from(harvests)
          .where(and(inArray(harvests.blockId, blockIds), sql`${harvests.harvestedOn} is not null`)),
      ]);
      const found = flushWindows(
        roomId,
        codes.map((block) => ({
          blockId: block.id,
          code: block.code,
          moves: moves.filter((move) => move.blockId === block.id),
          harvests: picked.flatMap((harvest) =>
            harvest.blockId === block.id && harvest.harvestedOn !== null
              ? [{ flush: harvest.flush, harvestedOn: harvest.harvestedOn }]
              : [],
          ),
        })),
      );
      windows = found.map((window) => ({
        ...window,
        summary:
          window.fromDay === null
            ? null
            : summariseWindow(readings, startOfDay(window.fromDay, timeZone), startOfDay(nextDay(window.harvestedOn), timeZone)),
      }));
    }
    return { room, logs, readings, regimeStarts: regimes.map((regime) => regime.startsOn), windows };
  });
}

export interface ClimateUploadResult {
  stored: number;
  skipped: number;
  shape: string;
}

/**
 * Stores a logger's file for a room, in one transaction. The file is read first (nothing is
 * stored from a file with any problem). The same file twice is refused by its SHA-256. Readings
 * in times an earlier log of the room already covers (between its first and last reading) are
 * left out: loggers export their whole memory each time, so the next file repeats the last one,
 * and two logs read side by side would be summarised as one.
 */
export async function uploadClimateLog(
  member: Member,
  input: { roomId: string; fileName: string; bytes: Uint8Array; options: ClimateParseOptions },
): Promise<ClimateUploadResult> {
  const farm = farmOf(member, "upload a room's climate log");
  const parsed = parseClimateLog(input.bytes, input.options);
  if (!parsed.ok) {
    const shown = parsed.issues.slice(0, 5).map((issue) => issue.message);
    const more = parsed.issues.length > 5 ? ` … and ${parsed.issues.length - 5} more.` : "";
    throw new AppError("invalid_input", `The file was not stored. ${shown.join(" ")}${more}`);
  }
  if (parsed.readings.length === 0) throw new AppError("invalid_input", "The file has no readings.");
  const sha256 = createHash("sha256").update(input.bytes).digest("hex");
  return asMember(member, async (tx) => {
    const room = await roomOf(tx, input.roomId);
    // Two uploads for one room run one after the other, so each sees the other's span.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`climate-log:${input.roomId}`}, 0))`);
    const [same] = await tx
      .select({ fileName: climateLogs.fileName, uploadedAt: climateLogs.uploadedAt, roomName: fruitingRooms.name })
      .from(climateLogs)
      .innerJoin(fruitingRooms, eq(fruitingRooms.id, climateLogs.roomId))
      .where(eq(climateLogs.sha256, sha256));
    if (same)
      throw new AppError(
        "conflict",
        `This file was uploaded before (as '${same.fileName}', for the room '${same.roomName}', on ${formatDay(same.uploadedAt, chosenDisplay(member))}); nothing was stored again.`,
      );
    const spans = await tx
      .select({ firstAt: climateLogs.firstAt, lastAt: climateLogs.lastAt })
      .from(climateLogs)
      .where(eq(climateLogs.roomId, input.roomId));
    const fresh = parsed.readings.filter(
      (reading) => !spans.some((span) => reading.takenAt >= span.firstAt.getTime() && reading.takenAt <= span.lastAt.getTime()),
    );
    if (fresh.length === 0)
      throw new AppError(
        "conflict",
        "Every reading in this file falls in times the room's earlier logs already cover; nothing was stored.",
      );
    const [log] = await tx
      .insert(climateLogs)
      .values({
        farmId: farm.farmId,
        roomId: room.id,
        fileName: input.fileName,
        sha256,
        uploadedBy: member.id,
        shape: parsed.detected.shape,
        temperatureUnit: parsed.detected.temperatureUnit ?? "C",
        timeZone: input.options.timeZone,
        readingCount: fresh.length,
        firstAt: new Date(fresh[0].takenAt),
        lastAt: new Date(fresh[fresh.length - 1].takenAt),
      })
      .returning({ id: climateLogs.id });
    for (let start = 0; start < fresh.length; start += readingsPerInsert) {
      await tx.insert(climateReadings).values(
        fresh.slice(start, start + readingsPerInsert).map((reading) => ({
          logId: log.id,
          farmId: farm.farmId,
          roomId: room.id,
          takenAt: new Date(reading.takenAt),
          temperatureC: reading.temperatureC,
          relativeHumidity: reading.relativeHumidity,
          co2Ppm: reading.co2Ppm,
        })),
      );
    }
    const skipped = parsed.readings.length - fresh.length;
    await recordAudit(tx, {
      action: "climate-log.uploaded",
      subject: input.fileName,
      farmId: farm.farmId,
      actorUserId: member.id,
      actorLabel: member.name,
      details: {
        roomId: room.id,
        roomName: room.name,
        readings: fresh.length,
        skippedReadings: skipped,
        shape: parsed.detected.shape,
        timeZone: input.options.timeZone,
      },
    });
    return { stored: fresh.length, skipped, shape: parsed.detected.shape };
  });
}
