import { describe, expect, it } from "vitest";
import { daysBetween, flushTrail } from "./flush-trail";

// A 2.5 kg block at 62 % moisture has 0.95 kg dry substrate; 0.80 kg picked gives BE 84.210 526 3 %
// (computed; docs/references.md, "Trade arithmetic"). Here 500 g, then 300 g.
describe("a block's flushes, one after another", () => {
  const block = { wetMassG: 2500, moisture: 0.62, inoculatedOn: "2026-02-20" };
  const harvests = [
    { flush: 2, harvestedOn: "2026-04-20", freshMassG: 300 },
    { flush: 1, harvestedOn: "2026-04-03", freshMassG: 500 },
  ];

  it("adds up the fresh mass and the biological efficiency flush by flush", () => {
    const trail = flushTrail(block, harvests);
    expect(trail.map((point) => point.flush)).toEqual([1, 2]);
    expect(trail.map((point) => point.cumulativeFreshG)).toEqual([500, 800]);
    expect(trail[0].cumulativeEfficiency).toBeCloseTo((100 * 500) / 950, 9);
    expect(trail[1].cumulativeEfficiency).toBeCloseTo(84.2105263, 6);
  });

  it("gives each flush's part of the block's yield", () => {
    expect(flushTrail(block, harvests).map((point) => point.share)).toEqual([0.625, 0.375]);
  });

  it("has no efficiency without the weighings dry substrate needs", () => {
    expect(flushTrail({ ...block, wetMassG: null }, harvests)[1].cumulativeEfficiency).toBeNull();
    expect(flushTrail({ ...block, moisture: null }, harvests)[1].cumulativeEfficiency).toBeNull();
    expect(flushTrail(block, [])).toEqual([]);
  });
});

// Calendar facts (common practice): 2026 is not a leap year, so 20 February to 3 April is 8 + 31 + 3 = 42 days;
// 2028 is, so 28 February to 1 March 2028 is 2 days. Daylight saving (29 March 2026 in Europe) changes nothing.
describe("days from inoculation", () => {
  it("counts calendar days", () => {
    expect(daysBetween("2026-02-20", "2026-04-03")).toBe(42);
    expect(daysBetween("2028-02-28", "2028-03-01")).toBe(2);
    expect(
      flushTrail({ wetMassG: 2500, moisture: 0.62, inoculatedOn: "2026-02-20" }, [
        { flush: 1, harvestedOn: "2026-04-03", freshMassG: 500 },
      ])[0].day,
    ).toBe(42);
    expect(
      flushTrail({ wetMassG: 2500, moisture: 0.62, inoculatedOn: null }, [{ flush: 1, harvestedOn: "2026-04-03", freshMassG: 500 }])[0].day,
    ).toBeNull();
  });
});
