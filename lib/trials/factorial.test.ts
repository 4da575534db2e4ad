import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { factorialAnova } from "@/lib/stats";
import type { OutcomeRecord } from "./analysis";
import {
  analyseFactorialTrial,
  crossedArms,
  crossedArmsProblems,
  factorialDesignFromArms,
  factorialDesignProblems,
  type FactorialDesign,
} from "./factorial";

// Fruiting method first: the trial's main question. Invented names (demo strains and methods).
const design: FactorialDesign = {
  factors: [
    {
      name: "fruiting method",
      plural: "fruiting methods",
      levels: [
        { id: "top", label: "Opened top", inSentence: "an opened top" },
        { id: "slits", label: "Horizontal slits", inSentence: "horizontal slits" },
      ],
    },
    {
      name: "strain",
      plural: "strains",
      levels: [
        { id: "grey", label: "Grey Morning" },
        { id: "valley", label: "Valley Wild" },
      ],
    },
  ],
  arms: [
    { armId: "arm-1", levels: ["top", "grey"] },
    { armId: "arm-2", levels: ["slits", "grey"] },
    { armId: "arm-3", levels: ["top", "valley"] },
    { armId: "arm-4", levels: ["slits", "valley"] },
  ],
};

/** Six blocks per arm on each of five farms; `effect` gives each arm's true gain in BE points. */
function records(seed: string, effect: Record<string, number>): OutcomeRecord[] {
  const random = seededRandom(seed);
  const out: OutcomeRecord[] = [];
  for (let farm = 1; farm <= 5; farm++) {
    const farmEffect = random.normal(0, 10);
    for (const arm of design.arms) {
      for (let block = 0; block < 6; block++) {
        out.push({
          farm: `Farm ${farm}`,
          armId: arm.armId,
          contaminated: false,
          value: 70 + farmEffect + effect[arm.armId] + random.normal(0, 6),
        });
      }
    }
  }
  return out;
}

describe("factorial designs", () => {
  it("accepts a complete crossing and says what is missing otherwise", () => {
    expect(factorialDesignProblems(design)).toEqual([]);
    const missing = { ...design, arms: design.arms.slice(0, 3) };
    expect(factorialDesignProblems(missing)).toEqual([
      "No arm is Horizontal slits with Valley Wild; a crossed trial needs every combination.",
    ]);
    const doubled = { ...design, arms: [...design.arms, { armId: "arm-5", levels: ["top", "grey"] as [string, string] }] };
    expect(factorialDesignProblems(doubled)).toEqual(["Two arms are both Opened top with Grey Morning; each combination is one arm."]);
  });

  it("reads a crossing off a trial's arms (strain × treatment), and nothing from arms that do not cross", () => {
    const arm = (id: string, strain: string, treatment: string, isReference = false) => ({
      id,
      isReference,
      strain: { id: strain, name: strain.toUpperCase() },
      treatment: { id: treatment, name: `method ${treatment}` },
    });
    const crossed = factorialDesignFromArms(
      [arm("1", "s1", "m2"), arm("2", "s1", "m1", true), arm("3", "s2", "m1"), arm("4", "s2", "m2")],
      { name: "fruiting method", plural: "fruiting methods" },
    );
    expect(crossed?.factors.map((factor) => factor.levels.map((level) => level.label))).toEqual([
      ["S1", "S2"],
      ["method m1", "method m2"],
    ]);
    expect(crossed?.arms[0]).toEqual({ armId: "1", levels: ["s1", "m2"] });
    expect(factorialDesignFromArms([arm("1", "s1", "m1"), arm("2", "s2", "m2")], { name: "x", plural: "xs" })).toBeNull();
  });
});

describe("arms declared as strains crossed with fruiting methods", () => {
  const strains = [
    { id: "grey", name: "Grey Morning" },
    { id: "valley", name: "Valley Wild" },
  ];
  const methods = [
    { id: "top", name: "Opened top", kind: "fruiting_method" },
    { id: "slits", name: "Horizontal slits", kind: "fruiting_method" },
    { id: "mist", name: "Misted room", kind: "humidity" },
  ];

  it("makes one arm per combination, labelled in order, the first the reference", () => {
    const arms = crossedArms(["grey", "valley"], ["top", "slits"]);
    expect(arms.map((arm) => [arm.label, arm.strainId, arm.treatmentId, arm.isReference])).toEqual([
      ["A", "grey", "top", true],
      ["B", "grey", "slits", false],
      ["C", "valley", "top", false],
      ["D", "valley", "slits", false],
    ]);
    expect(crossedArmsProblems(arms, strains, methods)).toEqual([]);
  });

  it("says, in the names the coordinator picked, what the crossing lacks", () => {
    const arms = crossedArms(["grey", "valley"], ["top", "slits"]);
    expect(crossedArmsProblems(arms.slice(0, 3), strains, methods)).toEqual([
      "No arm is Valley Wild with Horizontal slits; a crossed trial needs every combination.",
    ]);
    expect(crossedArmsProblems([{ ...arms[0], treatmentId: null }, ...arms.slice(1)], strains, methods)).toEqual([
      "Arm A: pick its fruiting method; in a crossed trial every arm is one strain with one method.",
    ]);
    expect(crossedArmsProblems([{ ...arms[0], treatmentId: "mist" }, ...arms.slice(1)], strains, methods)[0]).toBe(
      "Arm A: Misted room is not a fruiting method; a crossed trial crosses strains with fruiting methods.",
    );
    expect(crossedArmsProblems(crossedArms(["grey"], ["top", "slits"]), strains, methods)).toEqual([
      "Give the strain at least two levels to compare.",
    ]);
  });

  it("lets the method lead the design, its names in lower case inside a sentence", () => {
    const arms = crossedArms(["grey", "valley"], ["top", "slits"]).map((arm) => ({
      id: arm.label,
      isReference: arm.isReference,
      strain: strains.find((strain) => strain.id === arm.strainId)!,
      treatment: methods.find((method) => method.id === arm.treatmentId)!,
    }));
    const led = factorialDesignFromArms(arms, { name: "fruiting method", plural: "fruiting methods" }, { lead: "treatment" })!;
    expect(led.factors.map((factor) => factor.name)).toEqual(["fruiting method", "strain"]);
    expect(led.factors[0].levels[0]).toEqual({ id: "top", label: "Opened top", inSentence: "opened top" });
    expect(led.factors[1].levels[0]).toEqual({ id: "grey", label: "Grey Morning" });
    expect(led.arms[1]).toEqual({ armId: "B", levels: ["slits", "grey"] });
  });
});

describe("analyseFactorialTrial", () => {
  it("is factorialAnova on the arms' levels with farm as block, each factor's reference level first", () => {
    const rows = records("equal", { "arm-1": 0, "arm-2": 6, "arm-3": 4, "arm-4": 10 });
    const result = analyseFactorialTrial({ design, records: rows, minimumFarms: 3 });
    const levels = new Map(design.arms.map((arm) => [arm.armId, arm.levels]));
    const direct = factorialAnova(
      rows.map((row) => ({ a: levels.get(row.armId)![0], b: levels.get(row.armId)![1], block: row.farm, y: row.value! })),
    );
    expect(result.anova!.first.p).toBeCloseTo(direct.a.p, 12);
    expect(result.anova!.interaction.ss).toBeCloseTo(direct.interaction.ss, 9);
    expect(result.anova!.farm.df).toBe(4);
    // slits − top, averaged over strains: the model's top − slits, turned round.
    const [slits] = result.mainEffects[0];
    expect(slits).toMatchObject({ level: "Horizontal slits", versus: "Opened top" });
    expect(slits.estimate).toBeCloseTo(-direct.aComparisons[0].difference, 12);
    expect(slits.lower).toBeCloseTo(-direct.aComparisons[0].upper, 12);
    expect(result.cellMeans.map((cell) => [...cell.levels, cell.blocks])).toEqual([
      ["Opened top", "Grey Morning", 30],
      ["Opened top", "Valley Wild", 30],
      ["Horizontal slits", "Grey Morning", 30],
      ["Horizontal slits", "Valley Wild", 30],
    ]);
    expect(result.simpleEffects[1].map((group) => group.within)).toEqual(["Opened top", "Horizontal slits"]);
  });

  it("answers in the levels' names, averaged over the other factor when the interaction is not material", () => {
    const result = analyseFactorialTrial({
      design,
      records: records("equal", { "arm-1": 0, "arm-2": 6, "arm-3": 4, "arm-4": 10 }),
      minimumFarms: 3,
    });
    expect(result.interactionMaterial).toBe(false);
    const [slits] = result.mainEffects[0];
    const [valley] = result.mainEffects[1];
    const round = (x: number) => String(Math.round(x));
    expect(result.answer).toContain(
      `Horizontal slits gave ${round(slits.estimate)} BE points more than an opened top, across both strains (95 % interval ${round(slits.lower)} to ${round(slits.upper)}).`,
    );
    expect(result.answer).toContain(`Valley Wild gave ${round(Math.abs(valley.estimate))} BE points`);
    expect(result.answer).toContain("than Grey Morning, across both fruiting methods");
    expect(result.answer).toMatch(/did not clearly depend on the strain \(interaction p = 0\.\d{3}\)/);
    expect(result.answer).not.toMatch(/\barm\b/i);
  });

  it("compares within each level of the other factor when the best method depends on the strain", () => {
    // Slits help Grey Morning by 14 points and Valley Wild not at all.
    const result = analyseFactorialTrial({
      design,
      records: records("crossing", { "arm-1": 0, "arm-2": 14, "arm-3": 4, "arm-4": 4 }),
      minimumFarms: 3,
    });
    expect(result.interactionMaterial).toBe(true);
    expect(result.answer).toMatch(
      /^The best fruiting method depends on the strain \(interaction p (< 0\.001|= 0\.\d{3})\), so fruiting methods are compared within each strain: /,
    );
    const [grey, valley] = result.simpleEffects[0];
    expect(grey.within).toBe("Grey Morning");
    const round = (x: number) => String(Math.round(x));
    expect(result.answer).toContain(
      `with Grey Morning, horizontal slits gave ${round(grey.comparisons[0].estimate)} BE points more than an opened top (95 % interval ${round(grey.comparisons[0].lower)} to ${round(grey.comparisons[0].upper)})`,
    );
    expect(result.answer).toContain("with Valley Wild, horizontal slits gave");
    expect(valley.comparisons[0].lower).toBeLessThan(0);
    expect(result.answer).toContain("so the data cannot tell them apart");
  });

  it("gives no answer below the co-op's minimum number of farms, or for arms that do not cross", () => {
    const twoFarms = records("few", { "arm-1": 0, "arm-2": 6, "arm-3": 4, "arm-4": 10 }).filter((row) => row.farm <= "Farm 2");
    const few = analyseFactorialTrial({ design, records: twoFarms, minimumFarms: 3 });
    expect(few.anova).toBeNull();
    expect(few.answer).toBe("No answer yet: 2 farms reported, and the co-op needs 3 before it pools.");
    const broken = analyseFactorialTrial({ design: { ...design, arms: design.arms.slice(1) }, records: twoFarms, minimumFarms: 1 });
    expect(broken.answer).toMatch(/do not form a complete crossing/);
    expect(broken.notes[0]).toMatch(/No arm is Opened top with Grey Morning/);
  });
});
