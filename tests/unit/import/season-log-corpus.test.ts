import { readFileSync, readdirSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { type SeasonLogOptions, type SeasonRecord, createSeasonLogParser, parseSeasonLog } from "@/lib/import";

const corpus = path.resolve(__dirname, "../../fixtures/season-logs");

interface Expected {
  about: string;
  options: SeasonLogOptions;
  detected: {
    encoding: string;
    delimiter: string;
    decimal: string;
    dateOrder: string | null;
    format: string;
    certain: boolean;
    unmatched: string[];
    uncertain: string[];
  };
  /** Matched on code, never on wording; `value` is the cell as written. */
  issues: { line: number; severity: string; column?: string; code: string; value?: string }[];
  records: Partial<SeasonRecord>[];
}

const checkedFields = [
  "line",
  "blockCode",
  "strainCode",
  "substrate",
  "inoculatedOn",
  "seasonYear",
  "fruitingRoom",
  "wetBlockGrams",
  "moisture",
  "flush",
  "harvestedOn",
  "freshGrams",
  "dryGrams",
  "contaminated",
  "contaminatedOn",
  "spentGrams",
  "notes",
] as const;
const files = readdirSync(corpus)
  .filter((name) => !name.endsWith(".expected.json"))
  .sort();

describe("season-log corpus", () => {
  it("has at least 40 awkward files, each with its expectations", () => {
    expect(files.length).toBeGreaterThanOrEqual(40);
    for (const file of files) expect(readdirSync(corpus)).toContain(`${file.replace(/\.(csv|tsv)$/, "")}.expected.json`);
  });

  for (const file of files) {
    const expected = JSON.parse(readFileSync(path.join(corpus, `${file.replace(/\.(csv|tsv)$/, "")}.expected.json`), "utf8")) as Expected;
    it(`${file}: ${expected.about}`, () => {
      const result = parseSeasonLog(new Uint8Array(readFileSync(path.join(corpus, file))), expected.options);
      const { mapping, ...detected } = result.detected;
      expect({ ...detected, certain: mapping.certain, unmatched: mapping.unmatched, uncertain: mapping.uncertain }).toEqual(
        expected.detected,
      );
      expect(result.issues.map(({ line, severity, column, code, value }) => ({ line, severity, column, code, value }))).toEqual(
        expected.issues.map(({ line, severity, column, code, value }) => ({ line, severity, column, code, value })),
      );
      for (const issue of result.issues) {
        if (issue.column !== undefined) expect(issue.message).toMatch(new RegExp(`^Lines? ${issue.line}\\b`));
      }
      expect(result.records).toHaveLength(expected.records.length);
      result.records.forEach((record, index) => {
        for (const field of checkedFields) {
          const want = expected.records[index][field] ?? (field === "contaminated" ? false : null);
          expect(record[field], `${file} record ${index} ${field}`).toEqual(want);
        }
      });
    });
  }

  it("gives the same result when a file arrives in chunks of 1, 7 and 4096 bytes", () => {
    for (const file of [
      "european-semicolon.csv",
      "windows-1252-accents.csv",
      "embedded-newlines.csv",
      "utf8-bom.csv",
      "lone-carriage-returns.csv",
      "wide-form-dated-ounces.csv",
    ]) {
      const bytes = new Uint8Array(readFileSync(path.join(corpus, file)));
      const whole = parseSeasonLog(bytes, { today: "2026-12-31" });
      for (const size of [1, 7, 4096]) {
        const parser = createSeasonLogParser({ today: "2026-12-31" });
        for (let offset = 0; offset < bytes.length; offset += size) parser.write(bytes.subarray(offset, offset + size));
        expect(parser.end(), `${file} in chunks of ${size}`).toEqual(whole);
      }
    }
  });
});

describe("junk generated at run time", () => {
  it("a header of 10 000 columns: the known ones are used, the rest reported once", () => {
    const extra = Array.from({ length: 9_996 }, (_, index) => `extra_${index}`);
    const text = `${["block_id", "strain", "flush", "fresh_weight", ...extra].join(",")}\nB-1,PO-03,1,500 g${",".repeat(extra.length)}\n`;
    const result = parseSeasonLog(text, { today: "2026-12-31" });
    expect(result.records).toHaveLength(1);
    expect(result.records[0].freshGrams).toBe(500);
    expect(result.detected.mapping.unmatched).toHaveLength(9_996);
    expect(result.issues).toHaveLength(1);
    expect(result.issues[0]).toMatchObject({ line: 1, severity: "warning" });
    expect(result.issues[0].message).toContain("and 9986 more");
  });

  it("a row of 10 000 junk columns with no header match is an error, not a crash", () => {
    const junk = Array.from({ length: 10_000 }, (_, index) => `c${index}`).join(";");
    const result = parseSeasonLog(`${junk}\n${junk}\n`);
    expect(result.records).toEqual([]);
    expect(result.issues.map((issue) => issue.severity)).toEqual(["error"]);
    expect(result.issues[0].message).toContain("should name the columns");
  });

  it("a 2 MB single cell is reported with its length and a shortened value", () => {
    const note = "x".repeat(2 * 1024 * 1024);
    const result = parseSeasonLog(`block_id,strain,flush,fresh_weight,notes\nB-1,PO-03,1,500 g,"${note}"\nB-1,PO-03,2,300 g,ok\n`);
    expect(result.records).toHaveLength(2);
    expect(result.records[0].notes).toBeNull();
    expect(result.issues).toHaveLength(1);
    expect(result.issues[0]).toMatchObject({ line: 2, column: "notes", severity: "error" });
    expect(result.issues[0].message).toContain("2097152 characters");
    expect((result.issues[0].value ?? "").length).toBeLessThanOrEqual(201);
  });

  it("random bytes are reported as not a CSV file", () => {
    let state = 99;
    const bytes = new Uint8Array(100_000).map(() => {
      state = (state * 1_103_515_245 + 12_345) >>> 0;
      return state >>> 24;
    });
    const result = parseSeasonLog(bytes);
    expect(result.records).toEqual([]);
    expect(result.issues).toHaveLength(1);
    expect(result.issues[0].message).toContain("not a CSV text file");
  });
});
