/**
 * What a room's climate log says about one window of time (a flush's growth): how long the air was
 * wet, how dry it got, how long it stayed dry, the mean temperature and the CO2 peak.
 *
 * Each reading stands for the air from its own time until the next reading: a logger samples at a
 * fixed interval, and the air between two samples is known only as well as those samples. Where
 * the next reading is more than twice the logger's usual interval away (the median spacing of the
 * readings given), the log has a gap: the reading stands for one usual interval and the rest is
 * not covered. The last reading stands for one usual interval. Every time figure is over covered
 * time only, and none is given when the log covers less than `minimumCoverage` of the window.
 */

export interface SummaryReading {
  /** Milliseconds since the epoch. */
  takenAt: number;
  temperatureC: number | null;
  relativeHumidity: number | null;
  co2Ppm: number | null;
}

/** "Wet": relative humidity above this, in %. Fruiting rooms are commonly run at 85–95 % (common practice). */
export const wetAbovePercent = 90;
/** "Dry": relative humidity below this, in %. A flooded room's dry-out is the time spent below it (common practice). */
export const dryBelowPercent = 85;
/** Below this share of the window covered by the log, no figure is given. */
export const minimumCoverage = 0.8;
/** A spacing longer than this many usual intervals is a gap in the log. */
export const gapAfterIntervals = 2;

const hourMs = 3_600_000;
const dayMs = 24 * hourMs;

export interface DailyMinimum {
  /** Start of the 24-hour period, counted from the window's start. */
  startsAt: number;
  /** Lowest relative humidity read in that period, or null if none was read. */
  minimum: number | null;
}

export interface WindowSummary {
  from: number;
  to: number;
  /** Share of the window the log covers, 0–1. */
  coverage: number;
  /** The log covers at least `minimumCoverage` of the window; otherwise every figure below is null. */
  enough: boolean;
  /** Mean hours a day above `wetAbovePercent`, over the time the log covers humidity. */
  wetHoursPerDay: number | null;
  /** Lowest relative humidity read in the window. */
  lowestHumidity: number | null;
  dailyMinimumHumidity: DailyMinimum[];
  /** Longest unbroken covered run below `dryBelowPercent`, in hours. */
  longestDryOutHours: number | null;
  longestDryOutStartsAt: number | null;
  /** Mean temperature weighted by the time each reading stands for. */
  meanTemperatureC: number | null;
  co2PeakPpm: number | null;
  co2PeakAt: number | null;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

interface Span {
  start: number;
  end: number;
  reading: SummaryReading;
  /** No gap between this span and the one before it. */
  joined: boolean;
}

/** The time each reading stands for, cut to the window; readings before or after it count only for the part inside. */
function spansOf(readings: readonly SummaryReading[], from: number, to: number): Span[] {
  const sorted = [...readings].sort((a, b) => a.takenAt - b.takenAt);
  const spacings: number[] = [];
  for (let index = 1; index < sorted.length; index++) {
    const spacing = sorted[index].takenAt - sorted[index - 1].takenAt;
    if (spacing > 0) spacings.push(spacing);
  }
  if (spacings.length === 0) return [];
  const usual = median(spacings);
  const spans: Span[] = [];
  let previousEnd = -Infinity;
  for (let index = 0; index < sorted.length; index++) {
    const reading = sorted[index];
    const next = index + 1 < sorted.length ? sorted[index + 1].takenAt : Infinity;
    const end = next - reading.takenAt <= gapAfterIntervals * usual ? next : reading.takenAt + usual;
    const start = Math.max(reading.takenAt, from);
    const cutEnd = Math.min(end, to);
    if (cutEnd > start) spans.push({ start, end: cutEnd, reading, joined: start === previousEnd });
    previousEnd = end;
  }
  return spans;
}

export function summariseWindow(readings: readonly SummaryReading[], fromInstant: Date | number, toInstant: Date | number): WindowSummary {
  const from = typeof fromInstant === "number" ? fromInstant : fromInstant.getTime();
  const to = typeof toInstant === "number" ? toInstant : toInstant.getTime();
  const spans = to > from ? spansOf(readings, from, to) : [];
  const covered = spans.reduce((sum, span) => sum + (span.end - span.start), 0);
  const coverage = to > from ? covered / (to - from) : 0;
  const dailyMinimumHumidity: DailyMinimum[] = [];
  const empty: WindowSummary = {
    from,
    to,
    coverage,
    enough: false,
    wetHoursPerDay: null,
    lowestHumidity: null,
    dailyMinimumHumidity,
    longestDryOutHours: null,
    longestDryOutStartsAt: null,
    meanTemperatureC: null,
    co2PeakPpm: null,
    co2PeakAt: null,
  };
  if (coverage < minimumCoverage) return empty;

  let humidityTime = 0;
  let wetTime = 0;
  let temperatureTime = 0;
  let temperatureSum = 0;
  let dryRun = 0;
  let dryRunStart = 0;
  let longestDry = 0;
  let longestDryStart: number | null = null;
  for (const span of spans) {
    const length = span.end - span.start;
    const { relativeHumidity, temperatureC } = span.reading;
    if (temperatureC !== null) {
      temperatureTime += length;
      temperatureSum += temperatureC * length;
    }
    if (relativeHumidity !== null) {
      humidityTime += length;
      if (relativeHumidity > wetAbovePercent) wetTime += length;
    }
    if (relativeHumidity !== null && relativeHumidity < dryBelowPercent) {
      if (dryRun === 0 || !span.joined) {
        dryRun = 0;
        dryRunStart = span.start;
      }
      dryRun += length;
      if (dryRun > longestDry) {
        longestDry = dryRun;
        longestDryStart = dryRunStart;
      }
    } else dryRun = 0;
  }

  const inside = readings.filter((reading) => reading.takenAt >= from && reading.takenAt < to);
  for (let start = from; start < to; start += dayMs) {
    let minimum: number | null = null;
    for (const reading of inside) {
      if (reading.takenAt < start || reading.takenAt >= start + dayMs || reading.relativeHumidity === null) continue;
      minimum = minimum === null ? reading.relativeHumidity : Math.min(minimum, reading.relativeHumidity);
    }
    dailyMinimumHumidity.push({ startsAt: start, minimum });
  }
  const minima = dailyMinimumHumidity.flatMap((day) => (day.minimum === null ? [] : [day.minimum]));
  let co2PeakPpm: number | null = null;
  let co2PeakAt: number | null = null;
  for (const reading of inside) {
    if (reading.co2Ppm !== null && (co2PeakPpm === null || reading.co2Ppm > co2PeakPpm)) {
      co2PeakPpm = reading.co2Ppm;
      co2PeakAt = reading.takenAt;
    }
  }
  return {
    ...empty,
    enough: true,
    wetHoursPerDay: humidityTime > 0 ? (wetTime / humidityTime) * 24 : null,
    lowestHumidity: minima.length > 0 ? Math.min(...minima) : null,
    longestDryOutHours: humidityTime > 0 ? longestDry / hourMs : null,
    longestDryOutStartsAt: longestDryStart,
    meanTemperatureC: temperatureTime > 0 ? temperatureSum / temperatureTime : null,
    co2PeakPpm,
    co2PeakAt,
  };
}

function hours(value: number): string {
  return value >= 10 || Number.isInteger(value) ? `${Math.round(value)} h` : `${value.toFixed(1)} h`;
}

/** The summary in a grower's words: "19 h a day above 90 % RH; driest 62 %; longest dry spell (under 85 % RH) 5 h; …". */
export function summaryInWords(summary: WindowSummary): string {
  if (summary.coverage === 0) return "The room's log has no readings in this window.";
  if (!summary.enough)
    return `The log covers ${Math.round(summary.coverage * 100)} % of this window; figures need at least ${minimumCoverage * 100} %.`;
  const parts: string[] = [];
  if (summary.wetHoursPerDay !== null) parts.push(`${hours(summary.wetHoursPerDay)} a day above ${wetAbovePercent} % RH`);
  if (summary.lowestHumidity !== null) parts.push(`driest ${Math.round(summary.lowestHumidity)} %`);
  if (summary.longestDryOutHours !== null)
    parts.push(
      summary.longestDryOutHours === 0
        ? `never under ${dryBelowPercent} % RH`
        : `longest dry spell (under ${dryBelowPercent} % RH) ${hours(summary.longestDryOutHours)}`,
    );
  if (summary.meanTemperatureC !== null) parts.push(`mean ${summary.meanTemperatureC.toFixed(1)} °C`);
  if (summary.co2PeakPpm !== null) parts.push(`CO2 peak ${Math.round(summary.co2PeakPpm)} ppm`);
  if (summary.coverage < 0.995) parts.push(`the log covers ${Math.round(summary.coverage * 100)} % of the window`);
  return parts.join("; ");
}
