import { describe, expect, it } from "vitest";
import { readResultsAddress, resultsAddress } from "./results-address";

const species = "6f1c2f0e-3b7a-4c1e-9d3f-2a5b8c7d9e10";

describe("a Co-op results address", () => {
  it("reads every filter, a season written either way, and defaults the flushes to all", () => {
    expect(readResultsAddress({ species, window: "1-2", season: "2026/27" })).toEqual({
      ok: true,
      selection: { species, window: "1-2", season: 2026 },
    });
    expect(readResultsAddress({ recipe: "", season: "" })).toEqual({ ok: true, selection: { window: "all" } });
  });

  it("refuses what names nothing, each problem saying what to write instead", () => {
    const reading = readResultsAddress({ species: "oyster", window: "7", season: "spring" });
    if (reading.ok) throw new Error("should be refused");
    expect(reading.problems.map((problem) => problem.field)).toEqual(["species", "window", "season"]);
    expect(reading.problems[2].message).toMatch(/such as 2026\/27/);
  });

  it("writes only what differs from the defaults, so one view has one address and reads back the same", () => {
    expect(resultsAddress("/results", { window: "all" })).toBe("/results");
    const selection = { species, method: species, window: "1" as const, season: 2025 };
    const address = resultsAddress("/results", selection);
    expect(address).toBe(`/results?species=${species}&method=${species}&window=1&season=2025`);
    expect(readResultsAddress(Object.fromEntries(new URL(address, "http://x").searchParams))).toEqual({ ok: true, selection });
  });
});
