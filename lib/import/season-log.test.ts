import { describe, expect, it } from "vitest";
import { generateSeasonLog } from "./generate";
import { createSeasonLogParser, parseMass, parseSeasonLog, seasonLogColumnNames, seasonLogColumns, seasonLogTemplateCsv } from "./index";

describe("the published schema", () => {
  it("lists the 19 columns of schema version 3 in order, each explained with examples", () => {
    expect(seasonLogColumnNames).toEqual([
      "block_id",
      "strain",
      "substrate",
      "trial",
      "arm",
      "inoculated_on",
      "season",
      "block_wet_weight",
      "substrate_moisture",
      "fruiting_method",
      "fruiting_room",
      "flush",
      "harvested_on",
      "fresh_weight",
      "dry_weight",
      "contaminated",
      "contaminated_on",
      "spent_weight",
      "notes",
    ]);
    expect(seasonLogColumns.map((column) => column.name)).toEqual([...seasonLogColumnNames]);
    for (const column of seasonLogColumns) {
      expect(column.meaning.length).toBeGreaterThan(20);
      expect(column.examples.some((example) => example !== "")).toBe(true);
    }
    expect(seasonLogColumns.filter((column) => column.required === "always").map((column) => column.name)).toEqual(["block_id", "strain"]);
    expect(seasonLogColumns.filter((column) => column.required === "harvest").map((column) => column.name)).toEqual([
      "flush",
      "fresh_weight",
    ]);
  });

  it("gives a template that reads back without a single issue", () => {
    const template = seasonLogTemplateCsv();
    expect(template.split("\r\n")[0]).toBe(seasonLogColumnNames.join(","));
    const result = parseSeasonLog(template, { today: "2026-12-31" });
    expect(result.issues).toEqual([]);
    expect(result.records.map((record) => [record.blockCode, record.flush, record.freshGrams])).toEqual([
      ["B-001", 1, 640],
      ["B-001", 2, 410],
      ["B-002", null, null],
    ]);
  });
});

describe("parseMass from lib/import", () => {
  it("is the units module's parser (NIST Handbook 44, Appendix C: 1 lb 4 oz = 566.990 462 5 g)", () => {
    expect(parseMass("1 lb 4 oz")).toEqual({ grams: 566.9904625 });
  });
});

describe("parseSeasonLog", () => {
  it("computes biological efficiency inputs exactly: 5 lb at 60 % is 2 lb dry, a 2 lb harvest is not flagged", () => {
    const text = "block_id,strain,block_wet_weight,substrate_moisture,flush,fresh_weight\nB-1,PO-03,5 lb,60 %,1,2 lb\n";
    const result = parseSeasonLog(text, { today: "2026-12-31" });
    expect(result.issues).toEqual([]);
    expect(result.records[0].wetBlockGrams).toBeCloseTo(2267.96185, 9);
    expect(result.records[0].wetBlockAsWritten).toEqual({ value: "5 lb", unit: "lb" });
    expect(result.records[0].freshGrams).toBeCloseTo(907.18474, 9);
  });

  it("warns just above 250 % and not at it", () => {
    const at = "block_id,strain,block_wet_weight,substrate_moisture,flush,fresh_weight\nB-1,PO-03,2500 g,62 %,1,2375 g\n";
    expect(parseSeasonLog(at).issues).toEqual([]);
    const above = at.replace("2375 g", "2376 g");
    expect(parseSeasonLog(above).issues.map((issue) => issue.severity)).toEqual(["warning"]);
  });

  it("uses the date order the upload chose and reports dates that do not fit it", () => {
    const text = "block_id,strain,inoculated_on\nB-1,PO-03,03/04/2026\nB-2,PO-03,03/21/2026\n";
    const result = parseSeasonLog(text, { dateOrder: "dmy" });
    expect(result.detected.dateOrder).toBe("dmy");
    expect(result.records.map((record) => record.inoculatedOn)).toEqual(["2026-04-03", null]);
    expect(result.issues.map((issue) => [issue.line, issue.column, issue.value])).toEqual([[3, "inoculated_on", "03/21/2026"]]);
  });

  it("fills blank block columns from the block's other rows", () => {
    const text = "block_id,strain,substrate,block_wet_weight,flush,fresh_weight\nB-1,PO-03,,,1,500 g\nB-1,PO-03,HW-80/20,2.5 kg,2,300 g\n";
    const [first] = parseSeasonLog(text).records;
    expect(first.substrate).toBe("HW-80/20");
    expect(first.wetBlockGrams).toBe(2500);
    expect(first.wetBlockAsWritten).toEqual({ value: "2.5 kg", unit: "kg" });
  });

  it("accepts text with a byte-order mark as well as bytes", () => {
    const result = parseSeasonLog("\ufeffblock_id,strain\nB-1,PO-03\n");
    expect(result.detected.mapping.used).toEqual({ block_id: "block_id", strain: "strain" });
    expect(result.records).toHaveLength(1);
  });
});

describe("createSeasonLogParser", () => {
  it("reads a large file in chunks, reports progress and matches the one-shot parse", () => {
    const text = generateSeasonLog({ rows: 5_000, seed: 3, style: "european" });
    const bytes = new TextEncoder().encode(text);
    const progress: number[] = [];
    const parser = createSeasonLogParser({ today: "2026-12-31", onProgress: ({ rows }) => progress.push(rows), progressEvery: 1_000 });
    for (let offset = 0; offset < bytes.length; offset += 65_536) parser.write(bytes.subarray(offset, offset + 65_536));
    const result = parser.end();
    expect(progress).toEqual([1_000, 2_000, 3_000, 4_000, 5_000, 5_000]);
    expect(result.records).toHaveLength(5_000);
    expect(result.issues).toEqual([]);
    expect(result).toEqual(parseSeasonLog(bytes, { today: "2026-12-31" }));
  });

  it("reads every generated style without issues", () => {
    for (const style of ["template", "european", "imperial"] as const) {
      const result = parseSeasonLog(generateSeasonLog({ rows: 2_000, seed: 11, style }), {
        today: "2026-12-31",
        knownStrains: ["PO-03", "PO-07", "LM-01", "SH-12", "TT-02", "RE-01"],
      });
      expect(result.issues, style).toEqual([]);
      expect(result.records, style).toHaveLength(2_000);
    }
  });
});
