import { describe, expect, it } from "vitest";
import { parseSeasonLog } from "../import";
import { type ExportBlock, type ExportHarvest, exportGrams, exportPercent, seasonLogExportCsv, trialListCsv } from "./export";
import { type StoredBlock, planCommit } from "./plan";

// 1 lb = 453.59237 g exactly, 1 oz = 1/16 lb (NIST Handbook 44, Appendix C).
const fiveLb = 5 * 453.59237;
const twelveOz = (12 * 453.59237) / 16;

const strains = [
  { id: "s-po01", code: "PO-01" },
  { id: "s-po02", code: "PO-02" },
];
const substrateRecipes = [{ id: "r-hwb", code: "HWB-20" }];
const fruitingMethods = [{ id: "m-slit", code: "SLIT-ACROSS" }];
const rooms = [
  { id: "room-tent-1", name: "Tent 1" },
  { id: "room-tub", name: "Tub" },
];

const blocks: ExportBlock[] = [
  {
    code: "LP-12",
    strainCode: "PO-01",
    substrateCode: "HWB-20",
    trialCode: "T-2026-01",
    armLabel: "A",
    inoculatedOn: "2026-03-01",
    wetMassG: fiveLb,
    moisture: 0.6234567,
    fruitingMethodCode: "SLIT-ACROSS",
    // The farm's own name for the room, with a capital and a space, written back as it is kept.
    roomName: "Tent 1",
    contaminated: false,
    contaminatedOn: null,
    spentMassG: 1250.5,
    notes: 'shelf 2, "top"\nmoved later',
  },
  {
    code: "B-7",
    strainCode: "PO-02",
    substrateCode: null,
    trialCode: null,
    armLabel: null,
    inoculatedOn: "2026-02-20",
    // Named in its season log: a block inoculated just before a 1 March start, counted with the new season.
    seasonYear: 2026,
    wetMassG: 2500,
    moisture: 0.62,
    fruitingMethodCode: null,
    contaminated: true,
    contaminatedOn: "2026-03-10",
    spentMassG: null,
    notes: "",
  },
];
const harvests: ExportHarvest[] = [
  { blockCode: "LP-12", flush: 2, harvestedOn: "2026-04-20", freshMassG: twelveOz, dryMassG: null },
  { blockCode: "LP-12", flush: 1, harvestedOn: "2026-04-02", freshMassG: 612.345, dryMassG: 61.2 },
];

describe("exportGrams and exportPercent", () => {
  it("write grams to a milligram and moisture to a thousandth of a point, without trailing zeros", () => {
    expect(exportGrams(2500)).toBe("2500");
    expect(exportGrams(fiveLb)).toBe("2267.962");
    expect(exportGrams(null)).toBe("");
    expect(exportPercent(0.62)).toBe("62");
    expect(exportPercent(0.6234567)).toBe("62.346");
  });

  it("give a number that could read two ways a fourth decimal", () => {
    // 340.194 could be 340 194 g with a point for thousands; 340.1943 cannot.
    expect(exportGrams(twelveOz)).toBe("340.1943");
    expect(exportGrams(612.345)).toBe("612.3450");
  });
});

describe("seasonLogExportCsv", () => {
  const csv = seasonLogExportCsv(blocks, harvests);
  const parsed = parseSeasonLog(csv, { knownStrains: ["PO-01", "PO-02"], today: "2026-12-01" });

  it("has the schema's columns with units in the headers, one row per flush, a block without harvest once", () => {
    expect(csv.split("\r\n")[0]).toBe(
      "block_id,strain,substrate,trial,arm,inoculated_on,season,block_wet_weight (g),substrate_moisture (%),fruiting_method,fruiting_room,flush,harvested_on,fresh_weight (g),dry_weight (g),contaminated,contaminated_on,spent_weight (g),notes",
    );
    expect(parsed.records.map((record) => [record.blockCode, record.flush])).toEqual([
      ["LP-12", 1],
      ["LP-12", 2],
      ["B-7", null],
    ]);
  });

  it("reads back without an issue and with the values it was made from", () => {
    expect(parsed.issues).toEqual([]);
    const [first, second, bare] = parsed.records;
    expect(first.wetBlockGrams).toBeCloseTo(fiveLb, 2);
    expect(first.moisture).toBeCloseTo(0.6234567, 5);
    expect(first.freshGrams).toBeCloseTo(612.345, 6);
    expect(second.freshGrams).toBeCloseTo(twelveOz, 3);
    expect(first.notes).toBe(blocks[0].notes);
    expect(bare).toMatchObject({ contaminated: true, contaminatedOn: "2026-03-10", trialCode: null, substrate: null, seasonYear: 2026 });
    expect(first.seasonYear).toBeNull();
    expect([first.fruitingRoom, second.fruitingRoom, bare.fruitingRoom]).toEqual(["Tent 1", "Tent 1", null]);
  });

  it("changes nothing when uploaded over the blocks it was made from", () => {
    const stored = (block: ExportBlock, id: string): StoredBlock => ({
      id,
      code: block.code,
      strainId: strains.find((strain) => strain.code === block.strainCode)!.id,
      substrateRecipeId: block.substrateCode ? "r-hwb" : null,
      fruitingMethodId: block.fruitingMethodCode ? "m-slit" : null,
      trialArmId: block.trialCode ? "arm-a" : null,
      inoculatedOn: block.inoculatedOn,
      seasonYear: block.seasonYear ?? null,
      wetMassG: block.wetMassG,
      moisture: block.moisture,
      contaminated: block.contaminated,
      contaminatedOn: block.contaminatedOn,
      spentMassG: block.spentMassG,
      notes: block.notes,
      roomId: rooms.find((room) => room.name === block.roomName)?.id ?? null,
    });
    const plan = planCommit({
      records: parsed.records,
      storedBlocks: [stored(blocks[0], "b-1"), stored(blocks[1], "b-2")],
      storedHarvests: harvests.map((harvest, index) => ({ id: `h-${index}`, ...harvest })),
      strains,
      substrateRecipes,
      fruitingMethods,
      rooms,
      assignments: [
        {
          blockCode: "LP-12",
          armId: "arm-a",
          armLabel: "A",
          trialCode: "T-2026-01",
          strainId: "s-po01",
          strainCode: "PO-01",
          fruitingMethod: { id: "m-slit", code: "SLIT-ACROSS", name: "Slits cut across the bag" },
        },
      ],
    });
    expect(plan.issues).toEqual([]);
    expect(plan.changes).toEqual([]);
    expect(plan.counts).toMatchObject({ newBlocks: 0, changedBlocks: 0, untouchedBlocks: 2, newHarvests: 0, changedHarvests: 0 });
  });
});

describe("trialListCsv", () => {
  it("is a season log of the listed blocks that uploads as it stands", () => {
    const csv = trialListCsv([
      { blockCode: "T01-1-01", trialCode: "T-2026-01", armLabel: "B", strainCode: "PO-02", fruitingMethodCode: "SLIT-ACROSS" },
      { blockCode: "T01-1-02", trialCode: "T-2026-01", armLabel: "A", strainCode: "PO-01", fruitingMethodCode: null },
    ]);
    expect(csv.split("\r\n")[1]).toBe("T01-1-01,PO-02,,T-2026-01,B,,,,,SLIT-ACROSS,,,,,,,,,");
    const parsed = parseSeasonLog(csv, { knownStrains: ["PO-01", "PO-02"], today: "2026-12-01" });
    expect(parsed.issues).toEqual([]);
    expect(
      parsed.records.map((record) => [record.blockCode, record.strainCode, record.trialCode, record.arm, record.fruitingMethod]),
    ).toEqual([
      ["T01-1-01", "PO-02", "T-2026-01", "B", "SLIT-ACROSS"],
      ["T01-1-02", "PO-01", "T-2026-01", "A", null],
    ]);
  });
});
