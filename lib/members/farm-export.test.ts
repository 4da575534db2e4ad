import { describe, expect, it } from "vitest";
import { exportFiles, exportReadme, originalFileName, withdrawalConfirmed } from "./farm-export";

describe("the farm's data download", () => {
  it("describes every column of every CSV in the README", () => {
    const readme = exportReadme({
      farmName: "Fernbrook",
      cooperativeName: "Alder Valley",
      exportedAt: new Date("2026-06-01T00:00:00Z"),
      counts: { blocks: 3, harvests: 7, uploads: 1, changes: 0, activity: 4 },
    });
    for (const spec of Object.values(exportFiles)) {
      expect(readme).toContain(spec.file);
      for (const column of spec.columns) expect(readme).toContain(`${column.header}: `);
    }
    expect(readme).toContain("harvests.csv (7 rows)");
  });

  it("names original files safely and uniquely", () => {
    expect(originalFileName(0, "season 2026.csv")).toBe("originals/0001-season_2026.csv");
    expect(originalFileName(11, "../../etc/passwd")).toBe("originals/0012-etc_passwd");
    expect(originalFileName(2, "")).toBe("originals/0003-file");
  });
});

describe("withdrawal confirmation", () => {
  it("needs the farm's own name", () => {
    expect(withdrawalConfirmed("Fernbrook Farm", " fernbrook  farm ")).toBe(true);
    expect(withdrawalConfirmed("Fernbrook Farm", "Fernbrook")).toBe(false);
    expect(withdrawalConfirmed("Fernbrook Farm", "")).toBe(false);
  });
});
