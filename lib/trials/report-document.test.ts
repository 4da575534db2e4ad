import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { analyseTrial, type OutcomeRecord, type TrialArmInfo } from "./analysis";
import { discloseTrialAnalysis, markOwnFarm, type StoredTrialResults } from "./report";
import { pdfSafeText, trialReportDocument, trialReportRows, type ReportTrial } from "./report-document";

// Invented trial on four farms: arm B gains on the reference arm A; farm keys stand for farm ids.
const arms: TrialArmInfo[] = [
  { id: "arm-a", label: "A", isReference: true },
  { id: "arm-b", label: "B", isReference: false },
];

function records(): OutcomeRecord[] {
  const random = seededRandom("report-document");
  return ["f1", "f2", "f3", "f4"].flatMap((farm, index) =>
    arms.flatMap((arm) => [
      ...Array.from({ length: 5 }, () => ({
        farm,
        armId: arm.id,
        value: random.normal(80 + index + (arm.id === "arm-b" ? 6 : 0), 4),
        contaminated: false,
      })),
      { farm, armId: arm.id, value: null, contaminated: true },
    ]),
  );
}

function trialAs(reader: "f2" | null, showPerFarmEstimates: boolean): ReportTrial {
  const rows = records();
  const { report, farms } = discloseTrialAnalysis(analyseTrial({ arms, records: rows, minimumFarms: 3 }), {
    arms,
    records: rows,
    minimumFarms: 3,
    showPerFarmEstimates,
    random: seededRandom("names"),
  });
  const own = reader ? farms.find((farm) => farm.farmKey === reader)! : null;
  const results: StoredTrialResults = {
    analysis: markOwnFarm(report, own),
    deviations: { farmsDropped: 1, farmsDeclined: 0, blocksAssigned: 48, blocksMade: 48, blocksLeftOut: 8 },
    analysedAt: "2026-11-20T09:30:00.000Z",
  };
  return {
    code: "T-2026-07",
    title: "Grey against pearl oyster",
    question: "Which oyster strain gives more over two flushes?",
    speciesName: "Oyster mushroom",
    publishedAt: new Date("2026-11-21T10:00:00Z"),
    outcomeFlushes: 2,
    contaminatedHandling: "exclude",
    protocolNotes: null,
    withdrawalsAfterPublication: 0,
    arms: [
      { label: "A", isReference: true, strainCode: "PO-7", strainName: "Grey oyster", treatmentName: null, treatmentKind: null },
      {
        label: "B",
        isReference: false,
        strainCode: "PO-9",
        strainName: "Pearl oyster",
        treatmentName: "Horizontal slits",
        treatmentKind: "fruiting_method",
      },
    ],
    results,
  };
}

const textOf = (document: ReturnType<typeof trialReportDocument>, page: number) =>
  document.pages[page]
    .flatMap((section) => [
      section.heading,
      ...section.paragraphs,
      ...section.tables.flatMap((table) => [table.title, ...table.columns, ...table.rows.flat()]),
    ])
    .join("\n");

describe("the trial report's pages", () => {
  it("opens with the trial, the answer and the arms by strain, and carries the figures and cautions of the report page", () => {
    const trial = trialAs(null, false);
    const document = trialReportDocument(trial);
    expect(document.pages).toHaveLength(2);
    expect(document.title).toBe("T-2026-07 — Grey against pearl oyster");
    expect(document.subtitle).toContain("Published 2026-11-21");
    const first = textOf(document, 0);
    expect(first).toContain(trial.results.analysis.answer);
    expect(first).toContain("40 blocks from 4 farms were analysed.");
    expect(first).toContain("PO-7 Grey oyster");
    expect(first).toContain("PO-9 Pearl oyster");
    const means = document.pages[0].flatMap((section) => section.tables).find((table) => table.title === "Adjusted mean BE")!;
    const meanA = trial.results.analysis.anova!.adjustedMeans[0];
    expect(means.rows[0]).toEqual([
      "A (reference)",
      "20",
      `${meanA.estimate.toFixed(1)} %`,
      `${meanA.lower.toFixed(1)} - ${meanA.upper.toFixed(1)} %`,
    ]);
    const second = textOf(document, 1);
    expect(second).toContain("Moulds and spores");
    expect(second).toContain("What a pooled figure means");
    expect(second).toContain("1 invited farm dropped out or never answered; 0 declined.");
    expect(second).toContain("8 blocks were left out of the BE comparison");
    expect(second).not.toMatch(/\bf[1-4]\b/);
  });

  it("marks the reader's own farm and no other, under the trial's pseudonyms", () => {
    const withRows = textOf(trialReportDocument(trialAs("f2", true)), 1);
    expect(withRows.match(/\(your farm\)/g)).toHaveLength(1);
    expect(withRows.match(/^Farm [A-D]$/gm)).toHaveLength(3);
    const observer = textOf(trialReportDocument(trialAs(null, true)), 1);
    expect(observer).not.toContain("your farm");
    expect(observer.match(/^Farm [A-D]$/gm)).toHaveLength(4);
    const ownOnly = textOf(trialReportDocument(trialAs("f2", false)), 1);
    expect(ownOnly).toContain("Your farm");
    expect(ownOnly).not.toMatch(/^Farm [A-D]/m);
  });
});

describe("the trial report's CSV rows", () => {
  it("gives each figure rounded as the page shows it, arms by strain, the reader's farm marked and nobody else's", () => {
    const trial = trialAs("f2", true);
    const rows = trialReportRows(trial);
    const meanB = trial.results.analysis.anova!.adjustedMeans[1];
    expect(rows.find((row) => row.table === "adjusted mean BE (%)" && String(row.arm).startsWith("B:"))).toMatchObject({
      trial: "T-2026-07",
      arm: "B: PO-9 Pearl oyster · Horizontal slits",
      blocks: 20,
      estimate: Number(meanB.estimate.toFixed(1)),
    });
    const difference = rows.find((row) => String(row.table).startsWith("difference"))!;
    expect(difference.compared_with).toBe("A: PO-7 Grey oyster");
    const farms = rows.filter((row) => row.table === "farm by farm difference (BE points)").map((row) => row.farm);
    expect(farms.filter((farm) => String(farm).endsWith("(your farm)"))).toHaveLength(1);
    expect(farms).toContain("all farms pooled");
    expect(rows.filter((row) => String(row.table).startsWith("contamination"))).toHaveLength(2);
    expect(JSON.stringify(rows)).not.toMatch(/"f[1-4]"/);
    for (const row of rows)
      for (const key of ["estimate", "lower", "upper"])
        if (typeof row[key] === "number") expect(row[key]).toBe(Number(row[key].toFixed(1)));
  });
});

describe("text for the PDF's built-in font", () => {
  it("keeps Windows-1252 characters and writes the others as a typewriter would", () => {
    expect(pdfSafeText("B − A: 5.1 (I² 12 %) — Tukey–Kramer · é ≥ 3")).toBe("B - A: 5.1 (I² 12 %) — Tukey–Kramer · é >= 3");
    expect(pdfSafeText("菌 strain")).toBe("? strain");
  });
});

describe("a room-level trial's report document", () => {
  it("says the unit is the room, with rooms per arm and the room-mean F test, and no room's own mean", () => {
    const trial = trialAs(null, false);
    const rooms: NonNullable<StoredTrialResults["rooms"]> = {
      unit: "room",
      roomsPerArm: [
        { label: "A", rooms: 6 },
        { label: "B", rooms: 6 },
      ],
      iccObserved: 0.12,
      anova: { arm: { df: 1, ss: 10, ms: 10, f: 4.5, p: 0.06 }, farm: { df: 2, ss: 4, ms: 2, f: 0.9, p: 0.4 }, residualDf: 8 },
      adjustedMeans: [
        { treatment: "A", estimate: 80, lower: 76, upper: 84 },
        { treatment: "B", estimate: 85, lower: 81, upper: 89 },
      ],
      versusReference: [{ arm: "B", versus: "A", estimate: 5, se: 2, lower: -0.5, upper: 10.5, pAdjusted: 0.06 }],
      betweenArms: [],
      roomsAnalysed: 12,
      notes: [],
      answer: "B and the reference could not be told apart.",
    };
    const text = JSON.stringify(trialReportDocument({ ...trial, results: { ...trial.results, rooms } }).pages[0]);
    expect(text).toContain("The unit of this trial is the fruiting room");
    expect(text).toContain("Rooms analysed: arm A 6 rooms, arm B 6 rooms.");
    expect(text).toContain("intraclass correlation of 0.12");
    expect(text).toContain("F = 4.50 on 1 and 8 degrees of freedom (rooms)");
    expect(JSON.stringify(trialReportDocument(trial).pages[0])).not.toContain("fruiting room");
  });
});
