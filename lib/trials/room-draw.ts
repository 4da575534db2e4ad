import { seededRandom } from "@/lib/random";
import { TrialRuleError } from "./lifecycle";
import type { ListEntry } from "./randomisation";

export interface RoomDrawEntry {
  /** Position in the draw, 1 …: the rooms in the order they were drawn. */
  sequence: number;
  roomId: string;
  armId: string;
}

/**
 * A room-level trial's draw of one farm's rooms to the arms: the rooms (ordered by id first, so the
 * order they were picked in does not matter) are shuffled by the seed and dealt to the arms in runs
 * of one room per arm, each run's arm order shuffled as well. Every arm gets the same number of rooms,
 * or one fewer when the rooms do not divide evenly (which arms get the extra room is drawn too).
 * The same seed and rooms give the same draw, so anyone can reproduce and audit it.
 */
export function drawRoomsToArms(options: { seed: string; armIds: readonly string[]; roomIds: readonly string[] }): RoomDrawEntry[] {
  const { seed, armIds } = options;
  if (armIds.length < 2) throw new TrialRuleError(`A trial needs at least 2 arms to randomise; it has ${armIds.length}.`);
  const roomIds = [...new Set(options.roomIds)].sort();
  if (roomIds.length < armIds.length)
    throw new TrialRuleError(
      `Pick at least ${armIds.length} of your fruiting rooms, one for each arm: each room runs one arm's climate regime. You picked ${roomIds.length}.`,
    );
  const random = seededRandom(seed);
  const rooms = random.shuffle(roomIds);
  const draw: RoomDrawEntry[] = [];
  while (draw.length < rooms.length) {
    for (const armId of random.shuffle(armIds)) {
      if (draw.length === rooms.length) break;
      draw.push({ sequence: draw.length + 1, roomId: rooms[draw.length], armId });
    }
  }
  return draw;
}

/**
 * The farm's block list for a room-level trial: `blocksPerRoom` codes for each drawn room, in the
 * draw's order, each block taking its room's arm. `permutedBlock` is the room's place in the draw.
 */
export function roomBlockList(
  draw: readonly RoomDrawEntry[],
  blocksPerRoom: number,
  codePrefix: string,
): (ListEntry & { roomId: string })[] {
  if (!Number.isInteger(blocksPerRoom) || blocksPerRoom < 1)
    throw new TrialRuleError(`Blocks per room must be a whole number of 1 or more; got ${blocksPerRoom}.`);
  const total = draw.length * blocksPerRoom;
  const width = Math.max(2, String(total).length);
  return draw.flatMap((room) =>
    Array.from({ length: blocksPerRoom }, (_, i) => {
      const sequence = (room.sequence - 1) * blocksPerRoom + i + 1;
      return {
        sequence,
        permutedBlock: room.sequence,
        blockCode: `${codePrefix}-${String(sequence).padStart(width, "0")}`,
        armId: room.armId,
        roomId: room.roomId,
      };
    }),
  );
}
