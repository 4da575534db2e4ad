import { describe, expect, it } from "vitest";
import { analyseRoomTrial, roomUnitSentence, trialBlockRooms, type RoomOutcomeRecord } from "./room-analysis";
import { trialReport } from "./report";
import { seededRandom } from "@/lib/random";

// Yates (1935) oats, R MASS `oats` (Venables & Ripley, Modern Applied Statistics with S, 4th ed., §6.7),
// read as a co-op trial: oats block = farm, whole plot = room, variety = climate regime (arm), sub-plot = block.
// Whole-plot check values (docs/references.md): R 4.2.2, MASS 7.3.58.2, emmeans 1.8.4.1.
const oats: Record<string, Record<string, number[]>> = {
  I: { "Golden rain": [117, 114, 161, 141], Marvellous: [105, 140, 118, 156], Victory: [111, 130, 157, 174] },
  II: { "Golden rain": [70, 108, 126, 149], Marvellous: [96, 124, 121, 144], Victory: [61, 91, 97, 100] },
  III: { "Golden rain": [60, 102, 89, 96], Marvellous: [89, 129, 132, 124], Victory: [68, 64, 112, 86] },
  IV: { "Golden rain": [64, 103, 132, 133], Marvellous: [70, 89, 104, 117], Victory: [74, 89, 81, 122] },
  V: { "Golden rain": [80, 82, 94, 126], Marvellous: [63, 70, 109, 99], Victory: [62, 90, 100, 116] },
  VI: { "Golden rain": [89, 82, 86, 104], Marvellous: [97, 99, 119, 121], Victory: [53, 74, 118, 113] },
};
const arms = [
  { id: "arm-v", label: "A", isReference: true, strainName: "Grey Morning", treatmentName: "Misted all day" },
  { id: "arm-g", label: "B", isReference: false, strainName: "Grey Morning", treatmentName: "Soaked once a day" },
  { id: "arm-m", label: "C", isReference: false, strainName: "Grey Morning", treatmentName: "Misted at dawn" },
];
const armOf: Record<string, string> = { Victory: "arm-v", "Golden rain": "arm-g", Marvellous: "arm-m" };

function oatsRecords(): RoomOutcomeRecord[] {
  return ["Victory", "Golden rain", "Marvellous"].flatMap((variety) =>
    Object.entries(oats).flatMap(([farm, plots]) =>
      plots[variety].map((value) => ({ farm, armId: armOf[variety], room: `${farm}-${variety}`, value, contaminated: false })),
    ),
  );
}

describe("analyseRoomTrial", () => {
  it("analyses room means with farm as block: the oats whole-plot test (F 1.485340379436341 on 2 and 10 df)", () => {
    const r = analyseRoomTrial({ arms, records: oatsRecords(), minimumFarms: 3 });
    expect(r.unit).toBe("room");
    expect(r.roomsPerArm).toEqual([
      { label: "A", rooms: 6 },
      { label: "B", rooms: 6 },
      { label: "C", rooms: 6 },
    ]);
    expect(r.roomsAnalysed).toBe(18);
    expect(r.anova!.arm.df).toBe(2);
    expect(r.anova!.residualDf).toBe(10);
    expect(r.anova!.arm.f).toBeCloseTo(1.485340379436341, 12);
    expect(r.anova!.arm.p).toBeCloseTo(0.27238685673520596, 12);
    expect(r.adjustedMeans[0]).toMatchObject({ treatment: "A" });
    expect(r.adjustedMeans[0].estimate).toBeCloseTo(97.625, 12);
    expect(r.adjustedMeans[0].lower).toBeCloseTo(86.47195982029972, 11);
    // Read as the later arm against the reference: Golden rain − Victory = +6.875, Tukey [−12.530364622100183, 26.28036462210021].
    const [b] = r.versusReference;
    expect(b).toMatchObject({ arm: "B", versus: "A" });
    expect(b.estimate).toBeCloseTo(6.875, 12);
    expect(b.upper).toBeCloseTo(26.28036462210021, 6);
    expect(b.lower).toBeCloseTo(-12.530364622100183, 6);
    expect(b.pAdjusted).toBeCloseTo(0.6103537592577559, 10);
    expect(r.versusReference[1].pAdjusted).toBeCloseTo(0.245830144977265, 10);
    expect(r.answer).toMatch(/could not be told apart/);
    // No room's own mean is published: the Victory room of farm I averaged 143.
    expect(JSON.stringify(r)).not.toMatch(/"mean"|143[,}]/);
    expect(roomUnitSentence(r)).toMatch(/unit of this trial is the fruiting room.*arm A 6 rooms, arm B 6 rooms, arm C 6 rooms/);
  });

  it("gives the ICC of blocks sharing a room from rooms within farm and arm (R lme4 / anova: 0.8834838002265066)", () => {
    // The checked nested example of lib/stats/room-trials.test.ts (3 farms × 3 rooms × 4 blocks, invented BE values;
    // R 4.2.2 anova(lm(y ~ farm + room)), docs/references.md) run as arm A, and again 10 points higher as arm B:
    // a regime's shift is not room clustering, so the ICC is the one-arm value, to 0.01.
    const nested = [
      [71.2, 68.4, 74.9, 70.1, 80.3, 77.6, 79.9, 83.0, 66.5, 69.8, 64.2, 67.7],
      [88.1, 85.4, 90.2, 86.9, 79.5, 82.2, 78.8, 81.6, 92.4, 89.9, 94.1, 91.3],
      [60.2, 63.5, 58.9, 61.7, 70.8, 68.1, 72.6, 69.9, 65.4, 62.8, 66.9, 64.1],
    ];
    const records = (["arm-v", "arm-g"] as const).flatMap((armId, a) =>
      nested.flatMap((values, farm) =>
        values.map((y, i) => ({
          farm: `farm ${farm}`,
          armId,
          room: `${armId} room ${Math.floor(i / 4)}`,
          value: y + 10 * a,
          contaminated: false,
        })),
      ),
    );
    const r = analyseRoomTrial({ arms: arms.slice(0, 2), records, minimumFarms: 3 });
    expect(r.iccObserved).toBe(Math.round(0.8834838002265066 * 100) / 100);
    expect(r.roomsPerArm).toEqual([
      { label: "A", rooms: 9 },
      { label: "B", rooms: 9 },
    ]);
    expect(r.versusReference[0].estimate).toBeCloseTo(10, 10);
    expect(roomUnitSentence(r)).toMatch(/intraclass correlation of 0\.88/);
  });

  it("says so when no farm ran two rooms in one arm, so the ICC cannot be observed (the oats: one whole plot per variety and block)", () => {
    const r = analyseRoomTrial({ arms, records: oatsRecords(), minimumFarms: 3 });
    expect(r.iccObserved).toBeNull();
    expect(r.notes.join(" ")).toMatch(/could not be estimated/);
  });

  it("publishes nothing below the minimum number of farms, and no figure of an arm run on too few farms", () => {
    const few = oatsRecords().filter((record) => record.farm === "I" || record.farm === "II");
    const none = analyseRoomTrial({ arms, records: few, minimumFarms: 3 });
    expect(none.anova).toBeNull();
    expect(none.iccObserved).toBeNull();
    expect(none.roomsPerArm.every((arm) => arm.rooms === null)).toBe(true);
    expect(none.answer).toMatch(/No answer yet: 2 farms reported/);

    const cOnTwo = oatsRecords().filter((record) => record.armId !== "arm-m" || ["I", "II"].includes(record.farm));
    const r = analyseRoomTrial({ arms, records: cOnTwo, minimumFarms: 3 });
    expect(r.roomsPerArm.find((arm) => arm.label === "C")!.rooms).toBeNull();
    expect(r.adjustedMeans.map((mean) => mean.treatment)).toEqual(["A", "B"]);
    expect([...r.versusReference, ...r.betweenArms].some((row) => row.arm === "C" || row.versus === "C")).toBe(false);
    expect(r.notes.join(" ")).toMatch(/Arm C: run on fewer than 3 farms/);
  });

  it("leaves out blocks placed in no room and rooms holding two arms, saying so", () => {
    const records = oatsRecords();
    records[0] = { ...records[0], room: null };
    records[1] = { ...records[1], room: "I-Golden rain" };
    const r = analyseRoomTrial({ arms, records, minimumFarms: 3 });
    expect(r.roomsAnalysed).toBe(17);
    expect(r.notes.join(" ")).toMatch(/1 counted block had no fruiting room recorded.*1 room held blocks of more than one arm/);
  });
});

describe("trialBlockRooms", () => {
  it("takes the room the block was in on its first harvest day, else where it was last moved", () => {
    const moves = [
      { blockId: "b1", roomId: "tent", movedOn: null },
      { blockId: "b1", roomId: "tub", movedOn: "2026-05-10" },
      { blockId: "b2", roomId: "tent", movedOn: null },
      { blockId: "b2", roomId: "tub", movedOn: "2026-05-10" },
    ];
    const harvests = [
      { blockId: "b1", harvestedOn: "2026-05-20" },
      { blockId: "b1", harvestedOn: "2026-05-09" },
    ];
    const rooms = trialBlockRooms(moves, harvests);
    expect(rooms.get("b1")).toBe("tent");
    expect(rooms.get("b2")).toBe("tub");
    expect(rooms.has("b3")).toBe(false);
  });
});

describe("trialReport of a room-level trial", () => {
  it("answers from room means and publishes no block-level comparison", () => {
    const blockRows: Parameters<typeof trialReport>[0]["blockRows"] = [];
    const harvestRows: Parameters<typeof trialReport>[0]["harvestRows"] = [];
    const blockRooms = new Map<string, string | null>();
    // BE = fresh / dry substrate: a 1000 g block at 50 % moisture with fresh mass 5·y gives BE y %.
    oatsRecords().forEach((record, i) => {
      const id = `block-${i}`;
      blockRows.push({ id, farmId: record.farm, armId: record.armId, wetMassG: 1000, moisture: 0.5, contaminated: false, spentMassG: 10 });
      harvestRows.push({ blockId: id, flush: 1, freshMassG: record.value! * 5 });
      blockRooms.set(id, record.room);
    });
    const { results } = trialReport({
      arms,
      blockRows,
      harvestRows,
      blockRooms,
      outcome: { flushes: 1, contaminatedHandling: "exclude" },
      minimumFarms: 3,
      showPerFarmEstimates: true,
      random: seededRandom("room-report"),
      enrolments: [],
      blocksAssigned: 72,
      assignedByArm: {},
      design: { designKind: "rooms", smallestDifference: null, expectedSd: null, plannedFarms: null, expectedLoss: null },
      analysedAt: "2026-12-03T00:00:00.000Z",
    });
    expect(results.rooms!.anova!.arm.f).toBeCloseTo(1.485340379436341, 9);
    expect(results.analysis.anova).toBeNull();
    expect(results.analysis.versusReference).toEqual([]);
    expect(results.analysis.farmPooling).toEqual([]);
    expect(results.analysis.answer).toBe(results.rooms!.answer);
  });
});
