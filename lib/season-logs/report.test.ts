import { describe, expect, it } from "vitest";
import { parseSeasonLog } from "../import";
import { isAppError } from "../errors";
import { planCommit } from "./plan";
import { buildReport, reportCsv } from "./report";
import { attachment, readChoices } from "./request";

describe("buildReport", () => {
  it("merges parser and planner issues by line and counts errors and warnings", () => {
    const parsed = parseSeasonLog("block_id,strain,substrate,flush,fresh_weight\nA-1,PO-01,NOPE,1,400 g\nA-2,PO-01,,1,-3 g\n", {
      knownStrains: ["PO-01"],
    });
    const plan = planCommit({
      records: parsed.records,
      storedBlocks: [],
      storedHarvests: [],
      strains: [{ id: "s", code: "PO-01" }],
      substrateRecipes: [],
      fruitingMethods: [],
      assignments: [],
    });
    const report = buildReport({
      rowCount: parsed.records.length,
      parserIssues: parsed.issues,
      plan,
      detected: parsed.detected,
      choices: {},
    });
    expect(report.issues.map((issue) => [issue.line, issue.severity])).toEqual([
      [2, "error"],
      [3, "error"],
    ]);
    expect(report.errorCount).toBe(2);
    expect(report.warningCount).toBe(0);
  });
});

describe("reportCsv", () => {
  it("keeps a value that looks like a formula from running in a spreadsheet", () => {
    const csv = reportCsv([
      { line: 4, code: "cell_too_long", severity: "error", column: "notes", value: '=HYPERLINK("x")', message: "Line 4: bad" },
    ]);
    // The code column came in with issue codes: a spreadsheet user can filter the report by it.
    expect(csv.split("\r\n")[0]).toBe("Line,Code,Severity,Column,Value,Message");
    expect(csv).toContain("'=HYPERLINK");
  });
});

describe("readChoices", () => {
  it("reads the grower's choices and refuses an unknown unit with a field problem", async () => {
    const ok = await readChoices(
      new Request("http://x", { method: "POST", body: JSON.stringify({ mapping: { "Picked (g)": "fresh_weight" }, dateOrder: "dmy" }) }),
    );
    expect(ok).toEqual({ mapping: { "Picked (g)": "fresh_weight" }, dateOrder: "dmy" });
    try {
      await readChoices(new Request("http://x", { method: "POST", body: JSON.stringify({ defaultMassUnit: "stone" }) }));
      expect.unreachable();
    } catch (error) {
      expect(isAppError(error) && error.code).toBe("invalid_input");
      expect(isAppError(error) && error.fieldProblems[0].field).toBe("defaultMassUnit");
    }
  });
});

describe("attachment", () => {
  it("keeps quotes and non-ASCII letters out of the plain file name", () => {
    expect(attachment('Sæson "2026".csv')).toBe(`attachment; filename="S_son _2026_.csv"; filename*=UTF-8''S%C3%A6son%20%222026%22.csv`);
  });
});
