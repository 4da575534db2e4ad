import { describe, expect, it } from "vitest";
import { readHeaderRow } from "./layout";

describe("readHeaderRow (stage 3)", () => {
  it("takes a row that names no column as a title row", () => {
    expect(readHeaderRow(["Fernbrook season 2026", ""], 1, [], {})).toEqual({
      kind: "title",
      row: { line: 1, text: "Fernbrook season 2026" },
    });
  });

  it("places the schema columns, takes the unit from the header and falls back on the default unit", () => {
    const outcome = readHeaderRow(["Block", "Strain", "Flush", "Fresh (g)", "Wet block", ""], 3, [{ line: 1, text: "title" }], {
      defaultMassUnit: "lb",
    });
    if (outcome.kind !== "header") throw new Error("expected a header");
    expect(outcome.layout).toMatchObject({ headerLine: 3, headerWidth: 5, format: "long", readRows: true });
    expect(outcome.layout.columns.fresh_weight).toEqual({ index: 3, header: "Fresh (g)", unit: "g" });
    expect(outcome.layout.columns.block_wet_weight).toEqual({ index: 4, header: "Wet block", unit: "lb" });
    expect(outcome.layout.columns.notes.index).toBe(-1);
    expect(outcome.issues.map((issue) => [issue.line, issue.code])).toEqual([[1, "rows_above_header"]]);
  });

  it("reads wide form, and stops reading rows when a required column is missing or the layouts are mixed", () => {
    const wide = readHeaderRow(["Block", "Strain", "Flush 1 (oz)", "Flush 1 date", "Flush 2 (oz)"], 1, [], {});
    if (wide.kind !== "header") throw new Error("expected a header");
    expect(wide.layout.format).toBe("wide");
    expect(wide.layout.wide.map((flush) => [flush.flush, flush.weight.index, flush.date?.index ?? null])).toEqual([
      [1, 2, 3],
      [2, 4, null],
    ]);
    const missing = readHeaderRow(["Block", "Flush", "Fresh weight"], 1, [], {});
    if (missing.kind !== "header") throw new Error("expected a header");
    expect(missing.layout.readRows).toBe(false);
    expect(missing.issues.map((issue) => issue.code)).toEqual(["required_column_missing"]);
    const mixed = readHeaderRow(["Block", "Strain", "Flush", "Fresh weight", "Flush 2"], 1, [], {});
    if (mixed.kind !== "header") throw new Error("expected a header");
    expect(mixed.layout.readRows).toBe(false);
    expect(mixed.issues.map((issue) => issue.code)).toContain("long_and_wide_mixed");
  });
});
