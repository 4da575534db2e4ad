import { describe, expect, it } from "vitest";
import { classifyTrialBlock, incompleteCounts, trialOutcomeRecords, type TrialBlockRecord } from "./outcome";

// Invented blocks: 2500 g wet at 60 % moisture is 1000 g of dry substrate, so 1 g fresh is 0.1 BE point.
const finished: TrialBlockRecord = {
  wetMassG: 2500,
  moisture: 0.6,
  contaminated: false,
  spentMassG: null,
  harvests: [
    { flush: 1, freshMassG: 500 },
    { flush: 2, freshMassG: 200 },
    { flush: 3, freshMassG: 100 },
  ],
};
const excludeContaminated = { flushes: 2, contaminatedHandling: "exclude" } as const;
const contaminatedAsZero = { flushes: 2, contaminatedHandling: "count_as_zero" } as const;

describe("classifyTrialBlock", () => {
  it("counts a finished block with its BE over flushes 1..k only", () => {
    expect(classifyTrialBlock(finished, excludeContaminated)).toEqual({ counted: true, value: 70, countedAsZero: false });
    expect(classifyTrialBlock(finished, { ...excludeContaminated, flushes: 1 })).toEqual({
      counted: true,
      value: 50,
      countedAsZero: false,
    });
  });

  it("leaves a contaminated block out, or counts it as 0 %, as the protocol declares, whatever was harvested or weighed", () => {
    const contaminated = { ...finished, contaminated: true };
    expect(classifyTrialBlock(contaminated, excludeContaminated)).toEqual({ counted: false, reason: "contaminated" });
    expect(classifyTrialBlock(contaminated, contaminatedAsZero)).toEqual({ counted: true, value: 0, countedAsZero: true });
    const contaminatedEarly = { ...contaminated, wetMassG: null, harvests: [] };
    expect(classifyTrialBlock(contaminatedEarly, contaminatedAsZero)).toEqual({ counted: true, value: 0, countedAsZero: true });
    expect(classifyTrialBlock(contaminatedEarly, excludeContaminated)).toEqual({ counted: false, reason: "contaminated" });
  });

  it("reports a block without wet mass or moisture as lost, under either protocol", () => {
    for (const protocol of [excludeContaminated, contaminatedAsZero]) {
      expect(classifyTrialBlock({ ...finished, wetMassG: null }, protocol)).toEqual({ counted: false, reason: "lost" });
      expect(classifyTrialBlock({ ...finished, moisture: null }, protocol)).toEqual({ counted: false, reason: "lost" });
      expect(classifyTrialBlock({ ...finished, wetMassG: 0 }, protocol)).toEqual({ counted: false, reason: "lost" });
    }
  });

  it("leaves out a block not yet through the outcome's last flush and not spent, never as a partial BE", () => {
    const onlyFlushOne = { ...finished, harvests: [{ flush: 1, freshMassG: 500 }] };
    expect(classifyTrialBlock(onlyFlushOne, excludeContaminated)).toEqual({ counted: false, reason: "unfinished" });
    expect(classifyTrialBlock(onlyFlushOne, contaminatedAsZero)).toEqual({ counted: false, reason: "unfinished" });
    // Still colonising: no harvest, not spent. Before this rule it counted as 0 %.
    const colonising = { ...finished, harvests: [] };
    expect(classifyTrialBlock(colonising, contaminatedAsZero)).toEqual({ counted: false, reason: "unfinished" });
    // Marked spent after flush 1: it has finished with what it gave.
    expect(classifyTrialBlock({ ...onlyFlushOne, spentMassG: 1400 }, excludeContaminated)).toEqual({
      counted: true,
      value: 50,
      countedAsZero: false,
    });
  });

  it("never counts a block without a harvest as 0 % unless it is contaminated and the protocol counts those as 0 %", () => {
    const spentBare = { ...finished, spentMassG: 2100, harvests: [] };
    expect(classifyTrialBlock(spentBare, excludeContaminated)).toEqual({ counted: false, reason: "no_harvest" });
    expect(classifyTrialBlock(spentBare, contaminatedAsZero)).toEqual({ counted: false, reason: "no_harvest" });
    // Only a flush beyond the outcome's: through the last flush, but nothing to count in flushes 1–2.
    const lateOnly = { ...finished, harvests: [{ flush: 3, freshMassG: 90 }] };
    expect(classifyTrialBlock(lateOnly, excludeContaminated)).toEqual({ counted: false, reason: "no_harvest" });
    expect(classifyTrialBlock({ ...spentBare, contaminated: true }, contaminatedAsZero)).toEqual({
      counted: true,
      value: 0,
      countedAsZero: true,
    });
  });
});

describe("trialOutcomeRecords", () => {
  it("carries each block's reason for being left out beside its value", () => {
    const rows = [
      { id: "b1", farmId: "f1", armId: "a", wetMassG: 2500, moisture: 0.6, contaminated: false, spentMassG: null },
      { id: "b2", farmId: "f1", armId: "a", wetMassG: 2500, moisture: 0.6, contaminated: false, spentMassG: null },
      { id: "b3", farmId: "f1", armId: "a", wetMassG: 2500, moisture: 0.6, contaminated: true, spentMassG: null },
      { id: "b4", farmId: "f1", armId: null, wetMassG: 2500, moisture: 0.6, contaminated: false, spentMassG: null },
    ];
    const harvests = [
      { blockId: "b1", flush: 1, freshMassG: 400 },
      { blockId: "b1", flush: 2, freshMassG: 300 },
      { blockId: "b2", flush: 1, freshMassG: 400 },
    ];
    expect(trialOutcomeRecords(rows, harvests, contaminatedAsZero)).toEqual([
      { farm: "f1", armId: "a", contaminated: false, value: 70, excluded: null, countedAsZero: false },
      { farm: "f1", armId: "a", contaminated: false, value: null, excluded: "unfinished", countedAsZero: false },
      { farm: "f1", armId: "a", contaminated: true, value: 0, excluded: null, countedAsZero: true },
    ]);
  });
});

describe("incompleteCounts", () => {
  it("counts what is missing and what closing now would do, by reason", () => {
    const blocks: TrialBlockRecord[] = [
      finished,
      { ...finished, spentMassG: 1500 },
      { ...finished, harvests: [{ flush: 1, freshMassG: 300 }] },
      { ...finished, harvests: [] },
      { ...finished, wetMassG: null },
      { ...finished, contaminated: true, harvests: [] },
    ];
    expect(incompleteCounts(blocks, 8, excludeContaminated)).toEqual({
      listed: 8,
      notInSeasonLog: 2,
      inSeasonLog: 6,
      withoutOutcomeFlushes: 2,
      withoutMass: 1,
      notSpent: 4,
      contaminated: 1,
      wouldCount: 2,
      leftOut: { contaminated: 1, lost: 1, unfinished: 2, no_harvest: 0 },
    });
    expect(incompleteCounts(blocks, 6, contaminatedAsZero)).toMatchObject({ notInSeasonLog: 0, wouldCount: 3 });
  });
});
