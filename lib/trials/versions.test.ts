import { describe, expect, it } from "vitest";
import {
  amendmentLine,
  amendmentReasonProblem,
  analysisFingerprint,
  analysisInputCounts,
  farmsChangedBetween,
  type AnalysisInputs,
} from "./versions";

// Invented blocks: 2500 g wet at 60 % moisture is 1000 g of dry substrate.
const inputs: AnalysisInputs = {
  outcome: { flushes: 2, contaminatedHandling: "exclude" },
  minimumFarms: 3,
  showPerFarmEstimates: false,
  arms: [
    { id: "arm-a", label: "A", isReference: true },
    { id: "arm-b", label: "B", isReference: false },
  ],
  enrolments: [{ status: "accepted" }, { status: "accepted" }, { status: "declined" }],
  assignedByArm: { "arm-a": 4, "arm-b": 4 },
  blockRows: [
    { id: "b1", farmId: "f1", armId: "arm-a", wetMassG: 2500, moisture: 0.6, contaminated: false, spentMassG: null },
    { id: "b2", farmId: "f1", armId: "arm-b", wetMassG: 2500, moisture: 0.6, contaminated: false, spentMassG: 1400 },
    { id: "b3", farmId: "f2", armId: "arm-b", wetMassG: 2400, moisture: 0.62, contaminated: true, spentMassG: null },
    { id: "b4", farmId: "f2", armId: "arm-a", wetMassG: 2500, moisture: 0.6, contaminated: false, spentMassG: null },
  ],
  harvestRows: [
    { blockId: "b1", flush: 1, freshMassG: 500 },
    { blockId: "b1", flush: 2, freshMassG: 200 },
    { blockId: "b2", flush: 1, freshMassG: 610 },
    { blockId: "b4", flush: 1, freshMassG: 480 },
  ],
};

describe("analysisFingerprint", () => {
  it("is the same for the same values, whatever order the rows come in", () => {
    const shuffled: AnalysisInputs = {
      ...inputs,
      arms: [...inputs.arms].reverse(),
      enrolments: [...inputs.enrolments].reverse(),
      assignedByArm: { "arm-b": 4, "arm-a": 4 },
      blockRows: [...inputs.blockRows].reverse(),
      harvestRows: [...inputs.harvestRows].reverse(),
    };
    expect(analysisFingerprint(inputs)).toMatch(/^[0-9a-f]{32}$/);
    expect(analysisFingerprint(shuffled)).toBe(analysisFingerprint(inputs));
    expect(analysisFingerprint(structuredClone(inputs))).toBe(analysisFingerprint(inputs));
  });

  it("changes with any analysed value", () => {
    const base = analysisFingerprint(inputs);
    const withBlock = (index: number, change: Partial<AnalysisInputs["blockRows"][number]>): AnalysisInputs => ({
      ...inputs,
      blockRows: inputs.blockRows.map((row, at) => (at === index ? { ...row, ...change } : row)),
    });
    const withHarvest = (index: number, change: Partial<AnalysisInputs["harvestRows"][number]>): AnalysisInputs => ({
      ...inputs,
      harvestRows: inputs.harvestRows.map((row, at) => (at === index ? { ...row, ...change } : row)),
    });
    const variants: [string, AnalysisInputs][] = [
      ["a fresh mass by 0.1 g", withHarvest(0, { freshMassG: 500.1 })],
      ["a flush number", withHarvest(1, { flush: 3 })],
      ["a harvest moved to another block", withHarvest(3, { blockId: "b1" })],
      ["a harvest added", { ...inputs, harvestRows: [...inputs.harvestRows, { blockId: "b4", flush: 2, freshMassG: 190 }] }],
      ["a harvest removed", { ...inputs, harvestRows: inputs.harvestRows.slice(1) }],
      ["a wet mass", withBlock(0, { wetMassG: 2501 })],
      ["a moisture", withBlock(0, { moisture: 0.61 })],
      ["a wet mass recorded as missing", withBlock(3, { wetMassG: null })],
      ["a contamination mark", withBlock(1, { contaminated: true })],
      ["a spent mass", withBlock(1, { spentMassG: 1401 })],
      ["a block marked spent", withBlock(0, { spentMassG: 1500 })],
      ["a block's arm", withBlock(0, { armId: "arm-b" })],
      ["a block's farm", withBlock(0, { farmId: "f2" })],
      ["a block added", { ...inputs, blockRows: [...inputs.blockRows, { ...inputs.blockRows[0], id: "b5" }] }],
      ["the outcome's flushes", { ...inputs, outcome: { ...inputs.outcome, flushes: 3 } }],
      ["contaminated blocks at 0 %", { ...inputs, outcome: { ...inputs.outcome, contaminatedHandling: "count_as_zero" } }],
      ["the co-op's minimum farms", { ...inputs, minimumFarms: 4 }],
      ["per-farm estimates shown", { ...inputs, showPerFarmEstimates: true }],
      ["a farm's answer", { ...inputs, enrolments: [{ status: "accepted" }, { status: "accepted" }, { status: "dropped" }] }],
      ["the listed blocks", { ...inputs, assignedByArm: { "arm-a": 4, "arm-b": 5 } }],
      ["the reference arm", { ...inputs, arms: inputs.arms.map((arm) => ({ ...arm, isReference: !arm.isReference })) }],
    ];
    const seen = new Set([base]);
    for (const [what, variant] of variants) {
      const fingerprint = analysisFingerprint(variant);
      expect(fingerprint, what).not.toBe(base);
      seen.add(fingerprint);
    }
    expect(seen.size).toBe(variants.length + 1);
  });
});

describe("analysisInputCounts", () => {
  it("counts farms, blocks, harvests, and the blocks compared and left out", () => {
    // b1 is through flush 2; b2 gave flush 1 only but is marked spent; b3 is contaminated (left out); b4 is unfinished.
    const counts = analysisInputCounts(inputs);
    expect(counts).toMatchObject({ farms: 2, blocks: 4, harvests: 4, compared: 2, leftOut: 2 });
    expect(counts.farmFingerprints).toHaveLength(2);
    expect(counts.farmFingerprints.every((fingerprint) => /^[0-9a-f]{32}$/.test(fingerprint))).toBe(true);
    // No farm id is stored beside them, and they come sorted, not in farm order.
    expect([...counts.farmFingerprints].sort()).toEqual(counts.farmFingerprints);
  });
});

describe("farmsChangedBetween", () => {
  const farmPrints = (change: Partial<AnalysisInputs>) => analysisInputCounts({ ...inputs, ...change }).farmFingerprints;
  const before = farmPrints({});

  it("counts the farms whose records changed, were added or are gone", () => {
    expect(farmsChangedBetween(before, farmPrints({ harvestRows: [...inputs.harvestRows].reverse() }))).toBe(0);
    // Farm f2's unfinished block gets its flush 2.
    const f2Late = farmPrints({ harvestRows: [...inputs.harvestRows, { blockId: "b4", flush: 2, freshMassG: 190 }] });
    expect(farmsChangedBetween(before, f2Late)).toBe(1);
    // Both farms change.
    const bothLate = farmPrints({
      harvestRows: [...inputs.harvestRows, { blockId: "b4", flush: 2, freshMassG: 190 }, { blockId: "b2", flush: 2, freshMassG: 200 }],
    });
    expect(farmsChangedBetween(before, bothLate)).toBe(2);
    // A third farm's first block; and a farm gone.
    const third = farmPrints({ blockRows: [...inputs.blockRows, { ...inputs.blockRows[0], id: "b9", farmId: "f3" }] });
    expect(farmsChangedBetween(before, third)).toBe(1);
    expect(farmsChangedBetween(third, before)).toBe(1);
  });
});

describe("amendmentReasonProblem", () => {
  it("asks for a reason a reader can weigh", () => {
    expect(amendmentReasonProblem("   fix  ")).toMatch(/at least 10 characters/);
    expect(amendmentReasonProblem("x".repeat(1001))).toMatch(/under 1000/);
    expect(amendmentReasonProblem("Flush 2 of Fernbrook's blocks arrived after publication")).toBeNull();
  });
});

describe("amendmentLine", () => {
  it("says when and why, and which analysis stays readable below", () => {
    const amendment = { publishedAt: new Date("2027-03-02T09:30:00Z"), reason: "Flush 2 records of two farms arrived late" };
    expect(amendmentLine(amendment, { version: 1, ranAt: new Date("2027-02-10T16:00:00Z") })).toBe(
      "Amended on 2027-03-02: Flush 2 records of two farms arrived late. The original analysis of 2027-02-10 is below.",
    );
    expect(
      amendmentLine({ ...amendment, reason: "A wet mass was entered in pounds!" }, { version: 2, ranAt: new Date("2027-03-01") }),
    ).toBe("Amended on 2027-03-02: A wet mass was entered in pounds! Version 2, the analysis of 2027-03-01, is below.");
  });
});
