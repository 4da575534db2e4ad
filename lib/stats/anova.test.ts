import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { oneWayAnova } from "./anova";

function readGroups(name: string): number[][] {
  const file = path.resolve(__dirname, "../../tests/fixtures/stats", name);
  const groups = new Map<string, number[]>();
  for (const line of readFileSync(file, "utf8").split("\n")) {
    if (line.trim() === "" || line.startsWith("#")) continue;
    const [group, value] = line.trim().split(/\s+/);
    groups.set(group, [...(groups.get(group) ?? []), Number(value)]);
  }
  return [...groups.values()];
}

function relativeError(actual: number, expected: number): number {
  return Math.abs(actual - expected) / Math.abs(expected);
}

describe("oneWayAnova", () => {
  it("reproduces NIST StRD SiRstv to at least 11 significant digits", () => {
    const groups = readGroups("SiRstv.dat");
    expect(groups.map((g) => g.length)).toEqual([5, 5, 5, 5, 5]);
    const r = oneWayAnova(groups);
    // NIST StRD SiRstv certified values
    expect(r.dfBetween).toBe(4);
    expect(r.dfWithin).toBe(20);
    expect(relativeError(r.ssBetween, 5.11462616e-2)).toBeLessThan(1e-11);
    expect(relativeError(r.ssWithin, 2.1663656e-1)).toBeLessThan(1e-11);
    expect(relativeError(r.f, 1.18046237440255)).toBeLessThan(1e-11);
    expect(relativeError(r.r2, 1.90999039051129e-1)).toBeLessThan(1e-11);
  });

  it("reproduces NIST StRD AtmWtAg to at least 9 significant digits", () => {
    const groups = readGroups("AtmWtAg.dat");
    expect(groups.map((g) => g.length)).toEqual([24, 24]);
    const r = oneWayAnova(groups);
    // NIST StRD AtmWtAg certified values
    expect(r.dfBetween).toBe(1);
    expect(r.dfWithin).toBe(46);
    expect(relativeError(r.ssBetween, 3.638341875e-9)).toBeLessThan(1e-9);
    expect(relativeError(r.ssWithin, 1.04951729166667e-8)).toBeLessThan(1e-9);
    expect(relativeError(r.msWithin, 2.28155932971014e-10)).toBeLessThan(1e-9);
    expect(relativeError(r.f, 1.5946733567793e1)).toBeLessThan(1e-9);
    expect(relativeError(r.r2, 2.57426544538321e-1)).toBeLessThan(1e-9);
  });

  it("matches R anova(lm(weight ~ group, PlantGrowth))", () => {
    const r = oneWayAnova([
      [4.17, 5.58, 5.18, 6.11, 4.5, 4.61, 5.17, 4.53, 5.33, 5.14], // ctrl
      [4.81, 4.17, 4.41, 3.59, 5.87, 3.83, 6.03, 4.89, 4.32, 4.69], // trt1
      [6.31, 5.12, 5.54, 5.5, 5.37, 5.29, 4.92, 6.15, 5.8, 5.26], // trt2
    ]);
    expect([r.dfBetween, r.dfWithin]).toEqual([2, 27]);
    expect(r.f).toBeCloseTo(4.84608786238014, 12); // R
    expect(r.p).toBeCloseTo(0.0159099583256229, 14); // R
    expect(r.r2).toBeCloseTo(0.26414829683212, 13); // R
  });

  it("keeps a tiny upper tail instead of rounding it to 0", () => {
    // By hand: two groups 1e-3 apart with no overlap give an enormous F; the tail must stay positive.
    const r = oneWayAnova([
      [0, 0.001, 0.002, 0.001],
      [10, 10.001, 10.002, 10.001],
    ]);
    expect(r.p).toBeGreaterThan(0);
    expect(r.p).toBeLessThan(1e-16);
  });
});
