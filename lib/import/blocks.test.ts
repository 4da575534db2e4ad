import { describe, expect, it } from "vitest";
import { finishRecords } from "./finish";
import { readHeaderRow } from "./layout";
import { readDataRow } from "./rows";
import { createParseState } from "./state";

function read(header: string[], rows: string[][]) {
  const state = createParseState({}, "2026-12-31", null);
  const outcome = readHeaderRow(header, 1, [], {});
  if (outcome.kind !== "header") throw new Error("expected a header");
  state.layout = outcome.layout;
  rows.forEach((cells, index) => readDataRow(state, cells, index + 2));
  return state;
}

describe("block checks (stage 5)", () => {
  const header = ["block_id", "strain", "block_wet_weight", "substrate_moisture", "flush", "fresh_weight", "contaminated"];

  it("reports a block whose rows disagree, and the same flush twice", () => {
    const state = read(header, [
      ["B-1", "PO-03", "2.5 kg", "62 %", "1", "500 g", "no"],
      ["B-1", "PO-03", "2.4 kg", "62 %", "1", "300 g", "yes"],
    ]);
    expect(state.issues.map((issue) => [issue.line, issue.code, issue.value])).toEqual([
      [3, "duplicate_flush", "1"],
      [3, "block_details_disagree", "2.4 kg"],
      [3, "contamination_disagrees", "yes"],
    ]);
  });

  it("at the end: a gap in the flushes, and an efficiency above 250 %", () => {
    // 2 500 g wet at 60 % moisture is 1 000 g dry; 2 600 g fresh is a BE of 260 %.
    const state = read(header, [
      ["B-1", "PO-03", "2500 g", "60 %", "1", "2000 g", ""],
      ["B-1", "PO-03", "2500 g", "60 %", "3", "600 g", ""],
    ]);
    finishRecords(state);
    expect(state.issues.map((issue) => [issue.line, issue.code])).toEqual([
      [3, "flush_gap"],
      [2, "efficiency_implausible"],
    ]);
    expect(state.issues[1].message).toContain("260 %");
  });

  it("at the end: a flush picked after the day its block was found contaminated, as the quick form warns", () => {
    const dated = ["block_id", "strain", "flush", "harvested_on", "fresh_weight", "contaminated", "contaminated_on"];
    const state = read(dated, [
      ["B-1", "PO-03", "1", "2026-04-10", "500 g", "yes", "2026-04-20"],
      ["B-1", "PO-03", "2", "2026-04-20", "300 g", "yes", "2026-04-20"],
      ["B-1", "PO-03", "3", "2026-04-28", "200 g", "yes", "2026-04-20"],
    ]);
    finishRecords(state);
    expect(state.issues.map((issue) => [issue.line, issue.code, issue.severity, issue.value])).toEqual([
      [4, "harvest_on_contaminated_block", "warning", "2026-04-28"],
    ]);
  });
});
