import { describe, expect, it } from "vitest";
import { canonicalTimeZone, formatDate, formatDateTime, formatDay, timeZoneNames, type TimeDisplay } from "./display";

// Offsets and change-over instants are the tz database's (IANA tzdata, files "europe" and "northamerica"):
// the EU changes at 01:00 UTC on the last Sunday of March and of October; the US at 02:00 local time on
// the second Sunday of March and the first Sunday of November. 29 March and 1 November 2026 are those Sundays.
const berlin: TimeDisplay = { timeZone: "Europe/Berlin", dateStyle: "day-month-year-dots" };
const newYork: TimeDisplay = { timeZone: "America/New_York", dateStyle: "month-day-year" };

describe("formatDateTime", () => {
  it("writes UTC times as before, with UTC named", () => {
    expect(formatDateTime("2026-03-21T14:05:59.000Z", { timeZone: "UTC", dateStyle: "iso" })).toBe("2026-03-21 14:05 UTC");
  });

  it("moves Berlin's clock forward at 01:00 UTC on 29 March 2026: 01:59 CET is followed by 03:00 CEST", () => {
    expect(formatDateTime("2026-03-29T00:59:00Z", berlin)).toBe("29.03.2026 01:59 CET");
    expect(formatDateTime("2026-03-29T01:00:00Z", berlin)).toBe("29.03.2026 03:00 CEST");
  });

  it("moves Berlin's clock back at 01:00 UTC on 25 October 2026: 02:30 happens twice, told apart by the zone's name", () => {
    expect(formatDateTime("2026-10-25T00:30:00Z", berlin)).toBe("25.10.2026 02:30 CEST");
    expect(formatDateTime("2026-10-25T01:30:00Z", berlin)).toBe("25.10.2026 02:30 CET");
  });

  it("repeats New York's 01:00–02:00 on 1 November 2026, first at UTC−4 then at UTC−5", () => {
    expect(formatDateTime("2026-11-01T05:30:00Z", newYork)).toBe("11/01/2026 01:30 GMT-4");
    expect(formatDateTime("2026-11-01T06:30:00Z", newYork)).toBe("11/01/2026 01:30 GMT-5");
  });

  it("skips New York's 02:00–03:00 on 8 March 2026", () => {
    expect(formatDateTime("2026-03-08T06:59:00Z", newYork)).toBe("03/08/2026 01:59 GMT-5");
    expect(formatDateTime("2026-03-08T07:00:00Z", newYork)).toBe("03/08/2026 03:00 GMT-4");
  });

  it("carries the date over midnight in the member's zone, also for half-hour offsets (India, UTC+5:30 all year)", () => {
    expect(formatDateTime(new Date("2026-03-21T23:30:00Z"), { timeZone: "Europe/Berlin", dateStyle: "day-month-year" })).toBe(
      "22/03/2026 00:30 CET",
    );
    expect(formatDateTime("2026-03-21T18:45:00Z", { timeZone: "Asia/Kolkata", dateStyle: "iso" })).toBe("2026-03-22 00:15 GMT+5:30");
  });

  it("refuses what is not a time rather than writing Invalid Date", () => {
    expect(() => formatDateTime("yesterday", berlin)).toThrow(RangeError);
  });
});

describe("formatDay", () => {
  it("gives the date in the member's zone, which can differ from the UTC date", () => {
    expect(formatDay("2026-11-01T03:30:00Z", newYork)).toBe("10/31/2026");
    expect(formatDay("2026-11-01T03:30:00Z", { timeZone: "UTC", dateStyle: "iso" })).toBe("2026-11-01");
  });
});

describe("formatDate", () => {
  it("writes a date without a time in each style, moving no day", () => {
    expect(formatDate("2026-03-21", "iso")).toBe("2026-03-21");
    expect(formatDate("2026-03-21", "day-month-year")).toBe("21/03/2026");
    expect(formatDate("2026-03-21", "month-day-year")).toBe("03/21/2026");
    expect(formatDate("2026-03-21", "day-month-year-dots")).toBe("21.03.2026");
  });

  it("refuses other shapes", () => {
    expect(() => formatDate("21/03/2026", "iso")).toThrow(RangeError);
  });
});

describe("canonicalTimeZone", () => {
  it("keeps the tz database's names, UTC included, and maps old aliases to them", () => {
    expect(canonicalTimeZone("Europe/Berlin")).toBe("Europe/Berlin");
    expect(canonicalTimeZone("UTC")).toBe("UTC");
    expect(canonicalTimeZone("Etc/UTC")).toBe("UTC");
    expect(canonicalTimeZone("US/Eastern")).toBe("America/New_York");
    expect(timeZoneNames()).toContain("America/New_York");
  });

  it("knows no made-up zone and no bare offset", () => {
    expect(canonicalTimeZone("Europe/Atlantis")).toBeNull();
    expect(canonicalTimeZone("+01:00")).toBeNull();
    expect(canonicalTimeZone("")).toBeNull();
  });
});
