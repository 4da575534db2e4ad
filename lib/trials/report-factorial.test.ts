import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { analyseFactorialTrial, factorialDesignFromArms } from "./factorial";
import { trialOutcomeRecords } from "./outcome";
import { trialReport } from "./report";
import { trialReportDocument, trialReportRows, type ReportTrial } from "./report-document";

// Invented crossed trial: two strains × two fruiting methods on four farms; farm keys stand for farm ids.
const arms = [
  { strain: "grey", strainName: "Grey Morning", method: "top", methodName: "Opened top" },
  { strain: "grey", strainName: "Grey Morning", method: "slits", methodName: "Horizontal slits" },
  { strain: "valley", strainName: "Valley Wild", method: "top", methodName: "Opened top" },
  { strain: "valley", strainName: "Valley Wild", method: "slits", methodName: "Horizontal slits" },
].map((arm, index) => ({
  id: `arm-${index}`,
  label: String.fromCharCode(65 + index),
  isReference: index === 0,
  strainId: arm.strain,
  strainName: arm.strainName,
  treatmentId: arm.method,
  treatmentName: arm.methodName,
}));

function closing(designKind: "one_factor" | "strain_by_method", farms = ["f1", "f2", "f3", "f4"]) {
  const random = seededRandom("crossed report");
  const blockRows: Parameters<typeof trialReport>[0]["blockRows"] = [];
  const harvestRows: Parameters<typeof trialReport>[0]["harvestRows"] = [];
  for (const farm of farms) {
    const farmEffect = random.normal(0, 6);
    for (const arm of arms) {
      for (let block = 0; block < 5; block++) {
        const id = `${farm}-${arm.id}-${block}`;
        // 1 000 g dry substrate: BE % = fresh grams ÷ 10. Slits +6 for both strains, Valley Wild +3.
        const be = 75 + farmEffect + (arm.treatmentId === "slits" ? 6 : 0) + (arm.strainId === "valley" ? 3 : 0) + random.normal(0, 3);
        blockRows.push({ id, farmId: farm, armId: arm.id, wetMassG: 2500, moisture: 0.6, contaminated: false, spentMassG: null });
        harvestRows.push({ blockId: id, flush: 1, freshMassG: be * 7 }, { blockId: id, flush: 2, freshMassG: be * 3 });
      }
    }
  }
  const input = {
    arms,
    blockRows,
    harvestRows,
    outcome: { flushes: 2, contaminatedHandling: "exclude" as const },
    minimumFarms: 3,
    showPerFarmEstimates: false,
    random: seededRandom("names"),
    enrolments: farms.map(() => ({ status: "accepted" })),
    blocksAssigned: farms.length * 20,
    assignedByArm: Object.fromEntries(arms.map((arm) => [arm.id, farms.length * 5])),
    design: { designKind, smallestDifference: 6, expectedSd: 5, plannedFarms: 4, expectedLoss: 0 },
    analysedAt: "2026-01-01T00:00:00.000Z",
  };
  return { input, results: trialReport(input).results };
}

describe("the report of a trial crossing strains with fruiting methods", () => {
  it("stores the crossed analysis, method first, and answers with it", () => {
    const { input, results } = closing("strain_by_method");
    const design = factorialDesignFromArms(
      arms.map((arm) => ({
        id: arm.id,
        isReference: arm.isReference,
        strain: { id: arm.strainId, name: arm.strainName },
        treatment: { id: arm.treatmentId, name: arm.treatmentName },
      })),
      { name: "fruiting method", plural: "fruiting methods" },
      { lead: "treatment" },
    )!;
    const direct = analyseFactorialTrial({
      design,
      records: trialOutcomeRecords(input.blockRows, input.harvestRows, input.outcome),
      minimumFarms: 3,
    });
    expect(results.factorial).toEqual(direct);
    expect(results.analysis.answer).toBe(direct.answer);
    expect(results.analysis.answer).toMatch(/^Horizontal slits gave \d+ BE points more than opened top, across both strains/);
    // The arm-by-arm figures stay beside it.
    expect(results.analysis.versusReference).toHaveLength(3);
  });

  it("puts the terms, the combinations' means and the comparisons in the PDF", () => {
    const { results } = closing("strain_by_method");
    const trial: ReportTrial = {
      code: "T-2026-09",
      title: "Slits or an opened top",
      question: "Do slits give more?",
      speciesName: "Oyster",
      publishedAt: new Date("2026-01-02T00:00:00Z"),
      outcomeFlushes: 2,
      contaminatedHandling: "exclude",
      protocolNotes: null,
      withdrawalsAfterPublication: 0,
      arms: arms.map((arm) => ({ ...arm, strainCode: arm.strainId.toUpperCase(), treatmentKind: "fruiting_method" })),
      results,
    };
    const section = trialReportDocument(trial).pages[0].find((candidate) => candidate.heading.startsWith("Does the fruiting method"))!;
    expect(section.tables.map((table) => table.title)).toEqual([
      "Terms of the model",
      "Farm-adjusted mean BE of each fruiting method with each strain",
      "Fruiting methods compared, averaged over the strains (Tukey)",
      "Strains compared, averaged over the fruiting methods (Tukey)",
    ]);
    expect(section.tables[0].rows.map((row) => row[0])).toEqual(["Fruiting method", "Strain", "Fruiting method x strain", "Farm"]);
    expect(section.tables[1].rows[0].slice(0, 3)).toEqual(["Opened top", "Grey Morning", "20"]);
    // The CSV carries the same figures, rounded to 0.1 as the page shows them.
    const csv = trialReportRows(trial);
    const slits = csv.find((row) => row.table === "fruiting method difference averaged over strains (BE points, Tukey)")!;
    expect(slits).toMatchObject({ arm: "Horizontal slits", compared_with: "Opened top" });
    expect(slits.estimate).toBe(Number(results.factorial!.mainEffects[0][0].estimate.toFixed(1)));
    expect(csv.filter((row) => String(row.table).startsWith("mean BE (%) of each fruiting method"))).toHaveLength(4);
  });

  it("gives a one-factor trial no crossed analysis, and names its arms by strain and method", () => {
    const { results } = closing("one_factor");
    expect(results.factorial).toBeUndefined();
    expect(results.analysis.answer).toMatch(
      /^Grey Morning with horizontal slits \(arm B\) gave more than the reference, Grey Morning with opened top \(arm A\)/,
    );
  });

  it("publishes no crossed figure below the co-op's minimum number of farms", () => {
    const { results } = closing("strain_by_method", ["f1", "f2"]);
    expect(results.factorial?.anova).toBeNull();
    expect(results.factorial?.blocksAnalysed).toBe(0);
    expect(results.analysis.answer).toBe("No answer yet: 2 farms reported, and the co-op needs 3 before it pools.");
  });
});
