import { describe, expect, it } from "vitest";
import {
  efficiencyPercent,
  efficiencyVerdict,
  flushHeavierThanBlock,
  flushWeighsNothing,
  harvestBeforeInoculation,
  harvestOnContaminatedBlock,
  missingFlushes,
} from "./harvest-checks";

describe("the block checks the importer and the quick form share", () => {
  it("finds a harvest before its block's inoculation, and only then", () => {
    expect(harvestBeforeInoculation("2026-02-28", "2026-03-01")).toBe(true);
    expect(harvestBeforeInoculation("2026-03-01", "2026-03-01")).toBe(false);
    expect(harvestBeforeInoculation("2026-04-01", null)).toBe(false);
  });

  it("names the flushes missing below the highest", () => {
    expect(missingFlushes([3])).toEqual([1, 2]);
    expect(missingFlushes([1, 4, 2])).toEqual([3]);
    expect(missingFlushes([2, 1])).toEqual([]);
    expect(missingFlushes([])).toEqual([]);
  });

  it("finds a flush heavier than the whole wet block", () => {
    // 50 lb on a 5 lb block (22 680 g against 2 268 g).
    expect(flushHeavierThanBlock(22_679.6, 2_268)).toBe(true);
    expect(flushHeavierThanBlock(640, 2_268)).toBe(false);
    expect(flushHeavierThanBlock(640, null)).toBe(false);
  });

  it("gives a block's efficiency from all its harvest, and none before a harvest", () => {
    // 2500 g wet at 62 % moisture is 950 g dry substrate (PRODUCT.md's definition); 760 g fresh is 80 %.
    expect(efficiencyPercent(760, 2500, 0.62)).toBeCloseTo(80, 10);
    expect(efficiencyPercent(0, 2500, 0.62)).toBeNull();
    expect(efficiencyPercent(760, null, 0.62)).toBeNull();
  });

  it("judges an efficiency plausible up to 250 %, implausible to 400 % and impossible beyond", () => {
    expect(efficiencyVerdict(null)).toBe("plausible");
    expect(efficiencyVerdict(250)).toBe("plausible");
    expect(efficiencyVerdict(251)).toBe("implausible");
    expect(efficiencyVerdict(400)).toBe("implausible");
    // 50 lb of mushrooms from a 5 lb block at 58 % moisture: 2 392 %.
    expect(efficiencyVerdict(2392)).toBe("impossible");
  });

  it("tells a harvest after the contamination was found from one on a block only marked", () => {
    expect(harvestOnContaminatedBlock({ contaminated: true, contaminatedOn: "2026-04-10" }, "2026-04-12")).toBe("after");
    expect(harvestOnContaminatedBlock({ contaminated: true, contaminatedOn: "2026-04-10" }, "2026-04-01")).toBe("marked");
    expect(harvestOnContaminatedBlock({ contaminated: true, contaminatedOn: "2026-04-10" }, "2026-04-10")).toBe("marked");
    expect(harvestOnContaminatedBlock({ contaminated: true, contaminatedOn: null }, "2026-04-01")).toBe("marked");
    expect(harvestOnContaminatedBlock({ contaminated: false, contaminatedOn: null }, "2026-04-01")).toBeNull();
  });

  it("finds a flush that weighs nothing", () => {
    expect(flushWeighsNothing(0)).toBe(true);
    expect(flushWeighsNothing(0.5)).toBe(false);
  });
});
