import { describe, expect, it } from "vitest";
import { dayBefore, humidityInWords, regimeInWords, regimeOn, regimePeriods, roomOn, type RegimeSettings } from "./regimes";
import { moveSchema, regimeChangeSchema, roomSchema } from "./schemas";

// Dates follow the Gregorian calendar as ISO 8601 writes them (2024 is a leap year: divisible by 4,
// not a century); the day arithmetic is checked against it, not against the code.
const regimes = [
  { id: "soak", startsOn: "2026-04-10" },
  { id: "mist", startsOn: "2026-03-01" },
  { id: "mist-again", startsOn: "2026-05-20" },
];

describe("regimeOn: the regime in force on a day", () => {
  it("is the change with the latest start on or before the day, whatever the order given", () => {
    expect(regimeOn(regimes, "2026-03-15")?.id).toBe("mist");
    expect(regimeOn(regimes, "2026-04-30")?.id).toBe("soak");
    expect(regimeOn(regimes, "2026-12-31")?.id).toBe("mist-again");
  });

  it("counts the start day itself as in force, and the day before as the previous regime", () => {
    expect(regimeOn(regimes, "2026-04-10")?.id).toBe("soak");
    expect(regimeOn(regimes, "2026-04-09")?.id).toBe("mist");
    expect(regimeOn(regimes, "2026-03-01")?.id).toBe("mist");
  });

  it("is none before the first regime, and none for a room with no regime", () => {
    expect(regimeOn(regimes, "2026-02-28")).toBeNull();
    expect(regimeOn([], "2026-04-10")).toBeNull();
  });
});

describe("roomOn: a block's room on a day", () => {
  const moves = [
    { room: "tub", movedOn: null },
    { room: "table", movedOn: "2026-04-12" },
    { room: "tent", movedOn: "2026-04-20" },
  ];

  it("is the latest dated move on or before the day, the move day itself included", () => {
    expect(roomOn(moves, "2026-04-12")?.room).toBe("table");
    expect(roomOn(moves, "2026-04-19")?.room).toBe("table");
    expect(roomOn(moves, "2026-04-20")?.room).toBe("tent");
  });

  it("falls back to the move without a date (from the start of fruiting) before any dated move", () => {
    expect(roomOn(moves, "2026-04-11")?.room).toBe("tub");
    expect(roomOn([{ room: "tub", movedOn: null }], "1999-01-01")?.room).toBe("tub");
  });

  it("is none when the block has no move on or before the day and none without a date", () => {
    expect(roomOn([{ room: "tent", movedOn: "2026-04-20" }], "2026-04-19")).toBeNull();
    expect(roomOn([], "2026-04-19")).toBeNull();
  });
});

describe("regimePeriods: in force from … to …", () => {
  it("ends each regime the day before the next one starts, oldest first; the last is still in force", () => {
    expect(regimePeriods(regimes).map(({ id, startsOn, until }) => [id, startsOn, until])).toEqual([
      ["mist", "2026-03-01", "2026-04-09"],
      ["soak", "2026-04-10", "2026-05-19"],
      ["mist-again", "2026-05-20", null],
    ]);
  });

  it("steps back over month ends and the leap day (Gregorian calendar)", () => {
    expect(dayBefore("2024-03-01")).toBe("2024-02-29");
    expect(dayBefore("2026-03-01")).toBe("2026-02-28");
    expect(dayBefore("2026-01-01")).toBe("2025-12-31");
  });
});

describe("a regime in plain words", () => {
  const misted: RegimeSettings = {
    humidityMode: "cycling",
    cycleOnMinutes: 2,
    cycleOffMinutes: 13,
    floodStartsAt: null,
    floodHours: null,
    airChangesPerHour: null,
    temperatureSetC: null,
    cleaningEveryDays: null,
  };
  const soaked: RegimeSettings = {
    ...misted,
    humidityMode: "flooding",
    cycleOnMinutes: null,
    cycleOffMinutes: null,
    floodStartsAt: "07:00:00",
    floodHours: 3,
  };

  it("says how the humidity is run", () => {
    expect(humidityInWords(misted)).toBe("Misted: 2 min on, 13 min off, all day");
    expect(humidityInWords(soaked)).toBe("Soaked daily from 07:00 for 3 h, then left to dry");
    expect(humidityInWords({ ...misted, cycleOffMinutes: 0 })).toBe("Misted without a break, all day");
  });

  it("adds fresh air, set point and cleaning only where recorded", () => {
    expect(regimeInWords({ ...soaked, airChangesPerHour: 4, temperatureSetC: 18.5, cleaningEveryDays: 7 })).toBe(
      "Soaked daily from 07:00 for 3 h, then left to dry; fresh air 4 changes an hour; set to 18.5 °C; cleaned every 7 days",
    );
    expect(regimeInWords({ ...misted, airChangesPerHour: 1, cleaningEveryDays: 1 })).toBe(
      "Misted: 2 min on, 13 min off, all day; fresh air 1 change an hour; cleaned every day",
    );
  });
});

describe("the forms' rules", () => {
  const room = "7d0c3a52-4b8e-4c61-9f3e-2a7b9c1d5e60";

  it("stores a room's size in m³, from litres (1 m³ = 1000 L, SI brochure 9th ed., Table 8) or m³, with a point or a comma", () => {
    expect(roomSchema.parse({ name: "Tub 1", kind: "tub", volume: "120", volumeUnit: "L", freshAir: "filter_holes" }).volumeM3).toBeCloseTo(
      0.12,
      12,
    );
    expect(roomSchema.parse({ name: "Tent", kind: "tent", volume: "2,5", volumeUnit: "m3", freshAir: "fan_timer" }).volumeM3).toBe(2.5);
    expect(roomSchema.parse({ name: "Tent", kind: "tent", volume: "", freshAir: "fan_timer" }).volumeM3).toBeNull();
  });

  it("refuses a size that is not above 0, or that may hold a thousands separator", () => {
    const issues = (volume: string) =>
      roomSchema
        .safeParse({ name: "Tub", kind: "tub", volume, volumeUnit: "L", freshAir: "filter_holes" })
        .error?.issues.map((i) => i.path[0]);
    expect(issues("0")).toEqual(["volume"]);
    expect(issues("lots")).toEqual(["volume"]);
    expect(issues("1,000")).toEqual(["volume"]);
  });

  it("asks each humidity mode for its own fields and refuses the other mode's", () => {
    const misted = regimeChangeSchema.parse({
      roomId: room,
      startsOn: "2026-03-01",
      humidityMode: "cycling",
      cycleOnMinutes: "2",
      cycleOffMinutes: "13",
    });
    expect(misted).toMatchObject({ cycleOnMinutes: 2, cycleOffMinutes: 13, floodStartsAt: null, floodHours: null, regimeKindId: null });
    const soaked = regimeChangeSchema.parse({
      roomId: room,
      startsOn: "2026-03-01",
      humidityMode: "flooding",
      floodStartsAt: "07:00",
      floodHours: "1,5",
    });
    expect(soaked).toMatchObject({ floodStartsAt: "07:00", floodHours: 1.5, cycleOnMinutes: null });

    const fields = (input: Record<string, string>) =>
      regimeChangeSchema
        .safeParse({ roomId: room, startsOn: "2026-03-01", ...input })
        .error?.issues.map((issue) => issue.path[0])
        .sort();
    expect(fields({ humidityMode: "cycling" })).toEqual(["cycleOffMinutes", "cycleOnMinutes"]);
    expect(fields({ humidityMode: "flooding", floodStartsAt: "7", floodHours: "25" })).toEqual(["floodHours", "floodStartsAt"]);
    expect(fields({ humidityMode: "flooding", floodStartsAt: "07:00", floodHours: "3", cycleOnMinutes: "2" })).toEqual(["cycleOnMinutes"]);
    expect(fields({ humidityMode: "cycling", cycleOnMinutes: "2", cycleOffMinutes: "1.5", cleaningEveryDays: "0" })).toEqual([
      "cleaningEveryDays",
      "cycleOffMinutes",
    ]);
  });

  it("refuses a day that does not exist", () => {
    expect(
      regimeChangeSchema.safeParse({
        roomId: room,
        startsOn: "2026-02-30",
        humidityMode: "cycling",
        cycleOnMinutes: "1",
        cycleOffMinutes: "1",
      }).success,
    ).toBe(false);
  });

  it("reads a move without a day as from the start of fruiting", () => {
    expect(moveSchema.parse({ blockId: room, roomId: room, movedOn: "" }).movedOn).toBeNull();
    expect(moveSchema.parse({ blockId: room, roomId: room, movedOn: "2026-04-12" }).movedOn).toBe("2026-04-12");
    expect(moveSchema.safeParse({ blockId: "B-014", roomId: room }).success).toBe(false);
  });
});
