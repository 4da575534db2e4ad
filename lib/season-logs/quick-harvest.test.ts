import { describe, expect, it } from "vitest";
import { recordHarvestSchema } from "./quick-harvest";

describe("recordHarvestSchema", () => {
  it("accepts the form as a phone sends it (all text)", () => {
    expect(recordHarvestSchema.parse({ blockCode: " FE-001 ", flush: "2", weight: "640", unit: "g", harvestedOn: "2026-05-02" })).toEqual({
      blockCode: "FE-001",
      flush: 2,
      weight: "640",
      unit: "g",
      harvestedOn: "2026-05-02",
    });
  });

  it("says what to fix for a blank code, flush 0, no weight and an unknown unit", () => {
    const result = recordHarvestSchema.safeParse({ blockCode: "", flush: "0", weight: "", unit: "stone", harvestedOn: "yesterday" });
    expect(result.success).toBe(false);
    const fields = new Set(result.error!.issues.map((issue) => issue.path[0]));
    expect(fields).toEqual(new Set(["blockCode", "flush", "weight", "unit", "harvestedOn"]));
  });
});
