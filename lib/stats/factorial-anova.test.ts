import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { StatsInputError } from "./errors";
import { factorialAnova, type FactorialObservation } from "./factorial-anova";

// Montgomery, Design and Analysis of Experiments, Example 5.6 (Table 5.21): intensity at which a
// radar target is detected, by ground clutter (low, medium, high) × filter type (1, 2), run as a
// randomised complete block design with the four operators as blocks.
const radarTable: Record<string, [number, number][]> = {
  // [filter 1, filter 2] for operators 1–4
  Low: [
    [90, 86],
    [96, 84],
    [100, 92],
    [92, 81],
  ],
  Medium: [
    [102, 87],
    [106, 90],
    [105, 97],
    [96, 80],
  ],
  High: [
    [114, 93],
    [112, 91],
    [108, 95],
    [98, 83],
  ],
};
const radar: FactorialObservation[] = Object.entries(radarTable).flatMap(([clutter, operators]) =>
  operators.flatMap(([first, second], operator) => [
    { a: clutter, b: "filter 1", block: `operator ${operator + 1}`, y: first },
    { a: clutter, b: "filter 2", block: `operator ${operator + 1}`, y: second },
  ]),
);
// The same without four runs (R rows 2, 11, 19, 20: Low/filter 2/operator 1, Medium/filter 1/operator 2,
// High/filter 2/operator 2, High/filter 1/operator 3): unequal cells, blocks lacking combinations.
const dropped = new Set([1, 10, 18, 19]);
const radarUnbalanced = radar.filter((_, index) => !dropped.has(index));

function expectTerm(term: { ss: number; df: number; f: number; p: number }, ss: number, df: number, f: number, p: number) {
  expect(term.df).toBe(df);
  expect(term.ss).toBeCloseTo(ss, 9);
  expect(term.f).toBeCloseTo(f, 9);
  expect(term.p).toBeCloseTo(p, 12);
}

describe("factorialAnova on Montgomery Ex. 5.6 (a factorial in randomised complete blocks)", () => {
  it("gives the book's analysis of variance — docs/references.md", () => {
    const r = factorialAnova(radar);
    // Montgomery Table 5.22: clutter 335.58 (2), filter 1066.67 (1), clutter × filter 77.08 (2), blocks 402.17 (3),
    // error 166.33 (15); F 15.13, 96.19, 3.48. Full digits: R 4.2.2 car::Anova(type = 2) (equal to type I here).
    expectTerm(r.a, 335.58333333333269, 2, 15.131513026052101, 2.527013449431761e-4);
    expectTerm(r.b, 1066.66666666666697, 1, 96.192384769539274, 6.446792668880087e-8);
    expectTerm(r.interaction, 77.08333333333312, 2, 3.475701402805608, 5.750655478744739e-2);
    expectTerm(r.block, 402.1666666666664, 3, 12.089178356713441, 2.771485095955294e-4);
    expect(r.residual.df).toBe(15);
    expect(r.residual.ss).toBeCloseTo(166.33333333333303, 9);
  });

  it("gives emmeans' cell means, marginal comparisons and simple effects", () => {
    const r = factorialAnova(radar);
    // R 4.2.2, emmeans 1.8.4.1: emmeans(fit, ~ clutter * filter); balanced, so the cell means are the raw ones.
    const low1 = r.cellMeans.find((cell) => cell.a === "Low" && cell.b === "filter 1")!;
    expect(low1.estimate).toBeCloseTo(94.5, 12);
    expect(low1.lower).toBeCloseTo(90.95113828462937, 10);
    expect(low1.upper).toBeCloseTo(98.04886171537063, 10);
    expect(r.cellMeans.map((cell) => `${cell.a}/${cell.b}`)).toEqual([
      "Low/filter 1",
      "Low/filter 2",
      "Medium/filter 1",
      "Medium/filter 2",
      "High/filter 1",
      "High/filter 2",
    ]);
    // pairs(emmeans(fit, "clutter")): averaged over filters, Tukey over 3 levels.
    const [lowMedium, lowHigh, mediumHigh] = r.aComparisons;
    expect(lowMedium).toMatchObject({ a: "Low", b: "Medium" });
    expect(lowMedium.difference).toBeCloseTo(-5.25, 12);
    expect(lowMedium.se).toBeCloseTo(1.66499916583229, 12);
    expect(lowMedium.lower).toBeCloseTo(-9.574785763690695, 6);
    expect(lowMedium.pAdjusted).toBeCloseTo(0.0169957240292620826, 10);
    expect(lowHigh.difference).toBeCloseTo(-9.125, 12);
    expect(mediumHigh.upper).toBeCloseTo(0.4497857636906963, 6);
    // pairs(emmeans(fit, "filter")): two levels, so Tukey is the t interval.
    expect(r.bComparisons[0].difference).toBeCloseTo(13.33333333333333, 12);
    expect(r.bComparisons[0].lower).toBeCloseTo(10.4356998765479, 10);
    expect(r.bComparisons[0].pAdjusted).toBeCloseTo(6.446792668880099e-8, 16);
    // pairs(emmeans(fit, ~ filter | clutter)): filter 1 − filter 2 within each clutter level.
    const within = r.bWithinA.map((group) => [
      group.a,
      group.comparisons[0].difference,
      group.comparisons[0].lower,
      group.comparisons[0].pAdjusted,
    ]);
    const expected = [
      ["Low", 8.75, 3.731151631136204, 2.070013224259453e-3],
      ["Medium", 13.75, 8.731151631136196, 3.256692280082267e-5],
      ["High", 17.5, 12.481151631136196, 2.106842077974602e-6],
    ] as const;
    within.forEach(([name, difference, lower, p], index) => {
      expect(name).toBe(expected[index][0]);
      expect(difference).toBeCloseTo(expected[index][1], 12);
      expect(lower).toBeCloseTo(expected[index][2], 10);
      expect(p).toBeCloseTo(expected[index][3], 12);
    });
    // pairs(emmeans(fit, ~ clutter | filter)), filter 1: Low − High −13.5 (SE 2.354664401659914), p 0.000110712263259205.
    const filterOne = r.aWithinB.find((group) => group.b === "filter 1")!.comparisons;
    expect(filterOne[1]).toMatchObject({ a: "Low", b: "High" });
    expect(filterOne[1].difference).toBeCloseTo(-13.5, 12);
    expect(filterOne[1].se).toBeCloseTo(2.354664401659914, 12);
    expect(filterOne[1].upper).toBeCloseTo(-7.3838293186305357, 6);
    expect(filterOne[1].pAdjusted).toBeCloseTo(0.000110712263259205, 12);
  });
});

describe("factorialAnova on unbalanced data (Ex. 5.6 without four runs)", () => {
  it("gives type II sums of squares as car::Anova and statsmodels anova_lm(typ = 2)", () => {
    const r = factorialAnova(radarUnbalanced);
    // R 4.2.2, car 3.1.1: Anova(lm(y ~ clutter * filter + operator), type = 2).
    expectTerm(r.a, 218.47576307251117, 2, 8.300021140274351, 6.348281230670597e-3);
    expectTerm(r.b, 725.79197311817336, 1, 55.146517266749662, 1.316110793535994e-5);
    expectTerm(r.interaction, 48.30059641275264, 2, 1.83496771301195, 2.052601568383673e-1);
    expectTerm(r.block, 383.22727272727275, 3, 9.70601779173206, 2.006412320383084e-3);
    expect(r.residual.df).toBe(11);
    expect(r.residual.ss).toBeCloseTo(144.77272727272751, 9);
    // statsmodels 0.13.5, sm.stats.anova_lm(ols("y ~ C(clutter) * C(filter) + C(operator)"), typ=2).
    expect(r.a.ss).toBeCloseTo(218.47576307251063, 9);
    expect(r.b.ss).toBeCloseTo(725.7919731181645, 9);
    expect(r.interaction.ss).toBeCloseTo(48.300596412753436, 9);
    expect(r.block.ss).toBeCloseTo(383.22727272731123, 9);
  });

  it("gives emmeans' least-squares cell means and comparisons", () => {
    const r = factorialAnova(radarUnbalanced);
    // R 4.2.2, emmeans 1.8.4.1.
    const medium1 = r.cellMeans.find((cell) => cell.a === "Medium" && cell.b === "filter 1")!;
    expect(medium1.estimate).toBeCloseTo(101.11363636363635, 10);
    expect(medium1.lower).toBeCloseTo(96.30698628050777, 9);
    expect(medium1.upper).toBeCloseTo(105.92028644676492, 9);
    const high2 = r.cellMeans.find((cell) => cell.a === "High" && cell.b === "filter 2")!;
    expect(high2.estimate).toBeCloseTo(90.44696969696967, 10);
    const [lowMedium, lowHigh] = r.aComparisons;
    expect(lowMedium.difference).toBeCloseTo(-4.568181818181818, 10);
    expect(lowMedium.se).toBeCloseTo(2.017750607479231, 10);
    expect(lowMedium.pAdjusted).toBeCloseTo(0.10377647390659872, 10);
    expect(lowHigh.lower).toBeCloseTo(-14.23464029611897, 6);
    expect(r.bComparisons[0].difference).toBeCloseTo(12.489898989899, 10);
    expect(r.bComparisons[0].upper).toBeCloseTo(16.16256110402053, 9);
    const high = r.bWithinA.find((group) => group.a === "High")!.comparisons[0];
    expect(high.difference).toBeCloseTo(16.333333333333339, 10);
    expect(high.se).toBeCloseTo(2.962111524435839, 10);
    expect(high.lower).toBeCloseTo(9.813769825513635, 9);
    expect(high.pAdjusted).toBeCloseTo(0.0001823304413630686, 12);
    const filterTwo = r.aWithinB.find((group) => group.b === "filter 2")!.comparisons;
    expect(filterTwo[0].difference).toBeCloseTo(-2.522727272727276, 10);
    expect(filterTwo[0].se).toBeCloseTo(2.81542286972791, 10);
    expect(filterTwo[0].pAdjusted).toBeCloseTo(0.653775421765335873, 10);
  });

  it("refuses a missing combination, one block, and a single level", () => {
    const withoutHigh2 = radar.filter((o) => !(o.a === "High" && o.b === "filter 2"));
    expect(() => factorialAnova(withoutHigh2)).toThrow(/No block has High with filter 2/);
    const codes = [
      () => factorialAnova(withoutHigh2),
      () => factorialAnova(radar.filter((o) => o.block === "operator 1").concat(radar.filter((o) => o.block === "operator 1"))),
      () => factorialAnova(radar.filter((o) => o.b === "filter 1")),
      () => factorialAnova([{ a: "x", b: "y", block: "z", y: Number.NaN }]),
    ].map((run) => {
      try {
        run();
        return "none";
      } catch (error) {
        return error instanceof StatsInputError ? error.code : "other";
      }
    });
    expect(codes).toEqual(["not_estimable", "too_few_values", "too_few_values", "not_a_number"]);
  });
});

// Random 2–3 × 2–3 designs on 2–5 blocks, every combination on block 0, the rest at random.
const factorialDesigns = fc
  .record({
    a: fc.integer({ min: 2, max: 3 }),
    b: fc.integer({ min: 2, max: 3 }),
    blocks: fc.integer({ min: 2, max: 5 }),
    seed: fc.integer({ min: 1, max: 1_000_000 }),
  })
  .map(({ a, b, blocks, seed }) => {
    const random = seededRandom(seed);
    const obs: FactorialObservation[] = [];
    for (let block = 0; block < blocks; block++) {
      const offset = 30 * random.next();
      for (let i = 0; i < a; i++) {
        for (let j = 0; j < b; j++) {
          const count = block === 0 ? 2 : random.integer(0, 3);
          for (let k = 0; k < count; k++) {
            obs.push({ a: `a${i}`, b: `b${j}`, block: `block ${block}`, y: 50 + offset + 4 * i - 3 * j + 2 * i * j + random.normal(0, 4) });
          }
        }
      }
    }
    return obs;
  })
  .filter((obs) => obs.length - new Set(obs.map((o) => `${o.a}|${o.b}`)).size - new Set(obs.map((o) => o.block)).size + 1 >= 3);

describe("factorialAnova properties", () => {
  it("leaves the interaction unchanged when additive effects of a and b are added", { timeout: 30_000 }, () => {
    fc.assert(
      fc.property(
        factorialDesigns,
        fc.double({ min: -20, max: 20, noNaN: true }),
        fc.double({ min: -20, max: 20, noNaN: true }),
        (obs, shiftA, shiftB) => {
          const shifted = obs.map((o) => ({ ...o, y: o.y + (o.a === "a1" ? shiftA : 0) + (o.b === "b0" ? shiftB : 0) }));
          const before = factorialAnova(obs);
          const after = factorialAnova(shifted);
          expect(after.interaction.ss).toBeCloseTo(before.interaction.ss, 6);
          expect(after.residual.ss).toBeCloseTo(before.residual.ss, 6);
          // Within each level of a, b0 − b1 moves by exactly the shift given to b0; shifting a1 moves nothing there.
          after.bWithinA.forEach((group, index) => {
            expect(group.comparisons[0]).toMatchObject({ a: "b0", b: "b1" });
            expect(group.comparisons[0].difference).toBeCloseTo(before.bWithinA[index].comparisons[0].difference + shiftB, 6);
          });
        },
      ),
      { numRuns: 15 },
    );
  });

  it(
    "makes the marginal comparison the average of the simple effects, and every interval contain its estimate",
    { timeout: 30_000 },
    () => {
      fc.assert(
        fc.property(factorialDesigns, (obs) => {
          const r = factorialAnova(obs);
          r.aComparisons.forEach((pair, index) => {
            const mean = r.aWithinB.reduce((sum, group) => sum + group.comparisons[index].difference, 0) / r.aWithinB.length;
            expect(pair.difference).toBeCloseTo(mean, 8);
          });
          for (const pair of [...r.aComparisons, ...r.bComparisons, ...r.aWithinB.flatMap((group) => group.comparisons)]) {
            expect(pair.lower).toBeLessThan(pair.difference);
            expect(pair.upper).toBeGreaterThan(pair.difference);
          }
          for (const cell of r.cellMeans) expect(cell.lower < cell.estimate && cell.estimate < cell.upper).toBe(true);
        }),
        { numRuns: 15 },
      );
    },
  );
});
