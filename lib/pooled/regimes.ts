import { regimeOn, roomOn } from "@/lib/rooms/regimes";
import type { RegimeStatisticsRow } from "./types";

/** What the pooled path reads of a block to place it in a room and a regime: no code, no note, no mass as written. */
export interface RegimeBlock {
  id: string;
  farmId: string;
  speciesId: string;
  contaminated: boolean;
  contaminatedOn: string | null;
  /** Dry substrate in grams (wet × (1 − moisture)); null when not weighed or contaminated. */
  dryG: number | null;
  /** Σ fresh mass over all flushes, and the first harvest's day; null without a harvest. */
  freshG: number | null;
  firstHarvestOn: string | null;
}

export interface RegimeMove {
  blockId: string;
  roomId: string;
  movedOn: string | null;
}

export interface RoomRegime {
  roomId: string;
  startsOn: string;
  regimeKindId: string | null;
}

/**
 * The day a block is placed in a room and a regime: its first harvest (the room it fruited in),
 * else the day it was found contaminated, else its latest dated move. A block with none of these
 * (only "from the start of fruiting", no harvest, no contamination date) cannot be matched to a
 * regime and is left out.
 */
export function matchingDay(block: RegimeBlock, moves: readonly RegimeMove[]): string | null {
  if (block.firstHarvestOn) return block.firstHarvestOn;
  if (block.contaminatedOn) return block.contaminatedOn;
  const dated = moves.map((move) => move.movedOn).filter((day): day is string => day !== null);
  return dated.length > 0 ? dated.sort().at(-1)! : null;
}

function groupBy<T>(items: readonly T[], key: (item: T) => string): Map<string, T[]> {
  const groups = new Map<string, T[]>();
  for (const item of items) {
    const group = groups.get(key(item));
    if (group) group.push(item);
    else groups.set(key(item), [item]);
  }
  return groups;
}

interface Room {
  farmId: string;
  speciesId: string;
  regimeKindId: string;
  blocks: number;
  contaminated: number;
  efficiencies: number[];
}

/**
 * Per-farm figures by climate regime kind with the room as the unit. Each block is matched to its
 * room on its matching day (roomOn) and to the regime in force in that room that day (regimeOn);
 * a "room" of the comparison is a room while it ran one regime kind. Per room: its blocks, its
 * contamination rate, its mean BE over all flushes (uncontaminated blocks with weighed substrate
 * and fruit, as the strain figures count BE). Per farm × species × regime kind: how many rooms,
 * the blocks, and Σ, Σ² of the rooms' rates and means, so the pooled figures treat rooms, not
 * blocks, as the independent units.
 */
export function regimeStatisticsRows(
  blocks: readonly RegimeBlock[],
  moves: readonly RegimeMove[],
  regimes: readonly RoomRegime[],
): RegimeStatisticsRow[] {
  const movesByBlock = groupBy(moves, (move) => move.blockId);
  const regimesByRoom = groupBy(regimes, (regime) => regime.roomId);
  const rooms = new Map<string, Room>();
  for (const block of blocks) {
    const blockMoves = movesByBlock.get(block.id);
    if (!blockMoves) continue;
    const day = matchingDay(block, blockMoves);
    if (!day) continue;
    const move = roomOn(blockMoves, day);
    if (!move) continue;
    const regime = regimeOn(regimesByRoom.get(move.roomId) ?? [], day);
    if (!regime?.regimeKindId) continue;
    const key = `${move.roomId}|${regime.regimeKindId}|${block.speciesId}`;
    let room = rooms.get(key);
    if (!room) {
      room = {
        farmId: block.farmId,
        speciesId: block.speciesId,
        regimeKindId: regime.regimeKindId,
        blocks: 0,
        contaminated: 0,
        efficiencies: [],
      };
      rooms.set(key, room);
    }
    room.blocks++;
    if (block.contaminated) room.contaminated++;
    else if (block.dryG !== null && block.dryG > 0 && block.freshG !== null) room.efficiencies.push((100 * block.freshG) / block.dryG);
  }
  const rows = new Map<string, RegimeStatisticsRow>();
  for (const room of rooms.values()) {
    const key = `${room.farmId}|${room.speciesId}|${room.regimeKindId}`;
    const row = rows.get(key) ?? {
      farmId: room.farmId,
      speciesId: room.speciesId,
      regimeKindId: room.regimeKindId,
      rooms: 0,
      blocks: 0,
      blocksContaminated: 0,
      contaminationRoomSum: 0,
      contaminationRoomSquares: 0,
      efficiencyRooms: 0,
      efficiencyRoomSum: 0,
      efficiencyRoomSquares: 0,
      efficiencyBlocks: 0,
      blockEfficiencySum: 0,
      blockEfficiencySquares: 0,
      roomWeightedSquares: 0,
      roomSizeSquares: 0,
    };
    const rate = room.contaminated / room.blocks;
    row.rooms++;
    row.blocks += room.blocks;
    row.blocksContaminated += room.contaminated;
    row.contaminationRoomSum += rate;
    row.contaminationRoomSquares += rate * rate;
    if (room.efficiencies.length > 0) {
      const mean = room.efficiencies.reduce((sum, value) => sum + value, 0) / room.efficiencies.length;
      row.efficiencyRooms++;
      row.efficiencyRoomSum += mean;
      row.efficiencyRoomSquares += mean * mean;
      const n = room.efficiencies.length;
      row.efficiencyBlocks += n;
      row.blockEfficiencySum += n * mean;
      row.blockEfficiencySquares += room.efficiencies.reduce((sum, value) => sum + value * value, 0);
      row.roomWeightedSquares += n * mean * mean;
      row.roomSizeSquares += n * n;
    }
    rows.set(key, row);
  }
  return [...rows.values()];
}
