import { describe, expect, it } from "vitest";
import { type SummaryReading, summariseWindow, summaryInWords } from "./summary";

// Every expected value here is hand-computed from the readings; the arithmetic is beside it.
const hour = 3_600_000;
const minute = 60_000;
const start = Date.UTC(2026, 3, 1);

function reading(
  at: number,
  relativeHumidity: number | null,
  temperatureC: number | null = 18,
  co2Ppm: number | null = null,
): SummaryReading {
  return { takenAt: at, relativeHumidity, temperatureC, co2Ppm };
}

describe("summariseWindow (hand-computed)", () => {
  // One reading an hour, 00:00 to 23:00; each stands for the hour after it.
  // RH: 00–05 95 %, 06–08 80 %, 09 88 %, 10–11 82 %, 12–23 92 %. °C: 00–11 18, 12–23 21. CO2 800, 1500 at 07:00.
  const day = Array.from({ length: 24 }, (_, h) =>
    reading(start + h * hour, h < 6 ? 95 : h < 9 ? 80 : h === 9 ? 88 : h < 12 ? 82 : 92, h < 12 ? 18 : 21, h === 7 ? 1500 : 800),
  );
  const summary = summariseWindow(day, start, start + 24 * hour);

  it("counts wet hours, the driest reading and the longest dry spell", () => {
    expect(summary.coverage).toBe(1); // 24 readings × 1 h = 24 h of a 24 h window
    expect(summary.wetHoursPerDay).toBe(18); // above 90 %: 00–05 (6 h) + 12–23 (12 h) = 18 h of 24 h covered
    expect(summary.lowestHumidity).toBe(80);
    expect(summary.dailyMinimumHumidity).toEqual([{ startsAt: start, minimum: 80 }]);
    // under 85 %: 06–08 (3 h), 09 is 88 % and breaks it, 10–11 (2 h): the longest is 3 h from 06:00
    expect(summary.longestDryOutHours).toBe(3);
    expect(summary.longestDryOutStartsAt).toBe(start + 6 * hour);
  });

  it("weights the mean temperature by time and finds the CO2 peak", () => {
    expect(summary.meanTemperatureC).toBe(19.5); // (12 h × 18 + 12 h × 21) / 24 h = (216 + 252) / 24 = 19.5
    expect(summary.co2PeakPpm).toBe(1500);
    expect(summary.co2PeakAt).toBe(start + 7 * hour);
    expect(summaryInWords(summary)).toBe(
      "18 h a day above 90 % RH; driest 80 %; longest dry spell (under 85 % RH) 3 h; mean 19.5 °C; CO2 peak 1500 ppm",
    );
  });

  it("weights by time, not by reading, when the logger's readings are unevenly spaced", () => {
    // 20 °C at 00:00, 26 °C at 03:00, 20 °C at 04:00 and 05:00. Spacings 3 h, 1 h, 1 h: the usual interval is 1 h and 3 h
    // is over twice it, so 00:00 stands for 0–1 h and 1–3 h is a gap; 03:00 stands for 3–4 h, 04:00 for 4–5 h, 05:00 for 5–6 h.
    const uneven = [
      reading(start, 90, 20),
      reading(start + 3 * hour, 90, 26),
      reading(start + 4 * hour, 90, 20),
      reading(start + 5 * hour, 90, 20),
    ];
    const window = summariseWindow(uneven, start, start + 6 * hour);
    // covered 1 + 1 + 1 + 1 = 4 h of 6 h = 66.7 % < 80 %: no figures
    expect(window.coverage).toBeCloseTo(4 / 6, 12);
    expect(window.enough).toBe(false);
    expect(window.meanTemperatureC).toBeNull();
    // 03:00–06:00 is covered: (1 h × 26 + 2 h × 20) / 3 h = 66 / 3 = 22
    expect(summariseWindow(uneven, start + 3 * hour, start + 6 * hour).meanTemperatureC).toBe(22);
    // 03:30–05:00: (0.5 h × 26 + 1 h × 20) / 1.5 h = 33 / 1.5 = 22: the 03:00 reading stands for the first half hour, though the only reading taken inside says 20
    expect(summariseWindow(uneven, start + 3.5 * hour, start + 5 * hour).meanTemperatureC).toBeCloseTo(22, 12);
  });
});

describe("gaps in the log", () => {
  // Every 10 minutes from 00:00 to 00:50, then 01:20 to 01:50. The gap 00:50 → 01:20 is 30 min, over twice the usual
  // 10 min, so 00:50 stands for 10 min (to 01:00) and 01:00–01:20 is not covered.
  const times = [0, 10, 20, 30, 40, 50, 80, 90, 100, 110];
  const log = times.map((m) => reading(start + m * minute, 80, m < 60 ? 20 : 23));
  const window = summariseWindow(log, start, start + 120 * minute);

  it("says how much of the window the log covers and gives figures over covered time only", () => {
    expect(window.coverage).toBeCloseTo(100 / 120, 12); // 0–60 min (60) + 80–120 min (40) = 100 of 120
    expect(window.enough).toBe(true);
    expect(window.meanTemperatureC).toBeCloseTo(21.2, 12); // (60 × 20 + 40 × 23) / 100 = (1200 + 920) / 100 = 21.2
    expect(window.wetHoursPerDay).toBe(0);
    // 80 % throughout, but the gap breaks the spell: 0–60 min = 1 h, not 100 min
    expect(window.longestDryOutHours).toBe(1);
    expect(summaryInWords(window)).toContain("the log covers 83 % of the window");
  });

  it("gives no figure from a window the log barely covers", () => {
    // Without the 01:20 reading: 0–60 min + 90–120 min = 90 of 120 min = 75 % < 80 %.
    const thinner = summariseWindow(
      log.filter((r) => r.takenAt !== start + 80 * minute),
      start,
      start + 120 * minute,
    );
    expect(thinner.coverage).toBeCloseTo(0.75, 12);
    expect(thinner.enough).toBe(false);
    expect(thinner.wetHoursPerDay).toBeNull();
    expect(summaryInWords(thinner)).toBe("The log covers 75 % of this window; figures need at least 80 %.");
    const none = summariseWindow([], start, start + hour);
    expect(none.coverage).toBe(0);
    expect(summaryInWords(none)).toBe("The room's log has no readings in this window.");
  });
});

describe("window edges and days", () => {
  it("counts a reading taken before the window for the part it stands for inside it", () => {
    // Readings at −0:30, 0:30, 1:30, 2:30, 3:30 (usual 1 h); window 0:00–3:00.
    // Spans inside: [0, 0.5) 95 %, [0.5, 1.5) 80 %, [1.5, 2.5) 80 %, [2.5, 3) 95 %.
    const log = [-0.5, 0.5, 1.5, 2.5, 3.5].map((h, index) => reading(start + h * hour, index === 1 || index === 2 ? 80 : 95));
    const window = summariseWindow(log, start, start + 3 * hour);
    expect(window.coverage).toBe(1);
    expect(window.wetHoursPerDay).toBe(8); // 0.5 + 0.5 = 1 h wet of 3 h → 1/3 × 24 = 8 h a day
    expect(window.longestDryOutHours).toBe(2); // 0:30–2:30
    expect(window.lowestHumidity).toBe(80); // readings taken inside: 0:30, 1:30, 2:30
  });

  it("gives each 24 hours from the window's start its own minimum", () => {
    // Every 6 hours for two days: day 1 RH 95, 70, 92, 93; day 2 RH 94, 91, 75, 96.
    const rh = [95, 70, 92, 93, 94, 91, 75, 96];
    const log = rh.map((value, index) => reading(start + index * 6 * hour, value));
    const window = summariseWindow(log, start, start + 48 * hour);
    expect(window.dailyMinimumHumidity).toEqual([
      { startsAt: start, minimum: 70 },
      { startsAt: start + 24 * hour, minimum: 75 },
    ]);
    expect(window.lowestHumidity).toBe(70);
    // wet (> 90): 95, 92, 93, 94, 91, 96 = 6 readings × 6 h = 36 h of 48 h → 36/48 × 24 = 18 h a day
    expect(window.wetHoursPerDay).toBe(18);
  });
});
