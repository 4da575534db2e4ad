import { describe, expect, it } from "vitest";
import {
  StatsInputError,
  biologicalEfficiency,
  blockedAnova,
  blockedAnovaFromCells,
  designEffect,
  factorialAnova,
  intraclassCorrelation,
  roomMeanAnalysis,
  roomsPerArm,
  describe as describeValues,
  dryMass,
  flushProfile,
  holm,
  massLoss,
  meanCI,
  metaAnalysis,
  oneWayAnova,
  sampleSizeTwoMeans,
  tukeyHsd,
  welchTest,
  wilsonInterval,
  type StatsInputErrorCode,
} from "./index";

function expectCode(run: () => unknown, code: StatsInputErrorCode): void {
  let caught: unknown;
  try {
    run();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(StatsInputError);
  expect((caught as StatsInputError).code).toBe(code);
  expect((caught as StatsInputError).message.length).toBeGreaterThan(20);
}

describe("invalid input throws StatsInputError, never NaN", () => {
  it("rejects empty groups", () => {
    expectCode(() => describeValues([]), "empty_group");
    expectCode(() => oneWayAnova([[1, 2], []]), "empty_group");
    expectCode(() => tukeyHsd({ a: [1, 2], b: [] }), "empty_group");
  });

  it("rejects a group of one where a spread is needed", () => {
    expectCode(() => describeValues([5]), "too_few_values");
    expectCode(() => meanCI([5]), "too_few_values");
    expectCode(() => welchTest([1, 2, 3], [4]), "too_few_values");
    expectCode(() => oneWayAnova([[1], [2]]), "too_few_values");
    expectCode(() => metaAnalysis([{ y: 1, v: 1 }]), "too_few_values");
    expectCode(() => flushProfile([{ blockId: "A", flush: 1, freshG: 10 }]), "too_few_values");
  });

  it("rejects NaN and infinities", () => {
    expectCode(() => describeValues([1, Number.NaN, 3]), "not_a_number");
    expectCode(() => welchTest([1, 2], [3, Number.POSITIVE_INFINITY]), "not_a_number");
    expectCode(() => blockedAnova([{ treatment: "a", block: "f", y: Number.NaN }]), "not_a_number");
    expectCode(() => factorialAnova([{ a: "strain", b: "method", block: "f", y: Number.POSITIVE_INFINITY }]), "not_a_number");
    expectCode(
      () =>
        metaAnalysis([
          { y: 1, v: 1 },
          { y: Number.NaN, v: 1 },
        ]),
      "not_a_number",
    );
    expectCode(() => biologicalEfficiency({ freshG: Number.NaN, wetBlockG: 2000, moisture: 0.6 }), "not_a_number");
  });

  it("rejects negative masses", () => {
    expectCode(() => dryMass(-1, 0.6), "negative_mass");
    expectCode(() => biologicalEfficiency({ freshG: -5, wetBlockG: 2000, moisture: 0.6 }), "negative_mass");
    expectCode(() => massLoss(2000, -1), "negative_mass");
    expectCode(
      () =>
        flushProfile([
          { blockId: "A", flush: 1, freshG: -1 },
          { blockId: "B", flush: 1, freshG: 1 },
        ]),
      "negative_mass",
    );
  });

  it("rejects moisture outside [0, 1)", () => {
    expectCode(() => dryMass(2000, 1), "moisture_out_of_range");
    expectCode(() => dryMass(2000, 60), "moisture_out_of_range");
    expectCode(() => dryMass(2000, -0.1), "moisture_out_of_range");
    expect(dryMass(2000, 0)).toBe(2000);
  });

  it("rejects levels, counts and p-values out of range", () => {
    expectCode(() => meanCI([1, 2, 3], 95), "invalid_level");
    expectCode(() => wilsonInterval(5, 3), "invalid_argument");
    expectCode(() => wilsonInterval(1.5, 3), "invalid_argument");
    expectCode(() => holm([0.5, 1.2]), "invalid_argument");
    expectCode(() => holm([Number.NaN]), "invalid_argument");
    expectCode(
      () =>
        metaAnalysis([
          { y: 1, v: 0 },
          { y: 2, v: 1 },
        ]),
      "invalid_argument",
    );
    expectCode(() => sampleSizeTwoMeans({ delta: 0, sd: 1 }), "invalid_argument");
    expectCode(() => sampleSizeTwoMeans({ delta: 1, sd: 1, power: 1 }), "invalid_level");
  });

  it("rejects impossible cell summaries and too little error for Tukey over 3 or more treatments", () => {
    const cell = { treatment: "a", block: "farm 1", n: 2, mean: 80, sumOfSquares: 4 };
    expectCode(() => blockedAnovaFromCells([{ ...cell, n: 1.5 }]), "invalid_argument");
    expectCode(() => blockedAnovaFromCells([{ ...cell, n: -1 }]), "invalid_argument");
    expectCode(() => blockedAnovaFromCells([{ ...cell, sumOfSquares: -0.1 }]), "invalid_argument");
    expectCode(() => blockedAnovaFromCells([{ ...cell, mean: Number.NaN }]), "not_a_number");
    // 3 treatments on 3 farms, 7 blocks in all (farm 2 lacks c, farm 3 lacks b): 2 error df, too few
    // for the studentized range, whose distribution function is unreliable below 3.
    const obs = [
      ["a", "farm 1", 70],
      ["b", "farm 1", 74],
      ["c", "farm 1", 77],
      ["a", "farm 2", 72],
      ["b", "farm 2", 75],
      ["a", "farm 3", 69],
      ["c", "farm 3", 78],
    ].map(([treatment, block, y]) => ({ treatment: String(treatment), block: String(block), y: Number(y) }));
    expectCode(() => blockedAnova(obs), "too_few_values");
  });

  it("rejects room designs that cannot give a number", () => {
    expectCode(() => designEffect(0, 0.05), "invalid_argument");
    expectCode(() => designEffect(6, 1.2), "invalid_argument");
    expectCode(() => roomsPerArm({ delta: 8, sd: 0, blocksPerRoom: 6, icc: 0.05 }), "invalid_argument");
    expectCode(
      () =>
        intraclassCorrelation([
          { room: "a", y: 1 },
          { room: "a", y: 2 },
        ]),
      "too_few_values",
    );
    expectCode(
      () =>
        intraclassCorrelation([
          { room: "a", y: 3 },
          { room: "a", y: 3 },
          { room: "b", y: 3 },
          { room: "b", y: 3 },
        ]),
      "no_variation",
    );
    expectCode(() => roomMeanAnalysis([{ farm: "f", room: "r", treatment: "t", y: Number.NaN }]), "not_a_number");
  });

  it("rejects data with no spread instead of dividing by zero", () => {
    expectCode(
      () =>
        oneWayAnova([
          [1, 1],
          [2, 2],
        ]),
      "no_variation",
    );
    expectCode(() => welchTest([3, 3], [3, 3]), "no_variation");
    expectCode(
      () =>
        blockedAnova([
          { treatment: "a", block: "farm 1", y: 1 },
          { treatment: "b", block: "farm 1", y: 2 },
        ]),
      "too_few_values",
    );
    expectCode(
      () =>
        blockedAnova([
          { treatment: "a", block: "farm 1", y: 1 },
          { treatment: "b", block: "farm 1", y: 2 },
          { treatment: "a", block: "farm 2", y: 3 },
          { treatment: "b", block: "farm 2", y: 4 },
          { treatment: "a", block: "farm 2", y: 3 },
        ]),
      "no_variation",
    );
  });
});
