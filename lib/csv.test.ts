import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { toCsv } from "./csv";

describe("CSV for spreadsheets", () => {
  it("neutralises cells a spreadsheet would run as formulas (OWASP CSV injection: = + - @)", () => {
    const csv = toCsv([{ note: '=HYPERLINK("http://x")' }, { note: "+1" }, { note: "-2+3" }, { note: "@SUM(A1)" }, { note: "plain" }]);
    const cells = Papa.parse<string[]>(csv)
      .data.slice(1)
      .map((row) => row[0]);
    expect(cells).toEqual(['\'=HYPERLINK("http://x")', "'+1", "'-2+3", "'@SUM(A1)", "plain"]);
  });

  it("leaves real numbers alone, negative ones included", () => {
    expect(toCsv([{ difference: -3.5 }]).split("\r\n")[1]).toBe("-3.5");
  });

  it("quotes commas, quotes and line breaks so each value stays in its cell", () => {
    const csv = toCsv([{ block: "FE-001", note: 'cut "X", then\nfolded' }]);
    expect(Papa.parse<string[]>(csv).data[1]).toEqual(["FE-001", 'cut "X", then\nfolded']);
  });

  it("uses the headers given, in their order, and leaves missing values empty", () => {
    const csv = toCsv(
      [{ a: 1, b: null }],
      [
        { key: "b", header: "Second" },
        { key: "a", header: "First" },
      ],
    );
    expect(csv.split("\r\n")).toEqual(["Second,First", ",1"]);
  });
});
