import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parseSeasonLog } from "@/lib/import";

const folder = path.resolve(__dirname, "../../fixtures/spreadsheets");
const read = (file: string) => new Uint8Array(readFileSync(path.join(folder, file)));
const options = { today: "2026-12-31", knownStrains: ["PO-03", "LM-01", "SH-12"] };

// What was typed into the workbook (ROWS in tests/fixtures/spreadsheets/make-fixtures.py): the
// check values come from the source cells, not from our reading of them. Dry (g) is the formula
// ROUND(fresh kg × 100; 1) shown with no decimals.
const typed = [
  {
    blockCode: "AV-101",
    inoculatedOn: "2026-02-02",
    wetBlockGrams: 2720,
    moisture: 0.62,
    flush: 1,
    harvestedOn: "2026-03-09",
    freshGrams: 612,
    dryGrams: 61,
    contaminated: false,
    notes: "first flush – “pinned well”",
  },
  {
    blockCode: "AV-101",
    inoculatedOn: "2026-02-02",
    wetBlockGrams: 2720,
    moisture: 0.62,
    flush: 2,
    harvestedOn: "2026-03-21",
    freshGrams: 455,
    dryGrams: 46,
    contaminated: false,
    notes: "side pins… €0 spent",
  },
  {
    blockCode: "AV-102",
    inoculatedOn: "2026-02-02",
    wetBlockGrams: 2680,
    moisture: 0.62,
    flush: 1,
    harvestedOn: "2026-03-10",
    freshGrams: 1205,
    dryGrams: 121,
    contaminated: false,
    notes: "heavy",
  },
  {
    blockCode: "AV-103",
    inoculatedOn: "2026-02-09",
    wetBlockGrams: 2745,
    moisture: 0.61,
    flush: 1,
    harvestedOn: "2026-03-18",
    freshGrams: 398,
    dryGrams: 40,
    contaminated: false,
    notes: null,
  },
  {
    blockCode: "AV-104",
    inoculatedOn: "2026-02-09",
    wetBlockGrams: 2702,
    moisture: 0.61,
    flush: null,
    harvestedOn: null,
    freshGrams: null,
    dryGrams: null,
    contaminated: true,
    notes: "green mould ‘trich’",
  },
  {
    blockCode: "AV-105",
    inoculatedOn: "2026-02-16",
    wetBlockGrams: 3015,
    moisture: 0.6,
    flush: 1,
    harvestedOn: "2026-04-02",
    freshGrams: 1030,
    dryGrams: 103,
    contaminated: false,
    notes: null,
  },
];

function values(records: ReturnType<typeof parseSeasonLog>["records"]) {
  return records.map((record) => ({
    blockCode: record.blockCode,
    inoculatedOn: record.inoculatedOn,
    wetBlockGrams: record.wetBlockGrams,
    moisture: record.moisture === null ? null : Math.round(record.moisture * 1000) / 1000,
    flush: record.flush,
    harvestedOn: record.harvestedOn,
    freshGrams: record.freshGrams === null ? null : Math.round(record.freshGrams * 1000) / 1000,
    dryGrams: record.dryGrams,
    contaminated: record.contaminated,
    notes: record.notes,
  }));
}

describe("CSV files LibreOffice Calc wrote in four locales", () => {
  const files = [
    { file: "de-DE-semicolon.csv", encoding: "utf-8", delimiter: ";", decimal: ",", dateOrder: "dmy" },
    { file: "de-DE-comma.csv", encoding: "utf-8", delimiter: ",", decimal: ",", dateOrder: "dmy" },
    { file: "de-CH-semicolon.csv", encoding: "utf-8", delimiter: ";", decimal: ".", dateOrder: "dmy" },
    { file: "fr-FR-semicolon-windows-1252.csv", encoding: "windows-1252", delimiter: ";", decimal: ",", dateOrder: "dmy" },
    { file: "en-US-comma.csv", encoding: "utf-8", delimiter: ",", decimal: ".", dateOrder: "mdy" },
  ];
  for (const { file, ...detected } of files) {
    it(`${file} reads exactly what was typed, with no issue`, () => {
      const result = parseSeasonLog(read(file), options);
      expect(result.issues).toEqual([]);
      expect(result.detected).toMatchObject(detected);
      expect(values(result.records)).toEqual(typed);
    });
  }

  it("keeps the weights as written: 2.720, 2'720, 2\u00a0720 and 2,720 all 2 720 g; 0,612 and 0.612 kg both 612 g", () => {
    const written = (file: string) => parseSeasonLog(read(file), options).records[0];
    expect(written("de-DE-comma.csv").wetBlockAsWritten).toEqual({ value: "2.720", unit: "g" });
    expect(written("de-CH-semicolon.csv").wetBlockAsWritten).toEqual({ value: "2'720", unit: "g" });
    expect(written("fr-FR-semicolon-windows-1252.csv").wetBlockAsWritten).toEqual({ value: "2\u00a0720", unit: "g" });
    expect(written("en-US-comma.csv").wetBlockAsWritten).toEqual({ value: "2,720", unit: "g" });
    expect(written("de-DE-semicolon.csv").freshAsWritten).toEqual({ value: "0,612", unit: "kg" });
    expect(written("de-CH-semicolon.csv").freshAsWritten).toEqual({ value: "0.612", unit: "kg" });
  });

  it("asks, per column, when only whole grams with grouping are written (2.720, 1.205), and reads them once the grower chose", () => {
    const asked = parseSeasonLog(read("de-DE-comma-grams.csv"), options);
    expect(asked.issues.map(({ line, code, column, value }) => ({ line, code, column, value }))).toEqual([
      { line: 2, code: "ambiguous_decimal_mark", column: "Wet block (g)", value: "2.720" },
      { line: 4, code: "ambiguous_decimal_mark", column: "Fresh (g)", value: "1.205" },
    ]);
    expect(asked.detected.ambiguousDecimalColumns).toEqual(["Wet block (g)", "Fresh (g)"]);
    // Never a guess: the cells that read two ways stay empty until the grower chooses.
    expect(asked.records.map((record) => record.wetBlockGrams)).toEqual([null, null, null, null, null, null]);
    expect(asked.records.map((record) => record.freshGrams)).toEqual([612, 455, null, 398, null, null]);
    const chosen = parseSeasonLog(read("de-DE-comma-grams.csv"), {
      ...options,
      decimalByColumn: { "Wet block (g)": ",", "Fresh (g)": "," },
    });
    expect(chosen.issues).toEqual([]);
    expect(chosen.records.map((record) => [record.wetBlockGrams, record.freshGrams])).toEqual([
      [2720, 612],
      [2720, 455],
      [2680, 1205],
      [2745, 398],
      [2702, null],
      [3015, 1030],
    ]);
    expect(parseSeasonLog(read("de-DE-comma-grams.csv"), { ...options, decimal: "," }).issues).toEqual([]);
  });
});
