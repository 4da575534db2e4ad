import { describe, expect, it } from "vitest";
import { describeReleaseSchedule, latestReleaseSlot, nextReleaseSlot, releaseHourIn } from "./release-schedule";

const utc = (hour: number) => ({ hour, timeZone: "UTC" });
const berlin = (hour: number) => ({ hour, timeZone: "Europe/Berlin" });

// Calendar facts (common practice): 7 December 2026 is a Monday.
describe("when a scheduled release is due", () => {
  it("is today's hour once it has passed, and yesterday's before", () => {
    expect(latestReleaseSlot(new Date("2026-12-08T02:00:00Z"), "daily", utc(2))?.toISOString()).toBe("2026-12-08T02:00:00.000Z");
    expect(latestReleaseSlot(new Date("2026-12-08T01:59:59Z"), "daily", utc(2))?.toISOString()).toBe("2026-12-07T02:00:00.000Z");
    expect(nextReleaseSlot(new Date("2026-12-08T01:59:59Z"), "daily", utc(2))?.toISOString()).toBe("2026-12-08T02:00:00.000Z");
  });

  it("is the latest Monday for a weekly schedule", () => {
    expect(latestReleaseSlot(new Date("2026-12-10T12:00:00Z"), "weekly", utc(2))?.toISOString()).toBe("2026-12-07T02:00:00.000Z");
    expect(latestReleaseSlot(new Date("2026-12-07T01:00:00Z"), "weekly", utc(2))?.toISOString()).toBe("2026-11-30T02:00:00.000Z");
    expect(nextReleaseSlot(new Date("2026-12-10T12:00:00Z"), "weekly", utc(2))?.toISOString()).toBe("2026-12-14T02:00:00.000Z");
  });

  it("never comes when releases are cut by hand", () => {
    expect(latestReleaseSlot(new Date("2026-12-08T03:00:00Z"), "manual", utc(2))).toBeNull();
    expect(nextReleaseSlot(new Date("2026-12-08T03:00:00Z"), "manual", utc(2))).toBeNull();
  });

  // Offsets and change-overs from the tz database (IANA tzdata, "europe", "asia"): Berlin is UTC+1 in
  // winter, UTC+2 from 01:00 UTC on 29 March 2026 to 01:00 UTC on 25 October 2026; Kolkata UTC+5:30 all year.
  it("is the hour on the clocks of the co-op's release zone, summer time or not", () => {
    expect(latestReleaseSlot(new Date("2026-12-08T12:00:00Z"), "daily", berlin(2))?.toISOString()).toBe("2026-12-08T01:00:00.000Z");
    expect(latestReleaseSlot(new Date("2026-07-08T12:00:00Z"), "daily", berlin(2))?.toISOString()).toBe("2026-07-08T00:00:00.000Z");
    // 02:00 in Kolkata on 8 December is 20:30 UTC on the 7th: the day is the zone's, not UTC's.
    expect(latestReleaseSlot(new Date("2026-12-07T21:00:00Z"), "daily", { hour: 2, timeZone: "Asia/Kolkata" })?.toISOString()).toBe(
      "2026-12-07T20:30:00.000Z",
    );
    // Monday 02:00 in Berlin is Sunday 01:00 UTC.
    expect(latestReleaseSlot(new Date("2026-12-07T01:30:00Z"), "weekly", berlin(2))?.toISOString()).toBe("2026-12-07T01:00:00.000Z");
  });

  it("comes at the same hour on the zone's clocks across a summer-time change, a 23- or 25-hour day apart", () => {
    expect(nextReleaseSlot(new Date("2026-03-28T12:00:00Z"), "daily", berlin(4))?.toISOString()).toBe("2026-03-29T02:00:00.000Z");
    expect(nextReleaseSlot(new Date("2026-10-24T12:00:00Z"), "daily", berlin(4))?.toISOString()).toBe("2026-10-25T03:00:00.000Z");
    // 02:00 does not happen in Berlin on 29 March 2026 (01:59 CET is followed by 03:00 CEST): the release comes at 03:00 CEST.
    expect(nextReleaseSlot(new Date("2026-03-28T12:00:00Z"), "daily", berlin(2))?.toISOString()).toBe("2026-03-29T01:00:00.000Z");
  });

  it("is said on the reader's clocks, with the zone named", () => {
    const now = new Date("2026-12-08T12:00:00Z");
    expect(describeReleaseSchedule("daily", utc(2), { timeZone: "Europe/Berlin", dateStyle: "iso" }, now)).toBe("every night at 03:00 CET");
    expect(describeReleaseSchedule("weekly", berlin(2), { timeZone: "UTC", dateStyle: "iso" }, now)).toBe("every Monday at 01:00 UTC");
    expect(describeReleaseSchedule("manual", berlin(2), { timeZone: "UTC", dateStyle: "iso" }, now)).toBe(
      "when the coordinator cuts a new release",
    );
  });

  it("shows a coordinator in another zone the hour on their own clocks", () => {
    const now = new Date("2026-12-08T12:00:00Z");
    expect(releaseHourIn(berlin(2), "Europe/Berlin", now)).toBe(2);
    expect(releaseHourIn(berlin(2), "UTC", now)).toBe(1);
    expect(releaseHourIn(utc(23), "Asia/Tokyo", now)).toBe(8);
  });
});
