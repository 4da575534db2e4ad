/**
 * A flush's window: the days its mushrooms grew in the room, so a climate log can be summarised
 * for it. It starts the day after the block's previous harvest, or the day the block was moved into
 * the room if that is later; it ends with the flush's harvest day. A first flush of a block that
 * was in the room "from the start of fruiting" (a move without a date) has no known start: the
 * records say when the block was inoculated, not when it began to fruit, so no window is made up.
 */
import { roomOn } from "../rooms/regimes";
import { instantsAt } from "../time/wall-clock";

export interface WindowMove {
  roomId: string;
  /** null: from the start of fruiting. */
  movedOn: string | null;
}

export interface WindowBlock {
  blockId: string;
  code: string;
  moves: readonly WindowMove[];
  harvests: readonly { flush: number; harvestedOn: string }[];
}

export interface FlushWindow {
  blockId: string;
  code: string;
  flush: number;
  harvestedOn: string;
  /** First day of the window, or null when no start is known. */
  fromDay: string | null;
  startsWith: "previous harvest" | "move into the room" | null;
}

export function nextDay(isoDate: string): string {
  const day = new Date(`${isoDate}T00:00:00Z`);
  day.setUTCDate(day.getUTCDate() + 1);
  return day.toISOString().slice(0, 10);
}

/** The flushes picked in the room, each with its window's first day. */
export function flushWindows(roomId: string, blocks: readonly WindowBlock[]): FlushWindow[] {
  const windows: FlushWindow[] = [];
  for (const block of blocks) {
    const harvests = [...block.harvests].sort((a, b) =>
      a.harvestedOn < b.harvestedOn ? -1 : a.harvestedOn > b.harvestedOn ? 1 : a.flush - b.flush,
    );
    harvests.forEach((harvest, index) => {
      const move = roomOn(block.moves, harvest.harvestedOn);
      if (move === null || move.roomId !== roomId) return;
      const previous = index > 0 ? harvests[index - 1].harvestedOn : null;
      const afterPrevious = previous === null ? null : nextDay(previous);
      let fromDay: string | null = afterPrevious;
      let startsWith: FlushWindow["startsWith"] = afterPrevious === null ? null : "previous harvest";
      if (move.movedOn !== null && (fromDay === null || move.movedOn > fromDay)) {
        fromDay = move.movedOn;
        startsWith = "move into the room";
      }
      // Two flushes picked the same day: the second grew with the first.
      if (fromDay !== null && fromDay > harvest.harvestedOn) fromDay = harvests[index - 1].harvestedOn;
      windows.push({
        blockId: block.blockId,
        code: block.code,
        flush: harvest.flush,
        harvestedOn: harvest.harvestedOn,
        fromDay,
        startsWith,
      });
    });
  }
  return windows.sort((a, b) => (a.harvestedOn < b.harvestedOn ? -1 : a.harvestedOn > b.harvestedOn ? 1 : a.code.localeCompare(b.code)));
}

/** Midnight at the start of a day in a zone (the first instant of the day where midnight is skipped). */
export function startOfDay(isoDate: string, timeZone: string): number {
  const [year, month, day] = isoDate.split("-").map(Number);
  for (let hour = 0; hour < 3; hour++) {
    const [first] = instantsAt({ year, month, day, hour, minute: 0, second: 0 }, timeZone);
    if (first !== undefined) return first;
  }
  throw new RangeError(`No start of ${isoDate} in ${timeZone}`);
}
