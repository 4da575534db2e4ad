import { readFileSync, readdirSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parseSeasonLog } from "@/lib/import";

// csv-spectrum (npm, dev dependency): CSV edge cases, each with the JSON a correct reader gives.
const spectrum = path.dirname(createRequire(import.meta.url).resolve("csv-spectrum/package.json"));
const names = readdirSync(path.join(spectrum, "csvs")).map((file) => file.replace(/\.csv$/, ""));

describe("the csv-spectrum corpus read as season logs", () => {
  it("has its eleven cases", () => expect(names.length).toBeGreaterThanOrEqual(11));

  for (const name of names) {
    it(`${name}: every value arrives in the column it was mapped to`, () => {
      const csv = readFileSync(path.join(spectrum, "csvs", `${name}.csv`));
      // One case's JSON is a single object rather than a list of one.
      const parsed = JSON.parse(readFileSync(path.join(spectrum, "json", `${name}.json`), "utf8")) as
        Record<string, string>[] | Record<string, string>;
      const rows = Array.isArray(parsed) ? parsed : [parsed];
      // location_coordinates' JSON gives another phone number than its CSV (upstream's slip), so that column is left out.
      const headers = Object.keys(rows[0]).filter((header) => header !== "Contact Phone Number");
      const targets = ["block_id", "strain", "notes"];
      const mapping = Object.fromEntries(Object.keys(rows[0]).map((header) => [header, targets[headers.indexOf(header)] ?? "ignore"]));
      const result = parseSeasonLog(new Uint8Array(csv), { mapping, today: "2026-12-31" });
      expect(result.records.map((record) => [record.blockCode, record.strainCode, record.notes])).toEqual(
        rows.map((row) => [
          row[headers[0]].trim(),
          row[headers[1]].trim(),
          headers[2] === undefined ? null : row[headers[2]].trim() || null,
        ]),
      );
      // The only problems are the cells the corpus leaves empty on purpose.
      const expected = rows.flatMap((row, index) => (row[headers[1]].trim() === "" ? [{ code: "strain_missing", record: index }] : []));
      expect(
        result.issues.map((issue) => ({ code: issue.code, record: result.records.findIndex((record) => record.line === issue.line) })),
      ).toEqual(expected);
      expect(result.detected.delimiter).toBe(",");
    });
  }
});
