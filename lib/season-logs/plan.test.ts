import { describe, expect, it } from "vitest";
import { parseSeasonLog } from "../import";
import { type PlanInput, type StoredBlock, planCommit } from "./plan";

const strains = [
  { id: "s-po01", code: "PO-01" },
  { id: "s-po02", code: "PO-02" },
];
const substrateRecipes = [{ id: "r-hwb", code: "HWB-20" }];
const fruitingMethods = [{ id: "m-slit", code: "SLIT-ACROSS" }];

const header =
  "block_id,strain,substrate,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight,contaminated,notes";

function records(lines: string[]) {
  const parsed = parseSeasonLog([header, ...lines].join("\n"), { knownStrains: strains.map((strain) => strain.code), today: "2026-12-01" });
  expect(parsed.issues.filter((issue) => issue.severity === "error")).toEqual([]);
  return parsed.records;
}

function input(overrides: Partial<PlanInput>): PlanInput {
  return { records: [], storedBlocks: [], storedHarvests: [], strains, substrateRecipes, fruitingMethods, assignments: [], ...overrides };
}

const storedA1: StoredBlock = {
  id: "b-1",
  code: "A-1",
  strainId: "s-po01",
  substrateRecipeId: "r-hwb",
  fruitingMethodId: "m-slit",
  trialArmId: null,
  inoculatedOn: "2026-03-01",
  wetMassG: 2500,
  moisture: 0.62,
  contaminated: false,
  contaminatedOn: null,
  spentMassG: null,
  notes: "",
};

describe("planCommit", () => {
  it("counts everything as new against an empty farm", () => {
    const plan = planCommit(
      input({
        records: records([
          "A-1,PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-02,400 g,no,",
          "A-1,PO-01,,,,,,2,2026-04-20,250 g,no,",
          "A-2,PO-02,HWB-20,2026-03-01,2.4 kg,62 %,,,,,no,",
        ]),
      }),
    );
    expect(plan.counts).toEqual({
      newBlocks: 2,
      changedBlocks: 0,
      untouchedBlocks: 0,
      newHarvests: 2,
      changedHarvests: 0,
      untouchedHarvests: 0,
    });
    expect(plan.blocks.find((block) => block.code === "A-2")?.wetMassG).toBe(2400);
    // Nothing is stored yet, so every row is an insert.
    expect([...plan.blocks, ...plan.harvests].every((write) => write.id === null)).toBe(true);
    expect(plan.harvests.every((harvest) => harvest.blockId === null)).toBe(true);
    expect(plan.changes).toEqual([]);
    expect(plan.issues).toEqual([]);
  });

  it("keeps untouched what is stored unchanged and lists replaced values old → new", () => {
    const plan = planCommit(
      input({
        records: records([
          "A-1,PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-02,410 g,no,",
          "A-1,PO-01,,,,,,2,2026-04-20,250 g,no,",
        ]),
        storedBlocks: [storedA1],
        storedHarvests: [
          { id: "h-1", blockCode: "A-1", flush: 1, harvestedOn: "2026-04-02", freshMassG: 400, dryMassG: null },
          { id: "h-2", blockCode: "A-1", flush: 2, harvestedOn: "2026-04-20", freshMassG: 250, dryMassG: null },
        ],
      }),
    );
    expect(plan.counts).toEqual({
      newBlocks: 0,
      changedBlocks: 0,
      untouchedBlocks: 1,
      newHarvests: 0,
      changedHarvests: 1,
      untouchedHarvests: 1,
    });
    expect(plan.changes).toEqual([{ blockCode: "A-1", flush: 1, field: "fresh_weight", oldValue: "400", newValue: "410" }]);
    expect(plan.harvests.map((harvest) => harvest.flush)).toEqual([1]);
    // A changed harvest is updated where it is stored, not inserted again.
    expect(plan.harvests[0]).toMatchObject({ id: "h-1", blockId: "b-1" });
  });

  it("never erases a stored value with a blank cell", () => {
    const plan = planCommit(input({ records: records(["A-1,PO-01,,,,,,,,,no,"]), storedBlocks: [storedA1] }));
    expect(plan.counts.untouchedBlocks).toBe(1);
    expect(plan.changes).toEqual([]);
  });

  it("refuses a trial block whose strain differs from its arm's strain", () => {
    const plan = planCommit(
      input({
        records: records(["T01-1-01,PO-02,HWB-20,2026-03-01,2500 g,62 %,,,,,no,"]),
        assignments: [
          { blockCode: "T01-1-01", armId: "arm-a", armLabel: "A", trialCode: "T-2026-01", strainId: "s-po01", strainCode: "PO-01" },
        ],
      }),
    );
    expect(plan.issues).toHaveLength(1);
    expect(plan.issues[0]).toMatchObject({ line: 2, severity: "error", column: "strain", value: "PO-02" });
    expect(plan.issues[0].message).toContain("arm A of trial T-2026-01");
  });

  it("attaches a block on the farm's randomised list to its arm", () => {
    const plan = planCommit(
      input({
        records: records(["T01-1-01,PO-01,HWB-20,2026-03-01,2500 g,62 %,,,,,no,"]),
        assignments: [
          { blockCode: "T01-1-01", armId: "arm-a", armLabel: "A", trialCode: "T-2026-01", strainId: "s-po01", strainCode: "PO-01" },
        ],
      }),
    );
    expect(plan.issues).toEqual([]);
    expect(plan.blocks[0].trialArmId).toBe("arm-a");
  });

  it("names the nearest registered recipe for an unknown substrate code", () => {
    const plan = planCommit(input({ records: records(["A-1,PO-01,HWB-2O,2026-03-01,2500 g,62 %,,,,,no,"]) }));
    expect(plan.issues[0]).toMatchObject({ line: 2, severity: "error", column: "substrate" });
    expect(plan.issues[0].message).toContain('Did you mean "HWB-20"?');
  });
});
