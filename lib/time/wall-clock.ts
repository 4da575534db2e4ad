/**
 * A wall-clock time in a zone, turned into the instants it names. Offsets and summer-time changes
 * come from the platform's tz database (Intl), never from arithmetic of our own. A wall-clock time
 * names no instant in a spring-forward gap, one instant mostly, and two in the repeated autumn hour.
 */

export interface WallClock {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let formatter = formatters.get(timeZone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat("en-US", {
      timeZone,
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      second: "numeric",
      hourCycle: "h23",
    });
    formatters.set(timeZone, formatter);
  }
  return formatter;
}

/** The zone's offset from UTC at an instant, in milliseconds (east positive). */
export function offsetAt(instantMs: number, timeZone: string): number {
  const parts: Record<string, number> = {};
  for (const part of formatterFor(timeZone).formatToParts(new Date(instantMs))) {
    if (part.type !== "literal") parts[part.type] = Number(part.value);
  }
  const wall = Date.UTC(parts.year, parts.month - 1, parts.day, parts.hour, parts.minute, parts.second);
  // Seconds are the finest part the formatter gives; drop the instant's milliseconds to compare.
  return wall - (instantMs - (((instantMs % 1000) + 1000) % 1000));
}

const hour = 3_600_000;

/**
 * Every instant the wall-clock time names in the zone, earliest first: none in a gap, two in a
 * repeated hour. Offsets in force a day either side are tried (no zone has changed twice in a day).
 */
export function instantsAt(wall: WallClock, timeZone: string): number[] {
  const asUtc = Date.UTC(wall.year, wall.month - 1, wall.day, wall.hour, wall.minute, wall.second);
  const offsets = new Set([offsetAt(asUtc - 24 * hour, timeZone), offsetAt(asUtc, timeZone), offsetAt(asUtc + 24 * hour, timeZone)]);
  const found = new Set<number>();
  for (const offset of offsets) {
    const candidate = asUtc - offset;
    if (offsetAt(candidate, timeZone) === offset) found.add(candidate);
  }
  return [...found].sort((a, b) => a - b);
}
