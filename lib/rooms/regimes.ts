/**
 * Which regime a room ran on a day, and which room a block was in on a day: pure, so the room
 * pages, the co-op comparison and the climate summaries all match a day the same way.
 * Dates are calendar dates (YYYY-MM-DD), compared as text, which orders them as days.
 */
import type { HumidityMode } from "./lists";

/**
 * The regime in force on `isoDate`: the one with the latest `startsOn` on or before that day
 * (a change is in force from its own start day). Null before the first regime.
 */
export function regimeOn<T extends { startsOn: string }>(regimes: readonly T[], isoDate: string): T | null {
  let found: T | null = null;
  for (const regime of regimes) {
    if (regime.startsOn <= isoDate && (found === null || regime.startsOn > found.startsOn)) found = regime;
  }
  return found;
}

/**
 * The block's room on `isoDate`: the move with the latest `movedOn` on or before that day, else
 * the move without a date ("from the start of fruiting", as a season log's fruiting_room says).
 * Null when neither: the block was in no recorded room that day.
 */
export function roomOn<T extends { movedOn: string | null }>(moves: readonly T[], isoDate: string): T | null {
  let dated: T | null = null;
  let fromStart: T | null = null;
  for (const move of moves) {
    if (move.movedOn === null) fromStart = move;
    else if (move.movedOn <= isoDate && (dated === null || move.movedOn > (dated.movedOn as string))) dated = move;
  }
  return dated ?? fromStart;
}

/** The day before a calendar date. */
export function dayBefore(isoDate: string): string {
  const day = new Date(`${isoDate}T00:00:00Z`);
  day.setUTCDate(day.getUTCDate() - 1);
  return day.toISOString().slice(0, 10);
}

/** Each regime with the last day it was in force (the day before the next one starts), oldest first; null while it still is. */
export function regimePeriods<T extends { startsOn: string }>(regimes: readonly T[]): (T & { until: string | null })[] {
  const sorted = [...regimes].sort((a, b) => (a.startsOn < b.startsOn ? -1 : a.startsOn > b.startsOn ? 1 : 0));
  return sorted.map((regime, index) => ({ ...regime, until: index + 1 < sorted.length ? dayBefore(sorted[index + 1].startsOn) : null }));
}

export interface RegimeSettings {
  humidityMode: HumidityMode;
  cycleOnMinutes: number | null;
  cycleOffMinutes: number | null;
  /** "07:00" or "07:00:00", as PostgreSQL gives a time. */
  floodStartsAt: string | null;
  floodHours: number | null;
  airChangesPerHour: number | null;
  temperatureSetC: number | null;
  cleaningEveryDays: number | null;
}

const figure = (value: number): string => String(Math.round(value * 100) / 100);

/** How the room's humidity is run, in a grower's words: "Misted: 2 min on, 13 min off, all day". */
export function humidityInWords(regime: RegimeSettings): string {
  if (regime.humidityMode === "cycling") {
    if (regime.cycleOffMinutes === 0) return "Misted without a break, all day";
    return `Misted: ${figure(regime.cycleOnMinutes ?? 0)} min on, ${figure(regime.cycleOffMinutes ?? 0)} min off, all day`;
  }
  return `Soaked daily from ${(regime.floodStartsAt ?? "").slice(0, 5)} for ${figure(regime.floodHours ?? 0)} h, then left to dry`;
}

/** The whole regime in words: humidity first, then fresh air, set temperature and cleaning where recorded. */
export function regimeInWords(regime: RegimeSettings): string {
  const parts = [humidityInWords(regime)];
  if (regime.airChangesPerHour !== null)
    parts.push(`fresh air ${figure(regime.airChangesPerHour)} ${regime.airChangesPerHour === 1 ? "change" : "changes"} an hour`);
  if (regime.temperatureSetC !== null) parts.push(`set to ${figure(regime.temperatureSetC)} °C`);
  if (regime.cleaningEveryDays !== null)
    parts.push(regime.cleaningEveryDays === 1 ? "cleaned every day" : `cleaned every ${regime.cleaningEveryDays} days`);
  return parts.join("; ");
}
