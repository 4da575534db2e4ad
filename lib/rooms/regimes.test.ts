import { describe, expect, it } from "vitest";
import { regimeOn, roomOn } from "./regimes";

// Matching by date is calendar logic, checked on dates worked out by hand.
describe("the regime in force on a day", () => {
  const regimes = [
    { startsOn: "2026-03-10", kind: "soaked" },
    { startsOn: "2026-02-01", kind: "misted" },
    { startsOn: "2026-04-01", kind: "misted again" },
  ];

  it("is the latest regime started on or before the day, whatever order the rows come in", () => {
    expect(regimeOn(regimes, "2026-02-01")?.kind).toBe("misted");
    expect(regimeOn(regimes, "2026-03-09")?.kind).toBe("misted");
    expect(regimeOn(regimes, "2026-03-10")?.kind).toBe("soaked");
    expect(regimeOn(regimes, "2026-03-31")?.kind).toBe("soaked");
    expect(regimeOn(regimes, "2027-01-01")?.kind).toBe("misted again");
  });

  it("is none before the room's first regime, or for a room without one", () => {
    expect(regimeOn(regimes, "2026-01-31")).toBeNull();
    expect(regimeOn([], "2026-03-01")).toBeNull();
  });
});

describe("a block's room on a day", () => {
  const moves = [
    { movedOn: "2026-03-05", room: "tub" },
    { movedOn: null, room: "picking table" },
    { movedOn: "2026-03-01", room: "tent" },
  ];

  it("is the room of the latest move on or before the day", () => {
    expect(roomOn(moves, "2026-03-01")?.room).toBe("tent");
    expect(roomOn(moves, "2026-03-04")?.room).toBe("tent");
    expect(roomOn(moves, "2026-03-05")?.room).toBe("tub");
    expect(roomOn(moves, "2026-05-01")?.room).toBe("tub");
  });

  it("is the room the block started fruiting in before any dated move", () => {
    expect(roomOn(moves, "2026-02-20")?.room).toBe("picking table");
  });

  it("is none when the block was never put in a room, or only later", () => {
    expect(roomOn([], "2026-03-01")).toBeNull();
    expect(roomOn([{ movedOn: "2026-03-05", room: "tub" }], "2026-03-04")).toBeNull();
  });
});
