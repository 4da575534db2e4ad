import { readFileSync } from "node:fs";
import path from "node:path";
import ExcelJS from "exceljs";
import { strToU8, zipSync } from "fflate";
import { describe, expect, it } from "vitest";
import { seasonLogTemplateCsv } from "./schema";
import { parseSeasonLog, parseWorkbook } from "./season-log";
import { seasonLogTemplateXlsx } from "./template-xlsx";
import { workbookKind } from "./spreadsheet";

const folder = path.resolve(__dirname, "../../tests/fixtures/spreadsheets");
const read = (file: string) => new Uint8Array(readFileSync(path.join(folder, file)));
const options = { today: "2026-12-31", knownStrains: ["PO-03", "LM-01", "SH-12"] };

// The cells typed into the workbook LibreOffice Calc 7.4 saved (ROWS in make-fixtures.py). Read
// as types, the formula Dry (g) = ROUND(fresh kg × 100; 1) keeps its decimal: 61.2, not the 61 shown.
const typed = [
  ["AV-101", "2026-02-02", 2720, 0.62, 1, "2026-03-09", 612, 61.2, false, "first flush – “pinned well”"],
  ["AV-101", "2026-02-02", 2720, 0.62, 2, "2026-03-21", 455, 45.5, false, "side pins… €0 spent"],
  ["AV-102", "2026-02-02", 2680, 0.62, 1, "2026-03-10", 1205, 120.5, false, "heavy"],
  ["AV-103", "2026-02-09", 2745, 0.61, 1, "2026-03-18", 398, 39.8, false, null],
  ["AV-104", "2026-02-09", 2702, 0.61, null, null, null, null, true, "green mould ‘trich’"],
  ["AV-105", "2026-02-16", 3015, 0.6, 1, "2026-04-02", 1030, 103, false, null],
];

function values(result: Awaited<ReturnType<typeof parseWorkbook>>) {
  return result.records.map((record) => [
    record.blockCode,
    record.inoculatedOn,
    record.wetBlockGrams,
    record.moisture,
    record.flush,
    record.harvestedOn,
    record.freshGrams === null ? null : Math.round(record.freshGrams * 1e6) / 1e6,
    record.dryGrams,
    record.contaminated,
    record.notes,
  ]);
}

describe("workbooks LibreOffice Calc saved as .xlsx and .ods", () => {
  for (const file of ["workbook-en-US.xlsx", "workbook-de-DE.xlsx", "workbook-en-US.ods", "workbook-de-DE.ods"]) {
    const kind = file.endsWith(".xlsx") ? "xlsx" : "ods";
    it(`${file}: is recognised by its contents and asks which of its two sheets`, async () => {
      expect(workbookKind(read(file))).toBe(kind);
      const result = await parseWorkbook(read(file), kind, options);
      expect(result.detected.workbook).toEqual({ kind, sheet: "Harvests", sheets: ["Harvests", "Rooms"] });
      expect(result.issues.map((issue) => issue.code)).toEqual(["sheet_choice_needed"]);
    });

    it(`${file}: the chosen sheet reads as typed — dates, numbers, booleans, a formula's cached value — whatever the locale`, async () => {
      const result = await parseWorkbook(read(file), kind, { ...options, sheet: "Harvests" });
      expect(result.issues).toEqual([]);
      expect(values(result)).toEqual(typed);
      // As written is the number itself: no decimal mark or grouping to guess.
      expect(result.records[0].wetBlockAsWritten).toEqual({ value: "2720", unit: "g" });
      expect(result.records[2].freshAsWritten).toEqual({ value: "1.205", unit: "kg" });
    });
  }

  it("says when the chosen sheet is not in the workbook", async () => {
    const result = await parseWorkbook(read("workbook-en-US.ods"), "ods", { ...options, sheet: "Ernte" });
    expect(result.records).toEqual([]);
    expect(result.issues.map((issue) => issue.code)).toEqual(["sheet_choice_needed"]);
  });
});

describe("a workbook exceljs writes (as the .xlsx template is made)", () => {
  it("reads a one-sheet workbook with text masses and typed cells without asking for a sheet", async () => {
    const workbook = new ExcelJS.Workbook();
    const sheet = workbook.addWorksheet("Season log");
    sheet.addRow(["block_id", "strain", "inoculated_on", "flush", "fresh_weight", "contaminated", "notes"]);
    sheet.addRow(["B-1", "PO-03", new Date(Date.UTC(2026, 2, 2)), 1, "640 g", false, "first"]);
    sheet.addRow([
      "B-1",
      "PO-03",
      new Date(Date.UTC(2026, 2, 2)),
      2,
      { formula: "1+1", result: "1,2 kg" },
      false,
      { richText: [{ text: "rich " }, { text: "text" }] },
    ]);
    const bytes = new Uint8Array(await workbook.xlsx.writeBuffer());
    expect(workbookKind(bytes)).toBe("xlsx");
    const result = await parseWorkbook(bytes, "xlsx", options);
    expect(result.issues).toEqual([]);
    expect(result.records.map((record) => [record.inoculatedOn, record.flush, record.freshGrams, record.notes])).toEqual([
      ["2026-03-02", 1, 640, "first"],
      ["2026-03-02", 2, 1200, "rich text"],
    ]);
  });
});

describe("files that are not workbooks", () => {
  it("a zip of something else, text and a damaged workbook", async () => {
    expect(workbookKind(zipSync({ "readme.txt": strToU8("hello") }))).toBeNull();
    expect(workbookKind(new TextEncoder().encode("block_id,strain\n"))).toBeNull();
    const damaged = read("workbook-en-US.xlsx").slice(0, 3000);
    const result = await parseWorkbook(damaged, "xlsx", options);
    expect(result.issues.map((issue) => issue.code)).toEqual(["spreadsheet_unreadable"]);
  });
});

describe("the .xlsx template", () => {
  it("reads back as the CSV template does, with no issue", async () => {
    const bytes = await seasonLogTemplateXlsx();
    expect(workbookKind(bytes)).toBe("xlsx");
    const fromXlsx = await parseWorkbook(bytes, "xlsx", { ...options, sheet: "Season log" });
    const fromCsv = parseSeasonLog(seasonLogTemplateCsv(), options);
    expect(fromXlsx.issues).toEqual([]);
    expect(fromXlsx.records).toEqual(fromCsv.records);
    expect(fromXlsx.detected.workbook?.sheets).toEqual(["Season log", "About the columns"]);
  });
});
