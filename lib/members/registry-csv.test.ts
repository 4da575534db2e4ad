import { describe, expect, it } from "vitest";
import { describeProblem, parseRegistryCsv } from "./registry-csv";

describe("registry CSV import", () => {
  it("reads strains, forgiving header case and the source's spelling", () => {
    const { rows, problems } = parseRegistryCsv(
      "strains",
      "Code,Species,Name,Source,Notes\npo-04,Pleurotus ostreatus,Ridge Grey,Culture bank,\nHE-09,Hericium erinaceus,Creek Beard,own isolate,from 2025 log\n",
    );
    expect(problems).toEqual([]);
    expect(rows).toEqual([
      { kind: "strains", code: "PO-04", species: "Pleurotus ostreatus", name: "Ridge Grey", source: "culture_bank", notes: "" },
      { kind: "strains", code: "HE-09", species: "Hericium erinaceus", name: "Creek Beard", source: "own_isolate", notes: "from 2025 log" },
    ]);
  });

  it("turns a moisture percentage into the stored fraction", () => {
    const { rows, problems } = parseRegistryCsv(
      "substrate_recipes",
      "code,name,base,supplement,supplement_percent,target_moisture_percent,treatment\nOAK-10,Oak with bran,Oak sawdust,Wheat bran,10,62%,sterilized\n",
    );
    expect(problems).toEqual([]);
    expect(rows[0]).toMatchObject({ code: "OAK-10", supplementPercent: 10, targetMoisture: 0.62, treatment: "sterilised" });
  });

  it("names line, column and value of every problem and keeps no bad row", () => {
    const { rows, problems } = parseRegistryCsv(
      "substrate_recipes",
      "code,name,base,target_moisture_percent,treatment\nA,One,Oak,62,steamed\nB,Two,Oak,140,pasteurised\nA,Again,Oak,60,sterilised\n",
    );
    expect(rows).toEqual([]);
    expect(problems.map(describeProblem)).toEqual([
      'Line 2, column treatment ("steamed"): Use sterilised or pasteurised.',
      'Line 3, column target_moisture_percent ("140"): Give a percentage from 0 to 99, e.g. 62.',
      'Line 4, column code ("A"): Repeats line 2: each entry once.',
    ]);
  });

  it("says which columns a header lacks", () => {
    const { problems } = parseRegistryCsv("species", "latin,common\nX,Y\n");
    expect(problems[0]).toMatchObject({ line: 1, column: "scientific_name" });
    expect(problems[0].message).toContain("Expected columns: scientific_name, common_name");
  });
});
