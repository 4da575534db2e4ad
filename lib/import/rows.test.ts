import { describe, expect, it } from "vitest";
import { readHeaderRow } from "./layout";
import { readDataRow } from "./rows";
import { createParseState } from "./state";
import { RegisterMatcher } from "./registers";

function stateFor(header: string[]) {
  const state = createParseState({}, "2026-12-31", new RegisterMatcher([{ code: "PO-03" }]));
  const outcome = readHeaderRow(header, 1, [], {});
  if (outcome.kind !== "header") throw new Error("expected a header");
  state.layout = outcome.layout;
  return state;
}

describe("readDataRow (stage 4)", () => {
  it("reads one long-form row into a record with grams, the mass as written and the co-op's spelling of the strain", () => {
    const state = stateFor(["block_id", "strain", "flush", "fresh_weight", "contaminated"]);
    readDataRow(state, ["B-1", "po 03", "2", " 1 lb 2 oz ", "no"], 2);
    expect(state.issues).toEqual([]);
    expect(state.records).toHaveLength(1);
    // 1 lb 2 oz = 18 oz × 28.349523125 g (NIST Handbook 44, Appendix C).
    expect(state.records[0]).toMatchObject({ line: 2, blockCode: "B-1", strainCode: "PO-03", flush: 2, contaminated: false });
    expect(state.records[0].freshGrams).toBeCloseTo(510.29141625, 8);
    expect(state.records[0].freshAsWritten).toEqual({ value: "1 lb 2 oz", unit: "lb+oz" });
  });

  it("gives one record per filled flush column in wide form, and a block record when none is filled", () => {
    const state = stateFor(["Block", "Strain", "Flush 1 (g)", "Flush 2 (g)"]);
    readDataRow(state, ["B-1", "PO-03", "500", "300"], 2);
    readDataRow(state, ["B-2", "PO-03", "", ""], 3);
    expect(state.records.map((record) => [record.blockCode, record.flush, record.freshGrams])).toEqual([
      ["B-1", 1, 500],
      ["B-1", 2, 300],
      ["B-2", null, null],
    ]);
  });

  it("keeps a record for a row with errors and names each bad cell by code", () => {
    const state = stateFor(["block_id", "strain", "flush", "fresh_weight"]);
    readDataRow(state, ["", "PO-99", "first", "12 stone"], 4);
    expect(state.issues.map((issue) => [issue.line, issue.code, issue.column, issue.value])).toEqual([
      [4, "block_code_missing", "block_id", ""],
      [4, "unknown_strain", "strain", "PO-99"],
      [4, "flush_unreadable", "flush", "first"],
      [4, "unit_unknown", "fresh_weight", "12 stone"],
    ]);
    expect(state.records[0]).toMatchObject({ blockCode: "", flush: null, freshGrams: null });
  });
});
