/** When the scheduled job may cut a release: every day or every Monday at an hour (UTC), or only when the coordinator asks. */
export const releaseSchedules = ["daily", "weekly", "manual"] as const;
export type ReleaseSchedule = (typeof releaseSchedules)[number];

export const releaseScheduleLabels: Record<ReleaseSchedule, string> = {
  daily: "Every night",
  weekly: "Every Monday",
  manual: "Only when the coordinator cuts one",
};

const hourMs = 3_600_000;
const dayMs = 24 * hourMs;

/**
 * The latest time at or before `now` at which a scheduled release was due, or null when the
 * co-op cuts releases by hand. Daily: today at `hour` UTC (yesterday's if that is still to come);
 * weekly: the latest Monday at `hour`.
 */
export function latestReleaseSlot(now: Date, schedule: ReleaseSchedule, hour: number): Date | null {
  if (schedule === "manual") return null;
  const midnight = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate());
  let slot = midnight + hour * hourMs;
  if (slot > now.getTime()) slot -= dayMs;
  if (schedule === "weekly") {
    // getUTCDay: Sunday 0, Monday 1.
    const daysSinceMonday = (new Date(slot).getUTCDay() + 6) % 7;
    slot -= daysSinceMonday * dayMs;
  }
  return new Date(slot);
}

/** The next time after `now` a scheduled release is due, or null when the co-op cuts releases by hand. */
export function nextReleaseSlot(now: Date, schedule: ReleaseSchedule, hour: number): Date | null {
  const latest = latestReleaseSlot(now, schedule, hour);
  if (!latest) return null;
  return new Date(latest.getTime() + (schedule === "weekly" ? 7 : 1) * dayMs);
}

/** "every night at 02:00 UTC", for the pages that say when the figures next change. */
export function describeReleaseSchedule(schedule: ReleaseSchedule, hour: number): string {
  const at = `${String(hour).padStart(2, "0")}:00 UTC`;
  if (schedule === "manual") return "when the coordinator cuts a new release";
  return schedule === "daily" ? `every night at ${at}` : `every Monday at ${at}`;
}
