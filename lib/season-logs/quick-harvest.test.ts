import { describe, expect, it } from "vitest";
import { checkQuickHarvest, latestToday, recordHarvestSchema, warningsNotAccepted, type StoredBlock } from "./quick-harvest";

describe("recordHarvestSchema", () => {
  it("accepts the form as a phone sends it (all text)", () => {
    expect(recordHarvestSchema.parse({ blockCode: " FE-001 ", flush: "2", weight: "640", unit: "g", harvestedOn: "2026-05-02" })).toEqual({
      blockCode: "FE-001",
      flush: 2,
      weight: "640",
      unit: "g",
      harvestedOn: "2026-05-02",
      roomId: null,
      acceptWarnings: [],
    });
  });

  it("reads the room picker: left blank it names no room; a room is kept; anything else is refused with words", () => {
    const entry = { blockCode: "FE-001", flush: "2", weight: "640", unit: "g", harvestedOn: "2026-05-02" };
    const room = "7d0c3a52-4b8e-4c61-9f3e-2a7b9c1d5e60";
    expect(recordHarvestSchema.parse({ ...entry, roomId: "" }).roomId).toBeNull();
    expect(recordHarvestSchema.parse({ ...entry, roomId: room }).roomId).toBe(room);
    expect(recordHarvestSchema.safeParse({ ...entry, roomId: "Tub 1" }).error?.issues[0].message).toBe(
      "Pick the room from the list, or leave it as it is.",
    );
  });

  it("reads the warnings accepted with 'Save anyway' as codes", () => {
    const parsed = recordHarvestSchema.parse({
      blockCode: "FE-001",
      flush: "3",
      weight: "640",
      unit: "g",
      harvestedOn: "2026-05-02",
      acceptWarnings: "flush_gap,date_in_future",
    });
    expect(parsed.acceptWarnings).toEqual(["flush_gap", "date_in_future"]);
  });

  it("says what to fix for a blank code, flush 0, no weight and an unknown unit", () => {
    const result = recordHarvestSchema.safeParse({ blockCode: "", flush: "0", weight: "", unit: "stone", harvestedOn: "yesterday" });
    expect(result.success).toBe(false);
    const fields = new Set(result.error!.issues.map((issue) => issue.path[0]));
    expect(fields).toEqual(new Set(["blockCode", "flush", "weight", "unit", "harvestedOn"]));
  });
});

// A 5 lb block (2 268 g) at 58 % moisture, inoculated on 1 March, flush 1 of 400 g picked.
const block: StoredBlock = {
  code: "FE-001",
  inoculatedOn: "2026-03-01",
  wetMassG: 2268,
  moisture: 0.58,
  contaminated: false,
  contaminatedOn: null,
  harvests: [{ flush: 1, freshMassG: 400 }],
};
const today = "2026-05-02";
const good = { blockCode: "fe-001", flush: 2, weight: "640", unit: "g" as const, harvestedOn: "2026-05-02" };
const codes = (problems: { code: string }[]) => problems.map((problem) => problem.code);

describe("checkQuickHarvest: the import's rules for one harvest", () => {
  it("passes a good flush, with its weight kept as written with the unit picked", () => {
    const check = checkQuickHarvest(good, block, today);
    expect(check).toMatchObject({ errors: [], warnings: [], freshGrams: 640, asWritten: "640 g", unit: "g" });
  });

  it("reads '1 lb 2 oz', '12 oz' and '0,45 kg' whatever unit is picked, keeping each as written", () => {
    const lbOz = checkQuickHarvest({ ...good, weight: "1 lb 2 oz", unit: "g" }, block, today);
    expect(lbOz.freshGrams).toBeCloseTo(453.59237 + 2 * 28.349523125, 6); // NIST Handbook 44: 1 lb = 453.592 37 g, 1 oz = 1/16 lb
    expect([lbOz.asWritten, lbOz.unit]).toEqual(["1 lb 2 oz", "lb+oz"]);
    const oz = checkQuickHarvest({ ...good, weight: "12 oz", unit: "kg" }, block, today);
    expect([oz.asWritten, oz.unit]).toEqual(["12 oz", "oz"]);
    expect(oz.freshGrams).toBeCloseTo(12 * 28.349523125, 6);
    const kg = checkQuickHarvest({ ...good, weight: "0,45 kg", unit: "lb" }, block, today);
    expect(kg.freshGrams).toBeCloseTo(450, 9);
    expect(kg.errors).toEqual([]);
    const bare = checkQuickHarvest({ ...good, weight: "12", unit: "oz" }, block, today);
    expect([bare.asWritten, bare.unit]).toEqual(["12 oz", "oz"]);
  });

  it("refuses a weight that cannot be read, or reads two ways, under the weight", () => {
    expect(codes(checkQuickHarvest({ ...good, weight: "lots" }, block, today).errors)).toEqual(["mass_unreadable"]);
    const ambiguous = checkQuickHarvest({ ...good, weight: "1.250 kg" }, block, today);
    expect(ambiguous.errors).toMatchObject([{ code: "ambiguous_decimal_mark", field: "weight" }]);
  });

  it("refuses 50 lb on a 5 lb block (BE 2 392 %), and warns that it is more than the block", () => {
    const check = checkQuickHarvest({ ...good, weight: "50", unit: "lb" }, block, today);
    expect(check.errors).toMatchObject([{ code: "efficiency_implausible", field: "weight" }]);
    expect(check.errors[0].message).toContain("2423 %"); // (400 g + 22 679.6 g) over 2 268 g × 0.42 = 952.56 g of dry substrate
    expect(codes(check.warnings)).toContain("flush_heavier_than_block");
  });

  it("warns of a BE above 250 % that is not beyond what any block reaches", () => {
    // 400 g + 2 000 g over 952.6 g dry substrate is 252 %.
    const check = checkQuickHarvest({ ...good, weight: "2000" }, block, today);
    expect(check.errors).toEqual([]);
    expect(check.warnings).toMatchObject([{ code: "efficiency_implausible", field: "weight" }]);
  });

  it("warns of a harvest dated next month", () => {
    const check = checkQuickHarvest({ ...good, harvestedOn: "2026-06-02" }, block, today);
    expect(check.errors).toEqual([]);
    expect(check.warnings).toMatchObject([{ code: "date_in_future", field: "harvestedOn" }]);
  });

  it("refuses a harvest before the block's inoculation", () => {
    const check = checkQuickHarvest({ ...good, harvestedOn: "2026-02-20" }, block, today);
    expect(check.errors).toMatchObject([{ code: "harvest_before_inoculation", field: "harvestedOn" }]);
  });

  it("warns of flush 3 when flushes 1–2 are not recorded", () => {
    const check = checkQuickHarvest({ ...good, flush: 3 }, { ...block, harvests: [] }, today);
    expect(check.warnings).toMatchObject([{ code: "flush_gap", field: "flush" }]);
    expect(check.warnings[0].message).toContain("no flush 1, 2");
  });

  it("refuses 0 oz", () => {
    const check = checkQuickHarvest({ ...good, weight: "0", unit: "oz" }, block, today);
    expect(check.errors).toMatchObject([{ code: "flush_weighs_nothing", field: "weight" }]);
  });

  it("warns of a flush on a contaminated block, saying when it was found", () => {
    const check = checkQuickHarvest(good, { ...block, contaminated: true, contaminatedOn: "2026-04-20" }, today);
    expect(check.warnings).toMatchObject([{ code: "harvest_on_contaminated_block", field: "blockCode" }]);
    expect(check.warnings[0].message).toContain("2026-04-20");
  });

  it("refuses a flush already recorded", () => {
    expect(codes(checkQuickHarvest({ ...good, flush: 1 }, block, today).errors)).toEqual(["duplicate_flush"]);
  });
});

describe("warningsNotAccepted", () => {
  it("leaves standing every warning whose code was not accepted", () => {
    const warnings = [
      { code: "flush_gap" as const, field: "flush" as const, message: "gap" },
      { code: "date_in_future" as const, field: "harvestedOn" as const, message: "future" },
    ];
    expect(warningsNotAccepted(warnings, ["flush_gap", "date_in_future"])).toEqual([]);
    expect(codes(warningsNotAccepted(warnings, ["flush_gap", "harvest_before_inoculation"]))).toEqual(["date_in_future"]);
  });
});

describe("latestToday", () => {
  it("is the date where the day begins first, so no time zone's today is the future", () => {
    expect(latestToday(new Date("2026-05-01T09:59:00Z"))).toBe("2026-05-01");
    expect(latestToday(new Date("2026-05-01T10:00:00Z"))).toBe("2026-05-02");
  });
});
