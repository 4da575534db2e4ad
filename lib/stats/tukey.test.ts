import { describe, expect, it } from "vitest";
import { tukeyHsd } from "./tukey";

// R's PlantGrowth data.
const plantGrowth = {
  ctrl: [4.17, 5.58, 5.18, 6.11, 4.5, 4.61, 5.17, 4.53, 5.33, 5.14],
  trt1: [4.81, 4.17, 4.41, 3.59, 5.87, 3.83, 6.03, 4.89, 4.32, 4.69],
  trt2: [6.31, 5.12, 5.54, 5.5, 5.37, 5.29, 4.92, 6.15, 5.8, 5.26],
};

describe("tukeyHsd", () => {
  it("matches R TukeyHSD(aov(weight ~ group, PlantGrowth))", () => {
    const rows = tukeyHsd(plantGrowth);
    expect(rows.map((r) => `${r.a}-${r.b}`)).toEqual(["trt1-ctrl", "trt2-ctrl", "trt2-trt1"]);
    // R TukeyHSD: diff, lwr, upr, p adj
    const expected = [
      [-0.371, -1.062216051410459, 0.320216051410458, 0.390871144202125],
      [0.494, -0.197216051410459, 1.185216051410458, 0.197995991299708],
      [0.865, 0.173783948589542, 1.556216051410459, 0.012006423979453],
    ];
    rows.forEach((row, i) => {
      const [diff, lower, upper, p] = expected[i];
      expect(row.diff).toBeCloseTo(diff, 13);
      expect(row.lower).toBeCloseTo(lower, 9);
      expect(row.upper).toBeCloseTo(upper, 9);
      expect(row.pAdj).toBeCloseTo(p, 9);
    });
  });

  it("uses Tukey–Kramer widths for unequal group sizes", () => {
    // Dropping values changes each pair's width by √((1/nᵢ + 1/nⱼ)/2): the smaller pair is wider.
    const rows = tukeyHsd({ ...plantGrowth, trt2: plantGrowth.trt2.slice(0, 4) });
    const width = (i: number) => rows[i].upper - rows[i].lower;
    expect(width(1) / width(0)).toBeCloseTo(Math.sqrt((1 / 10 + 1 / 4) / (1 / 10 + 1 / 10)), 12);
  });
});
