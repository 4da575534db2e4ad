import { describe, expect, it } from "vitest";
import { parseSeasonLog } from "../import";
import { type PlanInput, type StoredBlock, type TrialAssignment, planCommit, withNotInFileRemoved } from "./plan";

const strains = [
  { id: "s-po01", code: "PO-01", names: ["Grey oyster, culture bank"] },
  { id: "s-po02", code: "PO-02", names: ["Grey oyster, wild clone"] },
];
const substrateRecipes = [{ id: "r-hwb", code: "HWB-20", names: ["Hardwood sawdust with 20 % wheat bran"] }];
const fruitingMethods = [
  { id: "m-slit", code: "SLIT-ACROSS", names: ["Horizontal slits"] },
  { id: "m-top", code: "TOP-OPEN", names: ["Opened top"] },
];

const header =
  "block_id,strain,substrate,inoculated_on,block_wet_weight,substrate_moisture,fruiting_method,flush,harvested_on,fresh_weight,contaminated,notes";

function records(lines: string[], head = header) {
  const parsed = parseSeasonLog([head, ...lines].join("\n"), { knownStrains: strains, today: "2026-12-01" });
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

  it("stores the season a file names, keeps it under a blank cell and records a change of it", () => {
    const seasonHeader = "block_id,strain,inoculated_on,season";
    const named = planCommit(input({ records: records(["A-1,PO-01,2026-03-01,2025/26"], seasonHeader), storedBlocks: [storedA1] }));
    expect(named.blocks.map((block) => block.seasonYear)).toEqual([2025]);
    expect(named.changes).toEqual([{ blockCode: "A-1", flush: null, field: "season", oldValue: null, newValue: "2025" }]);
    const stored = { ...storedA1, seasonYear: 2025 };
    expect(
      planCommit(input({ records: records(["A-1,PO-01,2026-03-01,"], seasonHeader), storedBlocks: [stored] })).counts.untouchedBlocks,
    ).toBe(1);
    expect(planCommit(input({ records: records(["A-1,PO-01,2026-03-01,2025"], seasonHeader), storedBlocks: [stored] })).changes).toEqual(
      [],
    );
  });

  describe("the fruiting room", () => {
    const roomHeader = "block_id,strain,fruiting_room,flush,fresh_weight";
    const rooms = [
      { id: "room-t1", name: "Tent 1" },
      { id: "room-tub", name: "Tub by the door" },
    ];

    it("is matched to the farm's own rooms whatever the capitals and spaces, and listed for the review", () => {
      const plan = planCommit(
        input({
          records: records(["A-1,PO-01,tent1,1,400 g", "A-2,PO-01,TUB  BY THE DOOR,,", "A-3,PO-01,,,"], roomHeader),
          storedBlocks: [storedA1],
          rooms,
        }),
      );
      expect(plan.issues).toEqual([]);
      expect(plan.blocks.map((block) => [block.code, block.roomId])).toEqual([
        ["A-1", "room-t1"],
        ["A-2", "room-tub"],
        ["A-3", null],
      ]);
      // History keeps the room by the name the farm gives it, not as the cell spelt it.
      expect(plan.changes).toEqual([{ blockCode: "A-1", flush: null, field: "fruiting_room", oldValue: null, newValue: "Tent 1" }]);
      expect(plan.rooms).toEqual([
        { blockCode: "A-1", room: "Tent 1", change: "added" },
        { blockCode: "A-2", room: "Tub by the door", change: "new" },
      ]);
    });

    it("is an error on the cell when the farm has no room of that name, naming the farm's rooms and the Rooms page", () => {
      const plan = planCommit(input({ records: records(["A-1,PO-01,Tent 2,1,400 g"], roomHeader), rooms }));
      expect(plan.issues).toHaveLength(1);
      expect(plan.issues[0]).toMatchObject({
        line: 2,
        code: "unknown_fruiting_room",
        column: "fruiting_room",
        value: "Tent 2",
        severity: "error",
      });
      expect(plan.issues[0].message).toMatch(/^Line 2, block A-1: "Tent 2" is not one of your farm's rooms/);
      expect(plan.issues[0].message).toContain('"Tent 1", "Tub by the door"');
      expect(plan.issues[0].message).toContain("Rooms page");
      // Nothing is made or guessed: the block keeps no room.
      expect(plan.blocks[0].roomId).toBeNull();
      const none = planCommit(input({ records: records(["A-1,PO-01,Tent 1,1,400 g"], roomHeader) }));
      expect(none.issues.map((issue) => issue.code)).toEqual(["unknown_fruiting_room"]);
      expect(none.issues[0].message).toContain("no rooms recorded yet");
    });

    it("is an error when two of the farm's rooms differ only in capitals or spaces", () => {
      const plan = planCommit(
        input({ records: records(["A-1,PO-01,tent 1,1,400 g"], roomHeader), rooms: [...rooms, { id: "room-t1b", name: "TENT 1" }] }),
      );
      expect(plan.issues.map((issue) => issue.code)).toEqual(["fruiting_room_ambiguous"]);
      expect(plan.blocks[0].roomId).toBeNull();
    });

    it("refuses a retired room for a block not already in it, as a move on the block's page does, and lets a file restate it", () => {
      const withRetired = [...rooms, { id: "room-old", name: "Old tent", retiredOn: "2026-02-01" }];
      const plan = planCommit(
        input({ records: records(["A-1,PO-01,old tent,,"], roomHeader), storedBlocks: [storedA1], rooms: withRetired }),
      );
      expect(plan.issues.map((issue) => [issue.code, issue.value])).toEqual([["fruiting_room_retired", "old tent"]]);
      expect(plan.issues[0].message).toContain("retired on 2026-02-01");
      expect(plan.blocks).toEqual([]);
      const already = { ...storedA1, roomId: "room-old" };
      const restated = planCommit(
        input({ records: records(["A-1,PO-01,Old tent,,"], roomHeader), storedBlocks: [already], rooms: withRetired }),
      );
      expect(restated.issues).toEqual([]);
      expect(restated.counts.untouchedBlocks).toBe(1);
    });

    it("is kept under a blank cell, untouched when the same, and a change of it is history", () => {
      const stored = { ...storedA1, roomId: "room-t1" };
      const blank = planCommit(input({ records: records(["A-1,PO-01,,,"], roomHeader), storedBlocks: [stored], rooms }));
      expect(blank.counts.untouchedBlocks).toBe(1);
      expect(blank.rooms).toEqual([]);
      const same = planCommit(input({ records: records(["A-1,PO-01,TENT 1,,"], roomHeader), storedBlocks: [stored], rooms }));
      expect(same.counts.untouchedBlocks).toBe(1);
      expect(same.rooms).toEqual([{ blockCode: "A-1", room: "Tent 1", change: "same" }]);
      const moved = planCommit(input({ records: records(["A-1,PO-01,Tub by the door,,"], roomHeader), storedBlocks: [stored], rooms }));
      expect(moved.counts.changedBlocks).toBe(1);
      expect(moved.blocks[0].roomId).toBe("room-tub");
      expect(moved.rooms).toEqual([{ blockCode: "A-1", room: "Tub by the door", change: "changed" }]);
      expect(moved.changes).toEqual([
        { blockCode: "A-1", flush: null, field: "fruiting_room", oldValue: "Tent 1", newValue: "Tub by the door" },
      ]);
    });
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
    expect(plan.issues[0].message).toContain('Did you mean "HWB-20" (Hardwood sawdust with 20 % wheat bran)?');
  });

  it("reads register values by name as well as by code", () => {
    const plan = planCommit(
      input({
        records: records([
          "A-1,grey oyster wild clone,hardwood sawdust with 20 % wheat bran,2026-03-01,2500 g,62 %,horizontal SLITS,,,,no,",
        ]),
      }),
    );
    expect(plan.issues).toEqual([]);
    expect(plan.blocks[0]).toMatchObject({ strainId: "s-po02", substrateRecipeId: "r-hwb", fruitingMethodId: "m-slit" });
  });
});

describe("a trial block against its randomised list", () => {
  const trialHeader = "block_id,strain,trial,arm,fruiting_method,inoculated_on,block_wet_weight";
  const listed: TrialAssignment = {
    blockCode: "LP-12",
    armId: "arm-b",
    armLabel: "B",
    trialCode: "T-2026-01",
    trialTitle: "Slits or an opened top?",
    strainId: "s-po01",
    strainCode: "PO-01",
    fruitingMethod: { id: "m-slit", code: "SLIT-ACROSS", name: "Horizontal slits" },
  };
  const plan = (line: string, assignments = [listed]) => planCommit(input({ records: records([line], trialHeader), assignments }));
  const codes = (line: string) => plan(line).issues.map((issue) => [issue.code, issue.severity, issue.column, issue.value]);

  it("takes a row that agrees with the list, by code or by name, in any case", () => {
    expect(plan("LP-12,PO-01,T-2026-01,B,SLIT-ACROSS,2026-03-01,2500 g").issues).toEqual([]);
    expect(plan("lp-12,grey oyster culture bank,t-2026-01,b,horizontal slits,2026-03-01,2500 g").issues).toEqual([]);
    expect(plan("LP-12,PO-01,Slits or an opened top?,,,2026-03-01,2500 g").issues).toEqual([]);
    expect(plan("LP-12,PO-01,,,,2026-03-01,2500 g").blocks[0].trialArmId).toBe("arm-b");
  });

  it("refuses another fruiting method and says which one the arm uses", () => {
    const [issue] = plan("LP-12,PO-01,T-2026-01,B,opened top,2026-03-01,2500 g").issues;
    expect(issue).toMatchObject({
      code: "trial_fruiting_method_differs",
      severity: "error",
      column: "fruiting_method",
      value: "opened top",
    });
    expect(issue.message).toContain(
      'block LP-12 is in arm B of trial T-2026-01, which fruits with "Horizontal slits" (SLIT-ACROSS); this row says "Opened top" (TOP-OPEN)',
    );
  });

  it("checks no fruiting method where the arm fixes none", () => {
    expect(plan("LP-12,PO-01,T-2026-01,B,TOP-OPEN,2026-03-01,2500 g", [{ ...listed, fruitingMethod: null }]).issues).toEqual([]);
  });

  it("refuses another arm", () => {
    expect(codes("LP-12,PO-01,T-2026-01,A,SLIT-ACROSS,2026-03-01,2500 g")).toEqual([["trial_arm_differs", "error", "arm", "A"]]);
    expect(plan("LP-12,PO-01,T-2026-01,D,,2026-03-01,2500 g").issues[0].message).toContain("arm B of trial T-2026-01");
  });

  it("refuses another trial", () => {
    expect(codes("LP-12,PO-01,T-2025-07,B,,2026-03-01,2500 g")).toEqual([["trial_differs", "error", "trial", "T-2025-07"]]);
  });

  it("refuses another strain, naming the arm's", () => {
    const issues = plan("LP-12,PO-02,T-2026-01,B,,2026-03-01,2500 g").issues;
    expect(issues.map((issue) => issue.code)).toEqual(["trial_strain_differs"]);
    expect(issues[0].message).toContain('which uses strain "Grey oyster, culture bank" (PO-01)');
  });

  it("reports every contradiction of one row", () => {
    expect(codes("LP-12,PO-02,T-2025-07,C,TOP-OPEN,2026-03-01,2500 g").map(([code]) => code)).toEqual([
      "trial_differs",
      "trial_arm_differs",
      "trial_strain_differs",
      "trial_fruiting_method_differs",
    ]);
  });

  it("refuses a trial or arm named for a block the farm's list does not have, in the same words whoever else lists it", () => {
    // The farm's own list is all the planner sees (row-level security): another farm's LP-99 looks like no block at all.
    const unknown = plan("LP-99,PO-01,T-2026-01,B,,2026-03-01,2500 g");
    expect(unknown.issues.map((issue) => [issue.code, issue.severity])).toEqual([["trial_block_not_listed", "error"]]);
    expect(unknown.issues[0].message).toBe(
      'Line 2: block LP-99 names trial "T-2026-01", but your farm\'s randomised list has no block LP-99. Check the block code against your trial list, or leave the trial and arm cells blank to record it as an ordinary block.',
    );
    expect(codes("LP-99,PO-01,,B,,2026-03-01,2500 g")).toEqual([["trial_block_not_listed", "error", "arm", "B"]]);
    expect(plan("LP-99,PO-01,,,,2026-03-01,2500 g").issues).toEqual([]);
  });
});

describe("what is stored but not in the file", () => {
  const storedA2: StoredBlock = { ...storedA1, id: "b-2", code: "A-2" };
  const stored = input({
    storedBlocks: [storedA1, storedA2],
    storedHarvests: [
      { id: "h-1", blockCode: "A-1", flush: 1, harvestedOn: "2026-04-02", freshMassG: 400, dryMassG: null, fromFile: true },
      { id: "h-2", blockCode: "A-1", flush: 2, harvestedOn: "2026-04-20", freshMassG: 250, dryMassG: 24, fromFile: false },
      { id: "h-3", blockCode: "A-2", flush: 1, harvestedOn: "2026-04-05", freshMassG: 300, dryMassG: null, fromFile: false },
    ],
  });
  const sheet = records(["A-1,PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-02,400 g,no,"]);

  it("lists the harvests of the file's blocks that the file lacks, and counts the blocks it leaves out", () => {
    const plan = planCommit({ ...stored, records: sheet });
    expect(plan.notInFile.harvests.map((harvest) => harvest.id)).toEqual(["h-2"]);
    expect(plan.notInFile.blocks).toBe(1);
    // Kept unless asked: the plan writes and changes nothing for them.
    expect(plan.changes).toEqual([]);
  });

  it("removes them only when asked, each removal a value change for the history", () => {
    const plan = withNotInFileRemoved(planCommit({ ...stored, records: sheet }));
    expect(plan.removedHarvests.map((harvest) => harvest.id)).toEqual(["h-2"]);
    expect(plan.changes).toEqual([
      { blockCode: "A-1", flush: 2, field: "fresh_weight", oldValue: "250", newValue: null },
      { blockCode: "A-1", flush: 2, field: "harvested_on", oldValue: "2026-04-20", newValue: null },
      { blockCode: "A-1", flush: 2, field: "dry_weight", oldValue: "24", newValue: null },
    ]);
  });

  it("lists nothing when the file has every stored flush of its blocks", () => {
    const full = records([
      "A-1,PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-02,400 g,no,",
      "A-1,PO-01,,,,,,2,2026-04-20,250 g,no,",
      "A-2,PO-01,HWB-20,2026-03-01,2500 g,62 %,SLIT-ACROSS,1,2026-04-05,300 g,no,",
    ]);
    expect(planCommit({ ...stored, records: full }).notInFile).toEqual({ harvests: [], blocks: 0 });
  });
});
