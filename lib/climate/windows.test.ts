import { describe, expect, it } from "vitest";
import { flushWindows, startOfDay } from "./windows";

const tub = "tub";
const tent = "tent";

describe("flushWindows", () => {
  it("starts a flush's window the day after the previous harvest, or on the move into the room if later", () => {
    const windows = flushWindows(tub, [
      {
        blockId: "b1",
        code: "A-1",
        moves: [
          { roomId: tent, movedOn: null },
          { roomId: tub, movedOn: "2026-04-10" },
        ],
        harvests: [
          { flush: 1, harvestedOn: "2026-04-05" },
          { flush: 2, harvestedOn: "2026-04-20" },
          { flush: 3, harvestedOn: "2026-05-02" },
        ],
      },
    ]);
    // Flush 1 was picked in the tent; flush 2 grew in the tub from the move (10 April, later than 6 April); flush 3 from 21 April.
    expect(windows).toEqual([
      { blockId: "b1", code: "A-1", flush: 2, harvestedOn: "2026-04-20", fromDay: "2026-04-10", startsWith: "move into the room" },
      { blockId: "b1", code: "A-1", flush: 3, harvestedOn: "2026-05-02", fromDay: "2026-04-21", startsWith: "previous harvest" },
    ]);
  });

  it("gives a first flush in the room from the start of fruiting no start", () => {
    const [first] = flushWindows(tub, [
      { blockId: "b2", code: "B-1", moves: [{ roomId: tub, movedOn: null }], harvests: [{ flush: 1, harvestedOn: "2026-04-05" }] },
    ]);
    expect(first).toMatchObject({ fromDay: null, startsWith: null });
  });
});

describe("startOfDay", () => {
  it("is local midnight in the zone", () => {
    // Europe/Berlin on 21 April 2026 is CEST, UTC+2: midnight is 22:00 UTC the day before.
    expect(new Date(startOfDay("2026-04-21", "Europe/Berlin")).toISOString()).toBe("2026-04-20T22:00:00.000Z");
    // America/Havana skips midnight on its spring change (8 March 2026, 00:00 → 01:00): the day starts at 01:00 CDT, 05:00 UTC.
    expect(new Date(startOfDay("2026-03-08", "America/Havana")).toISOString()).toBe("2026-03-08T05:00:00.000Z");
  });
});
