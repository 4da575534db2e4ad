import { describe, expect, it } from "vitest";
import { roomArmsProblems, roomTrialSampleSize } from "./room-design";

describe("the size of a room-level trial", () => {
  it("gives rooms per arm from the design effect and the room-mean analysis, then whole rooms per farm after the loss", () => {
    // lib/stats/room-trials.test.ts: delta 8, SD 12, 6 blocks a room, ICC 0.05, 4 farms → 8.687863715964069 rooms per arm
    // (R 4.2.2, the Tukey/blocked size on room means, docs/references.md); design effect 1 + 5 × 0.05 = 1.25 (Kerry & Bland 1998).
    const panel = roomTrialSampleSize({ difference: 8, sd: 12, plannedFarms: 4, expectedLoss: 0.05, arms: 2, blocksPerRoom: 6, icc: 0.05 });
    if (!panel.ok) throw new Error(JSON.stringify(panel.problems));
    expect(panel.designEffect).toBeCloseTo(1.25, 14);
    const [eighty] = panel.rows;
    expect(eighty.exactRoomsPerArm).toBeCloseTo(8.687863715964069, 8);
    // 8.69 / 0.95 = 9.15 rooms over 4 farms: 3 rooms per farm per arm, 12 rooms of 6 blocks.
    expect(eighty).toMatchObject({ roomsPerFarmPerArm: 3, roomsPerArm: 12, blocksPerArm: 72, totalBlocks: 144 });
    expect(eighty.blocksPerArmIfBlocksRandomised).toBeLessThan(eighty.blocksPerArm);
  });

  it("needs more rooms as blocks in a room grow more alike", () => {
    const size = (icc: number) => {
      const panel = roomTrialSampleSize({ difference: 8, sd: 12, plannedFarms: 4, expectedLoss: 0, arms: 2, blocksPerRoom: 6, icc });
      if (!panel.ok) throw new Error("sized");
      return panel.rows[0].exactRoomsPerArm;
    };
    expect(size(0)).toBeLessThan(size(0.05));
    expect(size(0.05)).toBeLessThan(size(0.3));
  });

  it("says what to fix, field by field", () => {
    const panel = roomTrialSampleSize({ difference: 8, sd: 12, plannedFarms: 4, expectedLoss: 0, arms: 2, blocksPerRoom: 0, icc: 1 });
    expect(panel.ok).toBe(false);
    if (panel.ok) return;
    expect(Object.keys(panel.problems).sort()).toEqual(["blocksPerRoom", "roomIcc"]);
  });
});

describe("the arms of a room-level trial", () => {
  const treatments = [
    { id: "misted", kind: "humidity" },
    { id: "soaked", kind: "humidity" },
    { id: "slits", kind: "fruiting_method" },
  ];
  it("each name their own climate regime", () => {
    expect(
      roomArmsProblems(
        [
          { label: "A", treatmentId: "misted" },
          { label: "B", treatmentId: "soaked" },
        ],
        treatments,
      ),
    ).toEqual([]);
    expect(
      roomArmsProblems(
        [
          { label: "A", treatmentId: "misted" },
          { label: "B", treatmentId: "slits" },
          { label: "C", treatmentId: "misted" },
        ],
        treatments,
      ),
    ).toEqual([
      "Arm B: pick the climate regime its rooms are run under.",
      "Arm C: another arm already runs this climate regime; give each arm its own.",
    ]);
  });
});
