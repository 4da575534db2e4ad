import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { blockedAnova, metaAnalysis, wilsonInterval, describe as describeValues } from "@/lib/stats";
import { analyseTrial, armName, type OutcomeRecord } from "./analysis";

// Invented strains and methods; the answer names arms by them.
const arms = [
  { id: "b", label: "B", isReference: false, strainName: "Grey Morning", treatmentName: "Horizontal slits" },
  { id: "a", label: "A", isReference: true, strainName: "Grey Morning", treatmentName: "Opened top" },
  { id: "c", label: "C", isReference: false, strainName: "Valley Wild", treatmentName: null },
];

function generated(farms: number, seed = "analysis"): OutcomeRecord[] {
  const random = seededRandom(seed);
  const effect: Record<string, number> = { a: 0, b: 12, c: -1 };
  const records: OutcomeRecord[] = [];
  for (let farm = 1; farm <= farms; farm++) {
    const farmEffect = random.normal(0, 8);
    for (const arm of ["a", "b", "c"]) {
      for (let block = 0; block < 6; block++) {
        const contaminated = random.next() < 0.08;
        records.push({
          farm: `farm ${farm}`,
          armId: arm,
          contaminated,
          value: contaminated ? null : 70 + effect[arm] + farmEffect + random.normal(0, 10),
        });
      }
    }
  }
  return records;
}

describe("analyseTrial", () => {
  it("equals lib/stats on the same rows, with the reference first", () => {
    const records = generated(4);
    const result = analyseTrial({ arms, records, minimumFarms: 3 });
    const kept = records.filter((record) => record.value !== null) as (OutcomeRecord & { value: number })[];
    const label = (id: string) => arms.find((arm) => arm.id === id)!.label;

    const fit = blockedAnova(kept.map((record) => ({ treatment: label(record.armId), block: record.farm, y: record.value })));
    expect(result.anova!.arm.p).toBe(fit.treatment.p);
    expect(result.anova!.adjustedMeans.map((mean) => mean.treatment)).toEqual(["A", "B", "C"]);
    expect(result.anova!.adjustedMeans[1].estimate).toBe(fit.means.find((mean) => mean.treatment === "B")!.estimate);

    // The differences are the model's Tukey-adjusted comparisons of least-squares means (arm + farm),
    // no longer a one-way Tukey–Kramer on pooled blocks: B − A is −(A − B).
    // The rows come farm by farm in arm order a, b, c, so the model lists A − B first.
    const aVersusB = fit.comparisons.find((pair) => pair.a === "A" && pair.b === "B")!;
    expect(result.differencesFrom).toBe("arm + farm");
    expect(result.versusReference[0]).toMatchObject({ arm: "B", versus: "A", se: aVersusB.se, pAdjusted: aVersusB.pAdjusted });
    expect(result.versusReference[0].estimate).toBeCloseTo(-aVersusB.difference, 12);
    expect(result.versusReference[0].lower).toBeCloseTo(-aVersusB.upper, 12);
    expect(result.versusReference[0].estimate).toBeCloseTo(
      result.anova!.adjustedMeans[1].estimate - result.anova!.adjustedMeans[0].estimate,
      10,
    );
    expect(result.betweenArms).toHaveLength(1);
    expect(result.versusReference[0].lower).toBeGreaterThan(0);
    expect(result.answer).toMatch(
      /^Grey Morning with horizontal slits \(arm B\) gave more than the reference, Grey Morning with opened top \(arm A\): \d+\.\d BE points more/,
    );
    expect(result.answer).toContain("Valley Wild (arm C) and the reference, Grey Morning with opened top (arm A) could not be told apart");

    const perFarm = ["farm 1", "farm 2", "farm 3", "farm 4"].map((farm) => {
      const b = describeValues(kept.filter((r) => r.farm === farm && r.armId === "b").map((r) => r.value));
      const a = describeValues(kept.filter((r) => r.farm === farm && r.armId === "a").map((r) => r.value));
      return { y: b.mean - a.mean, v: b.sd ** 2 / b.n + a.sd ** 2 / a.n };
    });
    const meta = metaAnalysis(perFarm);
    expect(result.farmPooling[0].pooled!.estimate).toBeCloseTo(meta.random.estimate, 12);
    expect(result.farmPooling[0].pooled!.i2).toBeCloseTo(meta.i2, 12);

    const armA = records.filter((record) => record.armId === "a");
    const contaminatedA = armA.filter((record) => record.contaminated).length;
    expect(result.arms[0].contamination.upper).toBe(wilsonInterval(contaminatedA, armA.length).upper);
    expect(result.blocksLeftOut).toBe(records.length - kept.length);
  });

  it("names an arm by its strain and treatment, keeping its letter in brackets", () => {
    expect(armName({ label: "B", strainName: "Grey Morning", treatmentName: "Horizontal slits" })).toBe(
      "Grey Morning with horizontal slits (arm B)",
    );
    // A name that starts with a code keeps its capitals; an arm known only by its letter is "arm A".
    expect(armName({ label: "C", strainName: "PO-02", treatmentName: "CO2 below 800 ppm" })).toBe("PO-02 with CO2 below 800 ppm (arm C)");
    expect(armName({ label: "A" })).toBe("arm A");
  });

  it("gives no pooled figure below the co-op's minimum number of farms", () => {
    const result = analyseTrial({ arms, records: generated(2), minimumFarms: 3 });
    expect(result.enoughFarms).toBe(false);
    expect(result.anova).toBeNull();
    expect(result.versusReference).toEqual([]);
    expect(result.answer).toMatch(/needs 3 before it pools/);
  });
});
