import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { StatsInputError } from "./errors";
import { flushProfile, forecastRemaining, type FlushRecord } from "./flush-profile";

// t quantile for 2 degrees of freedom in closed form: (2p − 1)/√(2p(1 − p)).
const t975With2df = 0.95 / Math.sqrt(2 * 0.975 * 0.025);

describe("flushProfile", () => {
  it("reproduces the published split 648 / 420 / 259 g of 1327 g", () => {
    // Agarawal & Topwal 2018, Int J Chem Stud 6(6):1274–1276: 48.8 / 31.6 / 19.5 %, printed to
    // 0.1 % (420/1327 = 31.65 % is printed as 31.6, so compare within the printed digit).
    const records: FlushRecord[] = ["a", "b"].flatMap((blockId) => [
      { blockId, flush: 1, freshG: 648 },
      { blockId, flush: 2, freshG: 420 },
      { blockId, flush: 3, freshG: 259 },
    ]);
    const profile = flushProfile(records);
    [48.8, 31.6, 19.5].forEach((printed, i) => expect(Math.abs(profile[i].meanShare * 100 - printed)).toBeLessThan(0.1));
    expect(profile[0].meanShare).toBeCloseTo(648 / 1327, 15);
    // A block that gave the published first flush is expected to give the published rest.
    const rest = forecastRemaining({ flushesSoFar: [{ flush: 1, freshG: 648 }] }, profile);
    expect(rest.expectedRemainingG).toBeCloseTo(420 + 259, 9);
  });

  it("averages shares over blocks with t intervals (hand-checked, three blocks)", () => {
    // Shares by hand: A .6/.3/.1, B .4/.4/.2, C .5/.25/.25 → flush 1 mean .5, sd .1.
    const records: FlushRecord[] = [
      { blockId: "A", flush: 1, freshG: 600 },
      { blockId: "A", flush: 2, freshG: 300 },
      { blockId: "A", flush: 3, freshG: 100 },
      { blockId: "B", flush: 1, freshG: 400 },
      { blockId: "B", flush: 2, freshG: 250 },
      { blockId: "B", flush: 2, freshG: 150 },
      { blockId: "B", flush: 3, freshG: 200 },
      { blockId: "C", flush: 1, freshG: 500 },
      { blockId: "C", flush: 2, freshG: 250 },
      { blockId: "C", flush: 3, freshG: 250 },
    ];
    const [first, second, third] = flushProfile(records);
    expect(first.n).toBe(3);
    expect(first.meanShare).toBeCloseTo(0.5, 14);
    expect(first.upper - first.meanShare).toBeCloseTo((t975With2df * 0.1) / Math.sqrt(3), 12);
    expect(second.meanShare).toBeCloseTo(0.95 / 3, 14);
    expect(third.cumulativeShare).toBeCloseTo(1, 14);
    // Cumulative through flush 1 is the flush 1 share; its bounds are for one new block.
    expect(first.cumulativeUpper - first.cumulativeShare).toBeCloseTo(t975With2df * 0.1 * Math.sqrt(4 / 3), 12);

    // Forecast after flush 1 of 300 g: expected 300 × (1 − .5)/.5, bounds from the share's bounds.
    const rest = forecastRemaining({ flushesSoFar: [{ flush: 1, freshG: 300 }] }, [first, second, third]);
    expect(rest.expectedRemainingG).toBeCloseTo(300, 9);
    const upperShare = 0.5 + t975With2df * 0.1 * Math.sqrt(4 / 3);
    expect(rest.lower).toBeCloseTo((300 * (1 - upperShare)) / upperShare, 9);
    expect(rest.upper).toBeGreaterThan(rest.expectedRemainingG);
  });

  it("counts a missing flush of a finished block as a share of 0", () => {
    const profile = flushProfile([
      { blockId: "A", flush: 1, freshG: 500 },
      { blockId: "A", flush: 2, freshG: 500 },
      { blockId: "B", flush: 1, freshG: 800 },
    ]);
    expect(profile[1].meanShare).toBeCloseTo(0.25, 14);
    expect(profile[1].n).toBe(2);
    expect(profile[1].blocksFruiting).toBe(1);
  });

  it("has shares that add to 1 and intervals that contain them", () => {
    const record = fc.record({
      blockId: fc.constantFrom("A", "B", "C", "D", "E"),
      flush: fc.integer({ min: 1, max: 4 }),
      freshG: fc.double({ min: 1, max: 2000, noNaN: true }),
    });
    fc.assert(
      fc.property(fc.array(record, { minLength: 2, maxLength: 30 }), (records) => {
        fc.pre(new Set(records.map((r) => r.blockId)).size >= 2);
        const profile = flushProfile(records);
        const total = profile.reduce((sum, f) => sum + f.meanShare, 0);
        expect(total).toBeCloseTo(1, 12);
        for (const f of profile) {
          expect(f.lower).toBeLessThanOrEqual(f.meanShare + 1e-15);
          expect(f.upper).toBeGreaterThanOrEqual(f.meanShare - 1e-15);
          expect(f.cumulativeLower).toBeLessThanOrEqual(f.cumulativeShare + 1e-15);
        }
      }),
    );
  });
});

describe("forecastRemaining", () => {
  const profile = flushProfile([
    { blockId: "A", flush: 1, freshG: 500 },
    { blockId: "A", flush: 2, freshG: 300 },
    { blockId: "B", flush: 1, freshG: 520 },
    { blockId: "B", flush: 2, freshG: 280 },
    { blockId: "C", flush: 1, freshG: 480 },
    { blockId: "C", flush: 2, freshG: 320 },
  ]);

  it("expects nothing more after the profile's last flush", () => {
    const rest = forecastRemaining(
      {
        flushesSoFar: [
          { flush: 1, freshG: 400 },
          { flush: 2, freshG: 200 },
        ],
      },
      profile,
    );
    expect(rest).toEqual({ expectedRemainingG: 0, lower: 0, upper: 0 });
  });

  it("brackets the expected grams and scales with what was picked", () => {
    const small = forecastRemaining({ flushesSoFar: [{ flush: 1, freshG: 250 }] }, profile);
    const large = forecastRemaining({ flushesSoFar: [{ flush: 1, freshG: 500 }] }, profile);
    expect(small.lower).toBeLessThan(small.expectedRemainingG);
    expect(small.upper).toBeGreaterThan(small.expectedRemainingG);
    expect(large.expectedRemainingG).toBeCloseTo(2 * small.expectedRemainingG, 9);
    // Mean flush 1 share is 1500/2400 = 0.625, so 500 g picked → 300 g to come.
    expect(large.expectedRemainingG).toBeCloseTo(300, 9);
  });

  it("refuses a block that has given nothing yet", () => {
    expect(() => forecastRemaining({ flushesSoFar: [{ flush: 1, freshG: 0 }] }, profile)).toThrow(StatsInputError);
  });
});
