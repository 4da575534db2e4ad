import type { ClimateReading } from "./parse";
import { gapAfterIntervals } from "./summary";

export interface ChartPoint {
  /** Milliseconds since the epoch. */
  x: number;
  /** null breaks the line: the log has a gap there. */
  y: number | null;
}

/**
 * A log cut to at most `points` buckets of equal time, each drawn at its mean (a year of readings a
 * minute is half a million; a chart needs a few hundred). Where buckets hold no reading for longer
 * than the summaries' gap rule allows, the line breaks rather than joining across the gap.
 */
export function chartSeries(readings: readonly ClimateReading[], points = 400): { temperature: ChartPoint[]; humidity: ChartPoint[] } {
  if (readings.length === 0) return { temperature: [], humidity: [] };
  const first = readings[0].takenAt;
  const last = readings[readings.length - 1].takenAt;
  const width = Math.max(1, (last - first) / points);
  const buckets = new Map<number, { at: number; t: number; tn: number; h: number; hn: number }>();
  for (const reading of readings) {
    const index = Math.min(points - 1, Math.floor((reading.takenAt - first) / width));
    const bucket = buckets.get(index) ?? { at: first + (index + 0.5) * width, t: 0, tn: 0, h: 0, hn: 0 };
    if (reading.temperatureC !== null) {
      bucket.t += reading.temperatureC;
      bucket.tn++;
    }
    if (reading.relativeHumidity !== null) {
      bucket.h += reading.relativeHumidity;
      bucket.hn++;
    }
    buckets.set(index, bucket);
  }
  const spacings = readings.slice(1).map((reading, index) => reading.takenAt - readings[index].takenAt);
  const usual = spacings.length ? spacings.sort((a, b) => a - b)[Math.floor(spacings.length / 2)] : width;
  const temperature: ChartPoint[] = [];
  const humidity: ChartPoint[] = [];
  let previousAt: number | null = null;
  for (const index of [...buckets.keys()].sort((a, b) => a - b)) {
    const bucket = buckets.get(index);
    if (!bucket) continue;
    if (previousAt !== null && bucket.at - previousAt > Math.max(width, gapAfterIntervals * usual) * 1.5) {
      temperature.push({ x: (previousAt + bucket.at) / 2, y: null });
      humidity.push({ x: (previousAt + bucket.at) / 2, y: null });
    }
    temperature.push({ x: bucket.at, y: bucket.tn ? Math.round((bucket.t / bucket.tn) * 10) / 10 : null });
    humidity.push({ x: bucket.at, y: bucket.hn ? Math.round((bucket.h / bucket.hn) * 10) / 10 : null });
    previousAt = bucket.at;
  }
  return { temperature, humidity };
}
