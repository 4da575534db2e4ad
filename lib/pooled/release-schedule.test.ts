import { describe, expect, it } from "vitest";
import { latestReleaseSlot, nextReleaseSlot } from "./release-schedule";

// Calendar facts (common practice): 7 December 2026 is a Monday.
describe("when a scheduled release is due", () => {
  it("is today's hour once it has passed, and yesterday's before", () => {
    expect(latestReleaseSlot(new Date("2026-12-08T02:00:00Z"), "daily", 2)?.toISOString()).toBe("2026-12-08T02:00:00.000Z");
    expect(latestReleaseSlot(new Date("2026-12-08T01:59:59Z"), "daily", 2)?.toISOString()).toBe("2026-12-07T02:00:00.000Z");
    expect(nextReleaseSlot(new Date("2026-12-08T01:59:59Z"), "daily", 2)?.toISOString()).toBe("2026-12-08T02:00:00.000Z");
  });

  it("is the latest Monday for a weekly schedule", () => {
    expect(latestReleaseSlot(new Date("2026-12-10T12:00:00Z"), "weekly", 2)?.toISOString()).toBe("2026-12-07T02:00:00.000Z");
    expect(latestReleaseSlot(new Date("2026-12-07T01:00:00Z"), "weekly", 2)?.toISOString()).toBe("2026-11-30T02:00:00.000Z");
    expect(nextReleaseSlot(new Date("2026-12-10T12:00:00Z"), "weekly", 2)?.toISOString()).toBe("2026-12-14T02:00:00.000Z");
  });

  it("never comes when releases are cut by hand", () => {
    expect(latestReleaseSlot(new Date("2026-12-08T03:00:00Z"), "manual", 2)).toBeNull();
    expect(nextReleaseSlot(new Date("2026-12-08T03:00:00Z"), "manual", 2)).toBeNull();
  });
});
