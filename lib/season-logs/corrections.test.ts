import { describe, expect, it } from "vitest";
import {
  blockCorrectionSchema,
  blockValueChanges,
  checkBlockCorrection,
  checkHarvestCorrection,
  checkHarvestRemoval,
  harvestCorrectionSchema,
  type BlockCorrection,
  type BlockValues,
} from "./corrections";
import { harvestRemovalChanges } from "./plan";

const today = "2026-05-02";
// A 2.5 kg block at 60 % moisture (1 000 g dry substrate), flushes of 600 g and 300 g.
const block = {
  code: "FE-001",
  harvests: [
    { flush: 1, harvestedOn: "2026-04-10", freshMassG: 600 },
    { flush: 2, harvestedOn: "2026-04-24", freshMassG: 300 },
  ],
};
const form = {
  blockId: "0190a0c4-0000-7000-8000-000000000001",
  wetMass: "2.5 kg",
  wetUnit: "g",
  moisture: "60 %",
  inoculatedOn: "2026-03-01",
  contaminatedOn: "",
  spentMass: "",
  spentUnit: "g",
  notes: "",
  reason: "typed the wrong bag",
};
const entry = (changes: Record<string, string> = {}): BlockCorrection => blockCorrectionSchema.parse({ ...form, ...changes });

describe("blockCorrectionSchema", () => {
  it("needs a reason", () => {
    const result = blockCorrectionSchema.safeParse({ ...form, reason: " " });
    expect(result.success).toBe(false);
    expect(result.error!.issues.map((issue) => issue.path[0])).toEqual(["reason"]);
  });

  it("reads the contaminated checkbox as ticked only when the browser sends it", () => {
    expect(entry().contaminated).toBe(false);
    expect(entry({ contaminated: "on" }).contaminated).toBe(true);
  });

  it("refuses a day that is not a day and an id that is not one", () => {
    const result = blockCorrectionSchema.safeParse({ ...form, inoculatedOn: "2026-02-30x", blockId: "1; drop table" });
    expect(new Set(result.error!.issues.map((issue) => issue.path[0]))).toEqual(new Set(["inoculatedOn", "blockId"]));
  });
});

describe("checkBlockCorrection", () => {
  it("stores the values read as the importer reads them, the unit picked kept with a bare number", () => {
    const check = checkBlockCorrection(entry({ wetMass: "2600", spentMass: "1.9", spentUnit: "kg" }), block, today);
    expect(check.errors).toEqual([]);
    expect(check.warnings).toEqual([]);
    expect(check.values).toMatchObject({
      wetMassG: 2600,
      wetMassAsWritten: "2600 g",
      moisture: 0.6,
      inoculatedOn: "2026-03-01",
      spentMassG: 1900,
      spentMassAsWritten: "1.9 kg",
    });
  });

  it("refuses an inoculation day after a flush was picked, under that field", () => {
    const check = checkBlockCorrection(entry({ inoculatedOn: "2026-04-15" }), block, today);
    expect(check.values).toBeNull();
    expect(check.errors.map((error) => [error.code, error.field])).toEqual([["harvest_before_inoculation", "inoculatedOn"]]);
  });

  it("refuses a wet weight in the wrong unit: 2.5 g is no block", () => {
    const check = checkBlockCorrection(entry({ wetMass: "2.5", wetUnit: "g" }), block, today);
    expect(check.errors.map((error) => [error.code, error.field])).toEqual([["mass_implausible", "wetMass"]]);
  });

  it("refuses an efficiency beyond 400 % and warns above 250 %", () => {
    // 900 g of harvest on 200 g of dry substrate (500 g wet at 60 %) is 450 %; on 320 g (800 g wet) 281 %.
    expect(checkBlockCorrection(entry({ wetMass: "500 g" }), block, today).errors.map((error) => error.code)).toContain(
      "efficiency_implausible",
    );
    const warned = checkBlockCorrection(entry({ wetMass: "800 g" }), block, today);
    expect(warned.errors).toEqual([]);
    expect(warned.warnings.map((warning) => [warning.code, warning.field])).toEqual([["efficiency_implausible", "wetMass"]]);
  });

  it("warns of a contamination day on a block not marked contaminated, and of a flush picked after it", () => {
    const check = checkBlockCorrection(entry({ contaminatedOn: "2026-04-20" }), block, today);
    expect(check.warnings.map((warning) => warning.code)).toEqual(["contamination_date_not_contaminated"]);
    const marked = checkBlockCorrection(entry({ contaminated: "on", contaminatedOn: "2026-04-20" }), block, today);
    expect(marked.warnings.map((warning) => warning.code)).toEqual(["harvest_on_contaminated_block"]);
    expect(marked.values?.contaminated).toBe(true);
  });

  it("warns of a day in the future", () => {
    expect(checkBlockCorrection(entry({ inoculatedOn: "2026-06-01" }), { code: "X", harvests: [] }, today).warnings[0]?.code).toBe(
      "date_in_future",
    );
  });

  it("leaves blank values blank", () => {
    const check = checkBlockCorrection(entry({ wetMass: "", moisture: "", inoculatedOn: "" }), block, today);
    expect(check.values).toMatchObject({ wetMassG: null, wetMassAsWritten: null, moisture: null, inoculatedOn: null });
  });
});

describe("checkHarvestCorrection", () => {
  const stored = { code: "FE-001", inoculatedOn: "2026-03-01", wetMassG: 2500, moisture: 0.6, contaminated: false, contaminatedOn: null };
  const others = [{ flush: 1, freshMassG: 600 }];

  it("judges the edited flush against the block's other flushes, not against itself", () => {
    const check = checkHarvestCorrection(
      { weight: "350", unit: "g", harvestedOn: "2026-04-24" },
      { flush: 2, dryMassG: null },
      { ...stored, harvests: others },
      today,
    );
    expect(check.errors).toEqual([]);
    expect(check.freshGrams).toBe(350);
    expect(check.asWritten).toBe("350 g");
  });

  it("refuses the quick form's errors: a weight that makes the block impossible", () => {
    const check = checkHarvestCorrection(
      { weight: "50 lb", unit: "g", harvestedOn: "2026-04-24" },
      { flush: 2, dryMassG: null },
      { ...stored, harvests: others },
      today,
    );
    expect(check.errors.map((error) => error.code)).toContain("efficiency_implausible");
  });

  it("refuses a fresh weight less than the flush's stored dry weight", () => {
    const check = checkHarvestCorrection(
      { weight: "30", unit: "g", harvestedOn: "2026-04-24" },
      { flush: 2, dryMassG: 35 },
      { ...stored, harvests: others },
      today,
    );
    expect(check.errors.map((error) => [error.code, error.field])).toEqual([["dry_weight_implausible", "weight"]]);
  });

  it("needs a reason in the form", () => {
    const result = harvestCorrectionSchema.safeParse({
      harvestId: "0190a0c4-0000-7000-8000-000000000001",
      weight: "350",
      unit: "g",
      harvestedOn: today,
      reason: "",
    });
    expect(result.error!.issues.map((issue) => issue.path[0])).toEqual(["reason"]);
  });
});

describe("value history of a correction", () => {
  const before: BlockValues = {
    inoculatedOn: "2026-03-01",
    wetMassG: 2500,
    wetMassAsWritten: "2.5 kg",
    wetMassUnit: "kg",
    moisture: 0.6,
    contaminated: false,
    contaminatedOn: null,
    spentMassG: null,
    spentMassAsWritten: null,
    spentMassUnit: null,
    notes: "",
  };

  it("lists each value changed, old and new, in the planner's field names", () => {
    expect(blockValueChanges(before, { ...before, wetMassG: 2600, contaminated: true, notes: "mould at the patch" })).toEqual([
      { flush: null, field: "block_wet_weight", oldValue: "2500", newValue: "2600" },
      { flush: null, field: "contaminated", oldValue: "false", newValue: "true" },
      { flush: null, field: "notes", oldValue: null, newValue: "mould at the patch" },
    ]);
  });

  it("lists nothing when the same mass is typed in another unit", () => {
    expect(blockValueChanges(before, { ...before, wetMassAsWritten: "2500 g", wetMassUnit: "g" })).toEqual([]);
  });

  it("records a deleted harvest's values going to blank", () => {
    expect(harvestRemovalChanges({ flush: 3, harvestedOn: "2026-05-01", freshMassG: 120.5, dryMassG: null })).toEqual([
      { flush: 3, field: "fresh_weight", oldValue: "120.5", newValue: null },
      { flush: 3, field: "harvested_on", oldValue: "2026-05-01", newValue: null },
    ]);
  });
});

describe("checkHarvestRemoval", () => {
  it("warns when the flushes left would have a gap, and not when the last flush goes", () => {
    expect(checkHarvestRemoval("FE-001", 1, [2, 3]).map((warning) => [warning.code, warning.field])).toEqual([["flush_gap", "flush"]]);
    expect(checkHarvestRemoval("FE-001", 3, [1, 2])).toEqual([]);
  });
});
