import { describe, expect, it } from "vitest";
import { blockFigures, blockState, nextFlush } from "./block-figures";

describe("blockFigures", () => {
  it("gives biological efficiency as fresh mass over dry substrate mass, in percent", () => {
    // 2500 g wet at 62 % moisture = 950 g dry substrate (PRODUCT.md's definition); 760 g fresh → 80 %.
    expect(
      blockFigures({ flushes: 2, wetMassG: 2500, moisture: 0.62, totalFreshG: 760, spentMassG: null }).biologicalEfficiency,
    ).toBeCloseTo(80, 10);
  });

  it("gives mass loss from the wet and spent block weights", () => {
    expect(blockFigures({ flushes: 2, wetMassG: 2500, moisture: 0.62, totalFreshG: 0, spentMassG: 1400 }).massLoss).toBeCloseTo(44, 10);
  });

  it("gives a block with no harvest yet no efficiency, never 0 %", () => {
    const figures = blockFigures({ flushes: 0, wetMassG: 2500, moisture: 0.62, totalFreshG: 0, spentMassG: 1400 });
    expect(figures.biologicalEfficiency).toBeNull();
    expect(figures.massLoss).toBeCloseTo(44, 10);
  });

  it("leaves a figure blank where the weighing it needs is missing", () => {
    expect(blockFigures({ flushes: 2, wetMassG: null, moisture: 0.62, totalFreshG: 500, spentMassG: 1400 })).toEqual({
      biologicalEfficiency: null,
      massLoss: null,
    });
    expect(blockFigures({ flushes: 2, wetMassG: 2500, moisture: null, totalFreshG: 500, spentMassG: null })).toEqual({
      biologicalEfficiency: null,
      massLoss: null,
    });
  });
});

describe("nextFlush", () => {
  it("suggests the flush after the highest recorded, even with a gap", () => {
    expect(nextFlush([])).toBe(1);
    expect(nextFlush([1, 3])).toBe(4);
  });
});

describe("where a block stands", () => {
  // Trade words (common practice): a contaminated block is lost whatever else was weighed; a block whose
  // spent mass is weighed has given its last flush; one picked at least once is fruiting.
  it("says contaminated before anything else, then spent, then fruiting", () => {
    expect(blockState({ contaminated: true, spentMassG: 2100, flushes: 2 })).toBe("contaminated");
    expect(blockState({ contaminated: false, spentMassG: 2100, flushes: 3 })).toBe("spent");
    expect(blockState({ contaminated: false, spentMassG: null, flushes: 1 })).toBe("fruiting");
    expect(blockState({ contaminated: false, spentMassG: null, flushes: 0 })).toBe("no harvest yet");
  });
});
