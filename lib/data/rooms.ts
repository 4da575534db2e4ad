import "server-only";
import { and, asc, eq, isNull, ne, sql } from "drizzle-orm";
import type { Transaction } from "@/db/client";
import { blockRoomMoves, blocks, fruitingRooms, roomRegimes, treatments, users } from "@/db/schema";
import { actor, recordAudit } from "@/lib/data/audit";
import { AppError, databaseRefusalOf } from "@/lib/errors";
import { roomFreshAirLabels, roomKindLabels, type RoomFreshAir, type RoomKind } from "@/lib/rooms/lists";
import { regimeInWords, regimeOn, regimePeriods, roomOn, type RegimeSettings } from "@/lib/rooms/regimes";
import type { MoveInput, RegimeChangeInput, RoomInput } from "@/lib/rooms/schemas";
import type { Member } from "./members";
import { asMember, farmOf } from "./context";

/** The same words for another farm's room as for one that does not exist. */
export const noSuchRoom = "There is no such room on your farm. Pick it from Rooms.";

export interface RoomRegime extends RegimeSettings {
  id: string;
  startsOn: string;
  /** The last day it was in force; null while it still is. */
  until: string | null;
  regimeKindId: string | null;
  regimeKind: string | null;
  notes: string;
  recordedBy: string | null;
  words: string;
}

export interface RoomSummary {
  id: string;
  name: string;
  kind: RoomKind;
  volumeM3: number | null;
  freshAir: RoomFreshAir;
  notes: string;
  retiredOn: string | null;
  /** The regime in force today, in words; null before the room's first regime. */
  regimeToday: string | null;
  regimeKindToday: string | null;
  /** Blocks whose room today is this one, neither finished (spent mass weighed) nor contaminated. */
  blocksNow: { id: string; code: string }[];
}

export interface RoomDetail extends RoomSummary {
  /** Oldest first, each with the day it stopped being in force. */
  regimes: RoomRegime[];
}

export interface RegimeKind {
  id: string;
  code: string;
  name: string;
  description: string;
}

export interface BlockRoomMove {
  id: string;
  roomId: string;
  roomName: string;
  movedOn: string | null;
  recordedBy: string | null;
  fromSeasonLog: boolean;
}

const regimeColumns = {
  id: roomRegimes.id,
  roomId: roomRegimes.roomId,
  startsOn: roomRegimes.startsOn,
  regimeKindId: roomRegimes.regimeKindId,
  regimeKind: treatments.name,
  humidityMode: roomRegimes.humidityMode,
  cycleOnMinutes: roomRegimes.cycleOnMinutes,
  cycleOffMinutes: roomRegimes.cycleOffMinutes,
  floodStartsAt: roomRegimes.floodStartsAt,
  floodHours: roomRegimes.floodHours,
  airChangesPerHour: roomRegimes.airChangesPerHour,
  temperatureSetC: roomRegimes.temperatureSetC,
  cleaningEveryDays: roomRegimes.cleaningEveryDays,
  notes: roomRegimes.notes,
  recordedBy: users.name,
};

/** The farm's rooms, regimes and the moves of its blocks that are still fruiting, read in one transaction. */
async function farmRoomsAsOf(tx: Transaction, farmId: string, today: string, onlyRoom?: string): Promise<RoomDetail[]> {
  const rooms = await tx
    .select()
    .from(fruitingRooms)
    .where(and(eq(fruitingRooms.farmId, farmId), onlyRoom ? eq(fruitingRooms.id, onlyRoom) : undefined))
    .orderBy(sql`${fruitingRooms.retiredOn} is not null`, asc(fruitingRooms.name));
  const regimes = await tx
    .select(regimeColumns)
    .from(roomRegimes)
    .leftJoin(treatments, eq(treatments.id, roomRegimes.regimeKindId))
    .leftJoin(users, eq(users.id, roomRegimes.createdBy))
    .where(and(eq(roomRegimes.farmId, farmId), onlyRoom ? eq(roomRegimes.roomId, onlyRoom) : undefined));
  const moves = await tx
    .select({ blockId: blockRoomMoves.blockId, code: blocks.code, roomId: blockRoomMoves.roomId, movedOn: blockRoomMoves.movedOn })
    .from(blockRoomMoves)
    .innerJoin(blocks, eq(blocks.id, blockRoomMoves.blockId))
    .where(and(eq(blockRoomMoves.farmId, farmId), isNull(blocks.spentMassG), eq(blocks.contaminated, false)));
  const movesByBlock = new Map<string, typeof moves>();
  for (const move of moves) movesByBlock.set(move.blockId, [...(movesByBlock.get(move.blockId) ?? []), move]);
  const inRoomNow = new Map<string, { id: string; code: string }[]>();
  for (const [blockId, blockMoves] of movesByBlock) {
    const now = roomOn(blockMoves, today);
    if (now) inRoomNow.set(now.roomId, [...(inRoomNow.get(now.roomId) ?? []), { id: blockId, code: now.code }]);
  }
  return rooms.map((room) => {
    const own = regimePeriods(regimes.filter((regime) => regime.roomId === room.id)).map((regime) => ({
      ...regime,
      words: regimeInWords(regime),
    }));
    const current = regimeOn(own, today);
    return {
      id: room.id,
      name: room.name,
      kind: room.kind,
      volumeM3: room.volumeM3,
      freshAir: room.freshAir,
      notes: room.notes,
      retiredOn: room.retiredOn,
      regimeToday: current?.words ?? null,
      regimeKindToday: current?.regimeKind ?? null,
      blocksNow: (inRoomNow.get(room.id) ?? []).sort((a, b) => a.code.localeCompare(b.code)),
      regimes: own,
    };
  });
}

/** The farm's rooms with the regime in force on `today` (the member's calendar day) and the blocks in each now. */
export async function listRooms(member: Member, today: string): Promise<RoomSummary[]> {
  const farm = farmOf(member, "see its rooms");
  return asMember(member, (tx) => farmRoomsAsOf(tx, farm.farmId, today));
}

/** One room with its regime history and the blocks in it now. */
export async function getRoom(member: Member, roomId: string, today: string): Promise<RoomDetail> {
  const farm = farmOf(member, "see its rooms");
  if (!/^[0-9a-f-]{36}$/i.test(roomId)) throw new AppError("not_found", noSuchRoom);
  const [room] = await asMember(member, (tx) => farmRoomsAsOf(tx, farm.farmId, today, roomId));
  if (!room) throw new AppError("not_found", noSuchRoom);
  return room;
}

/** The co-op's climate regime kinds in use (treatments of kind "humidity"), for a regime change to pick from. */
export async function listRegimeKinds(member: Member): Promise<RegimeKind[]> {
  return asMember(member, (tx) =>
    tx
      .select({ id: treatments.id, code: treatments.code, name: treatments.name, description: treatments.description })
      .from(treatments)
      .where(and(eq(treatments.kind, "humidity"), eq(treatments.status, "active")))
      .orderBy(asc(treatments.name)),
  );
}

/** The rooms a block can be carried into: the farm's rooms not retired. */
export async function listRoomChoices(member: Member): Promise<{ id: string; name: string }[]> {
  const farm = farmOf(member, "see its rooms");
  return asMember(member, (tx) =>
    tx
      .select({ id: fruitingRooms.id, name: fruitingRooms.name })
      .from(fruitingRooms)
      .where(and(eq(fruitingRooms.farmId, farm.farmId), isNull(fruitingRooms.retiredOn)))
      .orderBy(asc(fruitingRooms.name)),
  );
}

function sameName(name: string): AppError {
  return new AppError("invalid_input", "Not saved: correct what is marked.", [
    { field: "name", message: `Your farm has a room called "${name}" already. Give this one a name of its own.` },
  ]);
}

async function nameTaken(tx: Transaction, farmId: string, name: string, exceptRoom?: string): Promise<boolean> {
  const [taken] = await tx
    .select({ id: fruitingRooms.id })
    .from(fruitingRooms)
    .where(and(eq(fruitingRooms.farmId, farmId), eq(fruitingRooms.name, name), exceptRoom ? ne(fruitingRooms.id, exceptRoom) : undefined));
  return Boolean(taken);
}

/** Adds a room to the farm, audited in the same transaction. */
export async function addRoom(member: Member, input: RoomInput): Promise<{ id: string }> {
  const farm = farmOf(member, "add a room");
  return asMember(member, async (tx) => {
    if (await nameTaken(tx, farm.farmId, input.name)) throw sameName(input.name);
    let row: { id: string };
    try {
      [row] = await tx
        .insert(fruitingRooms)
        .values({ farmId: farm.farmId, ...input })
        .returning({ id: fruitingRooms.id });
    } catch (error) {
      // Two people adding the same name at once: the unique index decides.
      if (databaseRefusalOf(error).code === "23505") throw sameName(input.name);
      throw error;
    }
    await recordAudit(tx, {
      action: "room.added",
      subject: input.name,
      farmId: farm.farmId,
      ...actor(member),
      details: { roomId: row.id },
    });
    return row;
  });
}

async function ownRoom(tx: Transaction, farmId: string, roomId: string) {
  const [room] = await tx
    .select()
    .from(fruitingRooms)
    .where(and(eq(fruitingRooms.farmId, farmId), eq(fruitingRooms.id, roomId)));
  if (!room) throw new AppError("not_found", noSuchRoom);
  return room;
}

const volumeWords = (volume: number | null) => (volume === null ? "" : `${volume} m³`);

/** Changes a room's name, kind, size, fresh air or notes (the manager's), each change named in the log. */
export async function editRoom(member: Member, input: RoomInput & { roomId: string }): Promise<number> {
  const farm = farmOf(member, "change a room");
  return asMember(member, async (tx) => {
    const before = await ownRoom(tx, farm.farmId, input.roomId);
    if (input.name !== before.name && (await nameTaken(tx, farm.farmId, input.name, before.id))) throw sameName(input.name);
    const changes = [
      { label: "Name", oldValue: before.name, newValue: input.name },
      { label: "Kind", oldValue: roomKindLabels[before.kind], newValue: roomKindLabels[input.kind] },
      { label: "Size", oldValue: volumeWords(before.volumeM3), newValue: volumeWords(input.volumeM3) },
      { label: "Fresh air", oldValue: roomFreshAirLabels[before.freshAir], newValue: roomFreshAirLabels[input.freshAir] },
      { label: "Notes", oldValue: before.notes, newValue: input.notes },
    ].filter((change) => change.oldValue !== change.newValue);
    if (changes.length === 0) return 0;
    await tx
      .update(fruitingRooms)
      .set({ name: input.name, kind: input.kind, volumeM3: input.volumeM3, freshAir: input.freshAir, notes: input.notes })
      .where(and(eq(fruitingRooms.farmId, farm.farmId), eq(fruitingRooms.id, before.id)));
    await recordAudit(tx, {
      action: "room.changed",
      subject: input.name,
      farmId: farm.farmId,
      ...actor(member),
      details: { roomId: before.id, changes },
    });
    return changes.length;
  });
}

/** Retires a room from a day, or takes it back into use (no day); its regimes and moves stay. */
export async function setRoomRetirement(member: Member, input: { roomId: string; retiredOn: string | null }): Promise<void> {
  const farm = farmOf(member, "retire a room");
  await asMember(member, async (tx) => {
    const room = await ownRoom(tx, farm.farmId, input.roomId);
    if ((room.retiredOn ?? null) === input.retiredOn) return;
    await tx
      .update(fruitingRooms)
      .set({ retiredOn: input.retiredOn })
      .where(and(eq(fruitingRooms.farmId, farm.farmId), eq(fruitingRooms.id, room.id)));
    await recordAudit(tx, {
      action: input.retiredOn ? "room.retired" : "room.reinstated",
      subject: room.name,
      farmId: farm.farmId,
      ...actor(member),
      details: { roomId: room.id, retiredOn: input.retiredOn },
    });
  });
}

/** Records how a room is run from a day on; a second change on the same day is refused, naming the one there. */
export async function recordRegimeChange(member: Member, input: RegimeChangeInput): Promise<{ id: string }> {
  const farm = farmOf(member, "record how a room is run");
  return asMember(member, async (tx) => {
    const room = await ownRoom(tx, farm.farmId, input.roomId);
    let kindName: string | null = null;
    if (input.regimeKindId) {
      const [kind] = await tx
        .select({ name: treatments.name })
        .from(treatments)
        .where(and(eq(treatments.id, input.regimeKindId), eq(treatments.kind, "humidity"), eq(treatments.status, "active")));
      if (!kind)
        throw new AppError("invalid_input", "Not saved: correct what is marked.", [
          { field: "regimeKindId", message: "Pick a climate regime from the co-op's list, or leave it unset." },
        ]);
      kindName = kind.name;
    }
    const [taken] = await tx
      .select({ id: roomRegimes.id })
      .from(roomRegimes)
      .where(and(eq(roomRegimes.roomId, room.id), eq(roomRegimes.startsOn, input.startsOn)));
    if (taken)
      throw new AppError("invalid_input", "Not saved: correct what is marked.", [
        { field: "startsOn", message: "A change starting that day is recorded already. Choose the day this one started." },
      ]);
    const [row] = await tx
      .insert(roomRegimes)
      .values({ ...input, farmId: farm.farmId, roomId: room.id, createdBy: member.id })
      .returning({ id: roomRegimes.id });
    await recordAudit(tx, {
      action: "room.regime-recorded",
      subject: room.name,
      farmId: farm.farmId,
      ...actor(member),
      details: { roomId: room.id, regimeId: row.id, startsOn: input.startsOn, words: regimeInWords(input), regimeKind: kindName },
    });
    return row;
  });
}

/**
 * Records a block carried into a room on a day (null: from the start of fruiting), inside the
 * caller's transaction: the room must be one of the farm's rooms in use (the tenant keys refuse
 * another farm's anyway). A second move of the block on the same day replaces the first.
 */
export async function recordMoveIn(
  tx: Transaction,
  member: Member,
  farmId: string,
  block: { id: string; code: string },
  roomId: string,
  movedOn: string | null,
  from: "block page" | "harvest",
): Promise<void> {
  const [room] = await tx
    .select({ id: fruitingRooms.id, name: fruitingRooms.name, retiredOn: fruitingRooms.retiredOn })
    .from(fruitingRooms)
    .where(and(eq(fruitingRooms.farmId, farmId), eq(fruitingRooms.id, roomId)));
  if (!room || (room.retiredOn !== null && (movedOn === null || movedOn >= room.retiredOn)))
    throw new AppError("invalid_input", "Not saved: correct what is marked.", [
      { field: "roomId", message: room ? `${room.name} is retired. Pick a room in use.` : "Pick the room from your rooms." },
    ]);
  await tx
    .insert(blockRoomMoves)
    .values({ farmId, blockId: block.id, roomId: room.id, movedOn, createdBy: member.id })
    .onConflictDoUpdate({
      target: [blockRoomMoves.blockId, blockRoomMoves.movedOn],
      set: { roomId: room.id, createdBy: member.id, uploadId: null, createdAt: sql`now()` },
    });
  await recordAudit(tx, {
    action: "block.moved",
    subject: block.code,
    farmId,
    ...actor(member),
    details: { blockId: block.id, roomId: room.id, roomName: room.name, movedOn, from },
  });
}

/** The block's moves between rooms, oldest first (the undated one first). */
async function movesOf(tx: Transaction, farmId: string, blockId: string): Promise<BlockRoomMove[]> {
  const rows = await tx
    .select({
      id: blockRoomMoves.id,
      roomId: blockRoomMoves.roomId,
      roomName: fruitingRooms.name,
      movedOn: blockRoomMoves.movedOn,
      recordedBy: users.name,
      uploadId: blockRoomMoves.uploadId,
    })
    .from(blockRoomMoves)
    .innerJoin(fruitingRooms, eq(fruitingRooms.id, blockRoomMoves.roomId))
    .leftJoin(users, eq(users.id, blockRoomMoves.createdBy))
    .where(and(eq(blockRoomMoves.farmId, farmId), eq(blockRoomMoves.blockId, blockId)))
    .orderBy(sql`${blockRoomMoves.movedOn} asc nulls first`);
  return rows.map(({ uploadId, ...move }) => ({ ...move, fromSeasonLog: uploadId !== null }));
}

/** A block's room history and its room on `today`. */
export async function getBlockRooms(
  member: Member,
  blockId: string,
  today: string,
): Promise<{ moves: BlockRoomMove[]; now: BlockRoomMove | null }> {
  const farm = farmOf(member, "see its rooms");
  return asMember(member, async (tx) => {
    const moves = await movesOf(tx, farm.farmId, blockId);
    return { moves, now: roomOn(moves, today) };
  });
}

/** "Moved to room … on …" from the block's page: one transaction, audited. */
export async function moveBlock(member: Member, input: MoveInput): Promise<{ roomName: string }> {
  const farm = farmOf(member, "move a block");
  return asMember(member, async (tx) => {
    const [block] = await tx
      .select({ id: blocks.id, code: blocks.code })
      .from(blocks)
      .where(and(eq(blocks.farmId, farm.farmId), eq(blocks.id, input.blockId)));
    if (!block) throw new AppError("not_found", "There is no such block on your farm. Pick it from Blocks & harvests.");
    await recordMoveIn(tx, member, farm.farmId, block, input.roomId, input.movedOn, "block page");
    const [room] = await tx.select({ name: fruitingRooms.name }).from(fruitingRooms).where(eq(fruitingRooms.id, input.roomId));
    return { roomName: room.name };
  });
}

/**
 * The phone form's "Room it is in now", inside the harvest's transaction: a move dated the
 * harvest day, recorded only when the room differs from the block's room that day.
 */
export async function recordRoomAtHarvest(
  tx: Transaction,
  member: Member,
  farmId: string,
  block: { id: string; code: string },
  roomId: string,
  harvestedOn: string,
): Promise<boolean> {
  const moves = await tx
    .select({ roomId: blockRoomMoves.roomId, movedOn: blockRoomMoves.movedOn })
    .from(blockRoomMoves)
    .where(and(eq(blockRoomMoves.farmId, farmId), eq(blockRoomMoves.blockId, block.id)));
  if (roomOn(moves, harvestedOn)?.roomId === roomId) return false;
  await recordMoveIn(tx, member, farmId, block, roomId, harvestedOn, "harvest");
  return true;
}
