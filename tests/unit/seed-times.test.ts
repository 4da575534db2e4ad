/**
 * The demo's wall-clock hours in its valley (America/Vancouver) as instants. Check values: North
 * American daylight saving time, in force in British Columbia from the second Sunday of March to
 * the first Sunday of November (8 March and 1 November 2026): UTC−7 then, UTC−8 otherwise (from
 * memory; the zone's rules are those of the IANA time zone database).
 */
import { describe, expect, it } from "vitest";
import { demoDay, inTheValley } from "@/db/seed-times";

describe("inTheValley", () => {
  it("gives a summer afternoon seven hours behind UTC and a winter morning eight", () => {
    expect(inTheValley("2026-07-25", 15 * 60 + 27).toISOString()).toBe("2026-07-25T22:27:00.000Z");
    expect(inTheValley("2026-12-02", 9 * 60).toISOString()).toBe("2026-12-02T17:00:00.000Z");
  });

  it("follows the clock change on the first Sunday of November", () => {
    expect(inTheValley("2026-10-31", 9 * 60).toISOString()).toBe("2026-10-31T16:00:00.000Z");
    expect(inTheValley("2026-11-02", 9 * 60).toISOString()).toBe("2026-11-02T17:00:00.000Z");
  });

  it("keeps the seconds of a fractional minute", () => {
    expect(inTheValley("2026-07-25", 15 * 60 + 27.5).toISOString()).toBe("2026-07-25T22:27:30.000Z");
  });
});

describe("demoDay", () => {
  it("is still the day before in the valley when UTC has passed midnight", () => {
    expect(demoDay(new Date("2026-12-03T05:00:00Z"))).toBe("2026-12-02");
    expect(demoDay(new Date("2026-12-03T09:00:00Z"))).toBe("2026-12-03");
  });
});
