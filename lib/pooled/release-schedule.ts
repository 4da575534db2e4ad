import { dateIn, formatTime, hourIn, instantAtHour, type TimeDisplay } from "@/lib/time/display";

/**
 * When the scheduled job may cut a release: every day or every Monday at an hour of the co-op's
 * release zone (the zone of the coordinator who set the hour), or only when the coordinator asks.
 */
export const releaseSchedules = ["daily", "weekly", "manual"] as const;
export type ReleaseSchedule = (typeof releaseSchedules)[number];

export const releaseScheduleLabels: Record<ReleaseSchedule, string> = {
  daily: "Every night",
  weekly: "Every Monday",
  manual: "Only when the coordinator cuts one",
};

/** The hour releases are cut, on the clocks of a zone (an IANA name, or UTC). */
export interface ReleaseTime {
  hour: number;
  timeZone: string;
}

/** A calendar date moved by whole days (no clock involved). */
function addCalendarDays(isoDate: string, days: number): string {
  const day = new Date(`${isoDate}T00:00:00Z`);
  day.setUTCDate(day.getUTCDate() + days);
  return day.toISOString().slice(0, 10);
}

/**
 * The latest time at or before `now` at which a scheduled release was due, or null when the
 * co-op cuts releases by hand. Daily: today at the hour on the zone's clocks (yesterday's if that
 * is still to come); weekly: the latest Monday at the hour. Summer time moves the instant, not the hour.
 */
export function latestReleaseSlot(now: Date, schedule: ReleaseSchedule, at: ReleaseTime): Date | null {
  if (schedule === "manual") return null;
  let day = dateIn(now, at.timeZone);
  if (instantAtHour(day, at.hour, at.timeZone) > now) day = addCalendarDays(day, -1);
  if (schedule === "weekly") {
    // getUTCDay of the date itself: Sunday 0, Monday 1.
    const daysSinceMonday = (new Date(`${day}T00:00:00Z`).getUTCDay() + 6) % 7;
    day = addCalendarDays(day, -daysSinceMonday);
  }
  return instantAtHour(day, at.hour, at.timeZone);
}

/** The next time after `now` a scheduled release is due, or null when the co-op cuts releases by hand. */
export function nextReleaseSlot(now: Date, schedule: ReleaseSchedule, at: ReleaseTime): Date | null {
  const latest = latestReleaseSlot(now, schedule, at);
  if (!latest) return null;
  const day = addCalendarDays(dateIn(latest, at.timeZone), schedule === "weekly" ? 7 : 1);
  return instantAtHour(day, at.hour, at.timeZone);
}

/**
 * The hour a zone's clocks show at the next daily slot: what the settings form shows a coordinator
 * whose zone is not the one the hour was saved in (a zone half an hour off shows the whole hour before).
 */
export function releaseHourIn(at: ReleaseTime, timeZone: string, now = new Date()): number {
  if (at.timeZone === timeZone) return at.hour;
  return hourIn(nextReleaseSlot(now, "daily", at)!, timeZone);
}

/**
 * "every night at 03:00 CET", for the pages that say when the figures next change: the hour of the
 * next slot on the reader's clocks (`display`), which the zone's name makes unambiguous.
 */
export function describeReleaseSchedule(schedule: ReleaseSchedule, at: ReleaseTime, display: TimeDisplay, now = new Date()): string {
  const next = nextReleaseSlot(now, schedule, at);
  if (!next) return "when the coordinator cuts a new release";
  return schedule === "daily" ? `every night at ${formatTime(next, display)}` : `every Monday at ${formatTime(next, display)}`;
}
