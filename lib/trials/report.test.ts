import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { analyseTrial, type OutcomeRecord, type TrialArmInfo } from "./analysis";
import { discloseTrialAnalysis, markOwnFarm, trialReport } from "./report";
import { trialSampleSize } from "./sample-size";

// Invented trial: arms A (reference), B and C; farm keys stand for farm ids.
const arms: TrialArmInfo[] = [
  { id: "arm-a", label: "A", isReference: true },
  { id: "arm-b", label: "B", isReference: false },
  { id: "arm-c", label: "C", isReference: false },
];

function records(farms: string[], seed: string, options: { armCFarms?: string[]; blocks?: number } = {}): OutcomeRecord[] {
  const random = seededRandom(seed);
  return farms.flatMap((farm, index) =>
    arms.flatMap((arm) => {
      if (arm.id === "arm-c" && options.armCFarms && !options.armCFarms.includes(farm)) return [];
      const level = 80 + (arm.id === "arm-b" ? 6 + 3 * index : arm.id === "arm-c" ? 2 : 0) + index;
      return [
        ...Array.from({ length: options.blocks ?? 6 }, () => ({
          farm,
          armId: arm.id,
          value: random.normal(level, 5),
          contaminated: false,
        })),
        { farm, armId: arm.id, value: null, contaminated: true },
      ];
    }),
  );
}

function disclose(rows: OutcomeRecord[], showPerFarmEstimates: boolean, seed = "names") {
  return discloseTrialAnalysis(analyseTrial({ arms, records: rows, minimumFarms: 3 }), {
    arms,
    records: rows,
    minimumFarms: 3,
    showPerFarmEstimates,
    random: seededRandom(seed),
  });
}

const farms = ["f1", "f2", "f3", "f4"];

describe("what a trial report publishes", () => {
  it("shows no other farm's row unless the co-op allows it, but gives every farm a pseudonym and its own estimates", () => {
    const { report, farms: reportFarms } = disclose(records(farms, "off"), false);
    expect(report.perFarmRows).toBe(false);
    for (const pooling of report.farmPooling) {
      expect(pooling.farms).toEqual([]);
      expect(pooling.pooled).not.toBeNull();
    }
    expect(reportFarms.map((farm) => farm.pseudonym).sort()).toEqual(["Farm A", "Farm B", "Farm C", "Farm D"]);
    expect(reportFarms.every((farm) => farm.ownEstimates.length === 2)).toBe(true);
    expect(JSON.stringify(report)).not.toMatch(/"f[1-4]"/);
  });

  it("names farms with pseudonyms drawn at random, listed in pseudonym order", () => {
    const rows = records(farms, "on");
    const firstFarmNames = new Set<string>();
    for (const seed of ["one", "two", "three", "four", "five", "six", "seven", "eight"]) {
      const { report, farms: reportFarms } = disclose(rows, true, seed);
      const rowsShown = report.farmPooling[0].farms;
      expect(rowsShown.map((row) => row.farm)).toEqual(["Farm A", "Farm B", "Farm C", "Farm D"]);
      firstFarmNames.add(reportFarms.find((farm) => farm.farmKey === "f1")!.pseudonym);
      // The row under f1's pseudonym is f1's estimate.
      const own = reportFarms.find((farm) => farm.farmKey === "f1")!;
      expect(rowsShown.find((row) => row.farm === own.pseudonym)!.estimate).toBe(own.ownEstimates[0].estimate);
    }
    // With names in id order, f1 would always be Farm A.
    expect(firstFarmNames.size).toBeGreaterThan(1);
  });

  it("marks the reading farm's own row and nobody else's, with or without other farms' rows", () => {
    const rows = records(farms, "marks");
    for (const perFarm of [true, false]) {
      const { report, farms: reportFarms } = disclose(rows, perFarm);
      const own = reportFarms.find((farm) => farm.farmKey === "f3")!;
      const read = markOwnFarm(report, own);
      for (const [index, pooling] of read.farmPooling.entries()) {
        const marked = pooling.farms.filter((row) => row.own);
        expect(marked).toHaveLength(1);
        expect(marked[0].estimate).toBe(own.ownEstimates[index].estimate);
        expect(pooling.farms).toHaveLength(perFarm ? 4 : 1);
      }
      expect(markOwnFarm(report, null).farmPooling.flatMap((pooling) => pooling.farms.filter((row) => row.own))).toEqual([]);
    }
  });

  it("publishes no count, spread or contamination of a trial analysed on one farm", () => {
    const { report } = disclose(records(["f1"], "alone"), true);
    expect(report.blocksAnalysed).toBeNull();
    expect(report.blocksLeftOut).toBeNull();
    for (const arm of report.arms)
      expect(arm).toEqual({ label: arm.label, n: null, spread: null, contamination: null, withheld: "fewer than 3 farms" });
    expect(report.farmPooling).toEqual([]);
  });

  it("leaves out an arm that fewer than the minimum number of farms ran, from every table and from the answer", () => {
    const { report } = disclose(records(farms, "arm c", { armCFarms: ["f1", "f2"] }), true);
    const armC = report.arms.find((arm) => arm.label === "C")!;
    expect(armC.withheld).toBe("fewer than 3 farms");
    expect(report.anova?.adjustedMeans.map((mean) => mean.treatment)).toEqual(["A", "B"]);
    expect([...report.versusReference, ...report.betweenArms].some((row) => row.arm === "C" || row.versus === "C")).toBe(false);
    expect(report.farmPooling.map((pooling) => pooling.arm)).toEqual(["B"]);
    expect(report.answer).not.toContain("Arm C");
    expect(report.notes.join(" ")).toMatch(/Arm C: run on fewer than 3 farms/);
  });

  it("draws no single block's value: percentiles only with three blocks beyond them, from whole-point bins", () => {
    const rows = records(farms, "blocks", { blocks: 4 });
    const { report } = disclose(rows, true);
    const values = rows.flatMap((row) => (row.value === null ? [] : [row.value]));
    const drawn = report.arms.flatMap((arm) => arm.spread ?? []).filter((value): value is number => value !== null);
    expect(drawn.length).toBeGreaterThan(0);
    for (const value of drawn) {
      expect(value % 1).toBe(0.5);
      expect(values.some((block) => Math.abs(block - value) < 1e-9)).toBe(false);
    }
    // Each drawn value has at least three of its arm's blocks in or below its bin, and three in or above it.
    for (const arm of report.arms) {
      const armValues = rows.filter((row) => row.armId === arms.find((entry) => entry.label === arm.label)!.id && row.value !== null);
      for (const value of arm.spread ?? []) {
        if (value === null) continue;
        expect(armValues.filter((row) => row.value! < value + 0.5).length).toBeGreaterThanOrEqual(3);
        expect(armValues.filter((row) => row.value! >= value - 0.5).length).toBeGreaterThanOrEqual(3);
      }
      // 16 blocks: the 10th percentile would be the second lowest block's bin, so that whisker is left out.
      expect(arm.spread?.[0]).toBeNull();
    }
  });

  it("pools farm by farm only from the minimum number of farms", () => {
    // Farm f3 ran arm B with a single block: three farms ran B, but only two can give a farm's difference.
    let kept = 0;
    const rows = records(["f1", "f2", "f3"], "two pooled").filter(
      (row) => !(row.farm === "f3" && row.armId === "arm-b" && row.value !== null && kept++ > 0),
    );
    const { report } = disclose(rows, true);
    const armB = report.farmPooling.find((pooling) => pooling.arm === "B")!;
    expect(report.arms.find((arm) => arm.label === "B")!.withheld).toBeNull();
    expect(armB.farms).toHaveLength(2);
    expect(armB.pooled).toBeNull();
    expect(armB.note).toMatch(/Fewer than 3 farms ran both arms/);
  });
});

describe("deviations from the plan", () => {
  // Invented: four farms, arms A and B, 4 blocks listed per farm on arm A, 5 on arm B; 2500 g wet at 60 % moisture.
  const twoArms = arms.slice(0, 2);
  function closing(handling: "exclude" | "count_as_zero", farmKeys = farms) {
    const blockRows: Parameters<typeof trialReport>[0]["blockRows"] = [];
    const harvestRows: Parameters<typeof trialReport>[0]["harvestRows"] = [];
    const random = seededRandom("deviations");
    for (const farm of farmKeys) {
      for (const arm of twoArms) {
        // Per farm and arm: 2 finished, 1 only through flush 1 (unfinished) and, on arm B, 1 contaminated and 1 without its wet mass.
        const kinds = arm.id === "arm-b" ? ["done", "done", "flush1", "contaminated", "nomass"] : ["done", "done", "flush1"];
        kinds.forEach((kind, index) => {
          const id = `${farm}-${arm.id}-${index}`;
          blockRows.push({
            id,
            farmId: farm,
            armId: arm.id,
            wetMassG: kind === "nomass" ? null : 2500,
            moisture: 0.6,
            contaminated: kind === "contaminated",
            spentMassG: null,
          });
          if (kind === "contaminated") return;
          for (const flush of kind === "flush1" ? [1] : [1, 2])
            harvestRows.push({ blockId: id, flush, freshMassG: random.normal(flush === 1 ? 450 : 300, 40) });
        });
      }
    }
    return trialReport({
      arms: twoArms,
      blockRows,
      harvestRows,
      outcome: { flushes: 2, contaminatedHandling: handling },
      minimumFarms: 3,
      showPerFarmEstimates: false,
      random: seededRandom("names"),
      enrolments: farmKeys.map(() => ({ status: "accepted" })),
      blocksAssigned: farmKeys.length * 9,
      assignedByArm: { "arm-a": farmKeys.length * 4, "arm-b": farmKeys.length * 5 },
      design: { smallestDifference: 10, expectedSd: 12, plannedFarms: 5, expectedLoss: 0.1 },
      analysedAt: "2026-01-01T00:00:00.000Z",
    }).results;
  }

  it("lists every left-out block by reason and arm, and never counts an unfinished block", () => {
    const results = closing("exclude");
    expect(results.deviations.byArm).toEqual([
      {
        label: "A",
        counts: {
          listed: 16,
          inSeasonLog: 12,
          analysed: 8,
          countedAsZero: 0,
          leftOut: { contaminated: 0, lost: 0, unfinished: 4, no_harvest: 0 },
        },
      },
      {
        label: "B",
        counts: {
          listed: 20,
          inSeasonLog: 20,
          analysed: 8,
          countedAsZero: 0,
          leftOut: { contaminated: 4, lost: 4, unfinished: 4, no_harvest: 0 },
        },
      },
    ]);
    expect(results.analysis.blocksAnalysed).toBe(16);
    expect(results.deviations.blocksLeftOut).toBe(16);
  });

  it("counts contaminated blocks as 0 % only where the protocol says so, and says how many", () => {
    const results = closing("count_as_zero");
    expect(results.deviations.byArm![1].counts).toMatchObject({
      analysed: 12,
      countedAsZero: 4,
      leftOut: { contaminated: 0, unfinished: 4 },
    });
    expect(results.analysis.blocksAnalysed).toBe(20);
  });

  it("puts the planned sample size beside the achieved one", () => {
    const plan = closing("exclude").deviations.plan!;
    const designed = trialSampleSize({ difference: 10, sd: 12, plannedFarms: 5, expectedLoss: 0.1, arms: 2 }, [0.8]);
    expect(designed.ok).toBe(true);
    if (!designed.ok) return;
    expect(plan).toEqual({
      farmsPlanned: 5,
      farmsTakingPart: 4,
      farmsContributing: 4,
      blocksPerArmNeeded: Math.ceil(designed.rows[0].exactPerArm),
      blocksPerArmToMake: designed.rows[0].perArmToMake,
    });
  });

  it("publishes no arm's counts below the co-op's minimum number of farms", () => {
    const results = closing("exclude", ["f1", "f2"]);
    expect(results.deviations.byArm).toEqual([
      { label: "A", counts: null },
      { label: "B", counts: null },
    ]);
    expect(results.deviations.plan!.farmsContributing).toBeNull();
  });
});
