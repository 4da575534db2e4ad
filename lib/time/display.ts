/**
 * Dates and times as a member reads them: in their time zone and their date style. Pure, so that
 * server pages, client tables and e-mails share it. Stored times are instants (UTC); the offsets,
 * summer-time changes and zone names come from the tz database that ships with the platform's
 * Intl (ICU), never from arithmetic of our own.
 */

/** How a calendar date is written; the example is 21 March 2026. */
export const dateStyles = {
  iso: "2026-03-21",
  "day-month-year": "21/03/2026",
  "month-day-year": "03/21/2026",
  "day-month-year-dots": "21.03.2026",
} as const;

export type DateStyle = keyof typeof dateStyles;

export const dateStyleNames = Object.keys(dateStyles) as [DateStyle, ...DateStyle[]];

export interface TimeDisplay {
  /** An IANA zone name such as Europe/Berlin, or UTC. */
  timeZone: string;
  dateStyle: DateStyle;
}

/** For readers we know nothing about (an invitation's addressee, a job's log): UTC, written as such. */
export const utcDisplay: TimeDisplay = { timeZone: "UTC", dateStyle: "iso" };

/**
 * For text made away from a browser (an e-mail, a message from the data layer): the zone the
 * member chose, else UTC, which the formatter then names.
 */
export function chosenDisplay(member: { timeZone: string | null; dateStyle: DateStyle }): TimeDisplay {
  return { timeZone: member.timeZone ?? "UTC", dateStyle: member.dateStyle };
}

let zoneNames: Set<string> | undefined;

/** Every zone the settings page offers: the platform's list, plus UTC, which the list leaves out. */
export function timeZoneNames(): string[] {
  return ["UTC", ...Intl.supportedValuesOf("timeZone")];
}

/**
 * The zone's name as stored, or null if the platform does not know it. Old aliases a browser may
 * still report (US/Eastern, Etc/UTC) become the name the tz database links them to.
 */
export function canonicalTimeZone(name: string): string | null {
  zoneNames ??= new Set(timeZoneNames());
  if (zoneNames.has(name)) return name;
  try {
    const resolved = new Intl.DateTimeFormat("en-GB", { timeZone: name }).resolvedOptions().timeZone;
    return zoneNames.has(resolved) ? resolved : null;
  } catch {
    return null;
  }
}

// Building an Intl formatter costs far more than using one; a page formats hundreds of times.
const formatters = new Map<string, Intl.DateTimeFormat>();

function partsIn(instant: Date, timeZone: string): Record<"year" | "month" | "day" | "hour" | "minute" | "timeZoneName", string> {
  let formatter = formatters.get(timeZone);
  if (!formatter) {
    // en-GB: zone names where British English has them (CET, CEST, UTC), otherwise the offset (GMT-4).
    formatter = new Intl.DateTimeFormat("en-GB", {
      timeZone,
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      hourCycle: "h23",
      timeZoneName: "short",
    });
    formatters.set(timeZone, formatter);
  }
  const parts = Object.fromEntries(formatter.formatToParts(instant).map((part) => [part.type, part.value]));
  return parts as ReturnType<typeof partsIn>;
}

function writeDate(year: string, month: string, day: string, style: DateStyle): string {
  switch (style) {
    case "iso":
      return `${year}-${month}-${day}`;
    case "day-month-year":
      return `${day}/${month}/${year}`;
    case "month-day-year":
      return `${month}/${day}/${year}`;
    case "day-month-year-dots":
      return `${day}.${month}.${year}`;
  }
}

function toInstant(value: Date | string): Date {
  const instant = typeof value === "string" ? new Date(value) : value;
  if (Number.isNaN(instant.getTime())) throw new RangeError(`Not a date and time: ${String(value)}`);
  return instant;
}

/** A calendar date kept without a time (YYYY-MM-DD, e.g. an inoculation date), in the member's style. No zone applies. */
export function formatDate(isoDate: string, style: DateStyle): string {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  if (!match) throw new RangeError(`Not a YYYY-MM-DD date: ${isoDate}`);
  return writeDate(match[1], match[2], match[3], style);
}

/** "29.03.2026 03:30 CEST": the wall-clock time in the member's zone, with the zone's name so it cannot be misread. */
export function formatDateTime(value: Date | string, display: TimeDisplay): string {
  const parts = partsIn(toInstant(value), display.timeZone);
  return `${writeDate(parts.year, parts.month, parts.day, display.dateStyle)} ${parts.hour}:${parts.minute} ${parts.timeZoneName}`;
}

/** The calendar date (YYYY-MM-DD) an instant falls on in a zone: "today" on the member's own calendar. */
export function calendarDateIn(value: Date | string, timeZone: string): string {
  const parts = partsIn(toInstant(value), timeZone);
  return `${parts.year}-${parts.month}-${parts.day}`;
}

/** "03:30 CEST": the time of day only, with the zone's name (a schedule's hour, said for the reader). */
export function formatTime(value: Date | string, display: TimeDisplay): string {
  const parts = partsIn(toInstant(value), display.timeZone);
  return `${parts.hour}:${parts.minute} ${parts.timeZoneName}`;
}

/** The date an instant falls on in the member's zone (a commit undone "on 21/03/2026"). */
export function formatDay(value: Date | string, display: TimeDisplay): string {
  const parts = partsIn(toInstant(value), display.timeZone);
  return writeDate(parts.year, parts.month, parts.day, display.dateStyle);
}

/** The calendar date (YYYY-MM-DD) an instant falls on in a zone. */
export function dateIn(value: Date | string, timeZone: string): string {
  const parts = partsIn(toInstant(value), timeZone);
  return `${parts.year}-${parts.month}-${parts.day}`;
}

/** The hour of the day (0–23) an instant falls on in a zone. */
export function hourIn(value: Date | string, timeZone: string): number {
  return Number(partsIn(toInstant(value), timeZone).hour);
}

/**
 * The instant a zone's clocks read `hour`:00 on a calendar date (a release cut "every night at 02:00"
 * in the co-op's zone). The offsets are the tz database's, read through Intl a day before and a
 * day after, so a summer-time change that day is followed: an hour the clocks repeat gives its
 * first occurrence; an hour they skip (02:00 on the spring change in Europe) gives the instant
 * the clocks jump forward over it, read afterwards as an hour later (03:00).
 */
export function instantAtHour(isoDate: string, hour: number, timeZone: string): Date {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  if (!match) throw new RangeError(`Not a YYYY-MM-DD date: ${isoDate}`);
  const wall = Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3]), hour);
  const offsetAt = (instant: number) => {
    const parts = partsIn(new Date(instant), timeZone);
    const read = Date.UTC(Number(parts.year), Number(parts.month) - 1, Number(parts.day), Number(parts.hour), Number(parts.minute));
    return read - Math.floor(instant / 60_000) * 60_000;
  };
  const day = 86_400_000;
  const candidates = [wall - offsetAt(wall - day), wall - offsetAt(wall + day)].sort((a, b) => a - b);
  const reads = candidates.filter((instant) => instant + offsetAt(instant) === wall);
  return new Date(reads[0] ?? candidates[1]);
}
