import { canonicalTimeZone, timeZoneNames } from "../time/display";

/**
 * The zones a logger's clock may be in: every zone the platform knows, and fixed offsets for a
 * logger that keeps one offset all year (many cheap ones ignore summer time). The tz database
 * names fixed offsets with the sign reversed: Etc/GMT-1 is UTC+1.
 */
const fixedOffsets = Array.from({ length: 27 }, (_, index) => index - 12).map((hours) => ({
  value: hours === 0 ? "UTC" : `Etc/GMT${hours > 0 ? "-" : "+"}${Math.abs(hours)}`,
  label: hours === 0 ? "UTC all year" : `UTC${hours > 0 ? "+" : "−"}${Math.abs(hours)} all year (no summer time)`,
}));

export function loggerClockZones(): { value: string; label: string }[] {
  return [...fixedOffsets.filter((zone) => zone.value !== "UTC"), ...timeZoneNames().map((zone) => ({ value: zone, label: zone }))];
}

export function isLoggerClockZone(name: string): boolean {
  return fixedOffsets.some((zone) => zone.value === name) || canonicalTimeZone(name) === name;
}
