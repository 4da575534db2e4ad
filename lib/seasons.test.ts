import { describe, expect, it } from "vitest";
import {
  blockSeason,
  calendarYear,
  readSeason,
  seasonInAddressSchema,
  seasonLabel,
  seasonOfDate,
  seasonStartProblem,
  seasonStartSchema,
} from "./seasons";

// Calendar facts (common practice, the Gregorian calendar): February has 28 days, 29 in leap years
// (2028 is one, 2027 is not); April, June, September and November have 30.
const march1 = { month: 3, day: 1 };

describe("the day a season starts", () => {
  it("must be a day every year has", () => {
    expect(seasonStartProblem(march1)).toBeNull();
    expect(seasonStartProblem({ month: 2, day: 28 })).toBeNull();
    expect(seasonStartProblem({ month: 12, day: 31 })).toBeNull();
    expect(seasonStartProblem({ month: 2, day: 29 })).toMatch(/29 February/);
    expect(seasonStartProblem({ month: 4, day: 31 })).toMatch(/April has 30 days/);
    expect(seasonStartProblem({ month: 13, day: 1 })).toMatch(/month/);
    expect(seasonStartProblem({ month: 3, day: 0 })).toMatch(/day/);
    expect(seasonStartProblem({ month: 3, day: 1.5 })).toMatch(/day/);
  });

  it("is refused by the season arithmetic when it is not such a day", () => {
    expect(() => seasonOfDate("2026-03-01", { month: 2, day: 29 })).toThrow(RangeError);
  });
});

describe("the season of a day", () => {
  it("starts on the start day itself; the day before belongs to the season before", () => {
    expect(seasonOfDate("2026-03-01", march1)).toBe(2026);
    expect(seasonOfDate("2026-02-28", march1)).toBe(2025);
    expect(seasonOfDate("2026-12-31", march1)).toBe(2026);
    expect(seasonOfDate("2027-01-15", march1)).toBe(2026);
  });

  it("takes 29 February into the season that started the March before", () => {
    expect(seasonOfDate("2028-02-29", march1)).toBe(2027);
    expect(seasonOfDate("2028-02-29", { month: 2, day: 28 })).toBe(2028);
  });

  it("is the calendar year when the season starts on 1 January", () => {
    expect(seasonOfDate("2026-01-01", calendarYear)).toBe(2026);
    expect(seasonOfDate("2025-12-31", calendarYear)).toBe(2025);
  });

  it("compares the day within the start month", () => {
    const sept15 = { month: 9, day: 15 };
    expect(seasonOfDate("2026-09-14", sept15)).toBe(2025);
    expect(seasonOfDate("2026-09-15", sept15)).toBe(2026);
  });
});

describe("a block's season", () => {
  it("is the one its season log names, else the one of its inoculation date, else none", () => {
    expect(blockSeason({ seasonYear: 2024, inoculatedOn: "2026-05-01" }, march1)).toBe(2024);
    expect(blockSeason({ seasonYear: null, inoculatedOn: "2026-02-10" }, march1)).toBe(2025);
    expect(blockSeason({ seasonYear: null, inoculatedOn: null }, march1)).toBeNull();
  });
});

describe("a season as written", () => {
  it("reads the starting year, or the two years it spans, as the same season", () => {
    for (const written of ["2026", " 2026 ", "2026/27", "2026/2027", "2026-27", "2026 / 27", "2026–27"]) {
      expect(readSeason(written), written).toEqual({ ok: true, seasonYear: 2026 });
    }
    expect(readSeason("1999/00")).toEqual({ ok: true, seasonYear: 1999 });
    expect(readSeason("")).toBeNull();
    expect(readSeason("  ")).toBeNull();
  });

  it("refuses what is not a season with a message that says what to write", () => {
    for (const written of ["26", "spring 2026", "2026/28", "2026/2025", "2026.5", "20266"]) {
      const reading = readSeason(written);
      expect(reading, written).toMatchObject({ ok: false, code: "season_unreadable" });
      if (reading?.ok === false) expect(reading.message).toContain(`"${written}"`);
    }
    expect(readSeason("2026/28")).toMatchObject({ message: expect.stringMatching(/2026\/27/) as unknown });
    expect(readSeason("1960")).toMatchObject({ ok: false, message: expect.stringMatching(/1970 to 2099/) as unknown });
  });

  it("is shown as the years it spans, or the calendar year", () => {
    expect(seasonLabel(2026, march1)).toBe("2026/27");
    expect(seasonLabel(2099, march1)).toBe("2099/00");
    expect(seasonLabel(2026, calendarYear)).toBe("2026");
  });

  it("is read from an address; blank is every season, anything else that is not a season is refused", () => {
    expect(seasonInAddressSchema.parse("2026")).toBe(2026);
    expect(seasonInAddressSchema.parse("2026/27")).toBe(2026);
    expect(seasonInAddressSchema.parse(["2025", "2026"])).toBe(2025);
    expect(seasonInAddressSchema.parse(undefined)).toBeUndefined();
    expect(seasonInAddressSchema.parse("")).toBeUndefined();
    const refused = seasonInAddressSchema.safeParse("all");
    expect(refused.success).toBe(false);
    expect(refused.error?.issues[0].message).toMatch(/"all", is not a season: write the year it starts/);
  });
});

describe("the season start on the Co-op settings form", () => {
  it("takes a month and a day, and refuses 29 February and days a month lacks beside the day", () => {
    expect(seasonStartSchema.parse({ seasonStartMonth: "3", seasonStartDay: "1" })).toEqual({ seasonStartMonth: 3, seasonStartDay: 1 });
    for (const [month, day] of [
      ["2", "29"],
      ["11", "31"],
      ["3", "0"],
    ]) {
      const parsed = seasonStartSchema.safeParse({ seasonStartMonth: month, seasonStartDay: day });
      expect(parsed.success, `${day}/${month}`).toBe(false);
      expect(parsed.error?.issues[0].path).toEqual(["seasonStartDay"]);
    }
    expect(seasonStartSchema.safeParse({ seasonStartMonth: "13", seasonStartDay: "1" }).success).toBe(false);
  });
});
