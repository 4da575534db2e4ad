import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { drawRoomsToArms, roomBlockList } from "./room-draw";

const arms = ["arm-a", "arm-b", "arm-c"];
const rooms = (n: number) => Array.from({ length: n }, (_, i) => `room-${String(i).padStart(2, "0")}`);
const perArm = (draw: { armId: string }[]) => arms.map((arm) => draw.filter((entry) => entry.armId === arm).length);

describe("drawRoomsToArms", () => {
  it("gives every arm the same number of rooms, or one fewer when they do not divide evenly", () => {
    fc.assert(
      fc.property(fc.integer({ min: 3, max: 40 }), fc.string(), (n, seed) => {
        const draw = drawRoomsToArms({ seed, armIds: arms, roomIds: rooms(n) });
        const counts = perArm(draw);
        expect(Math.max(...counts) - Math.min(...counts)).toBeLessThanOrEqual(1);
        expect(counts.reduce((a, b) => a + b, 0)).toBe(n);
        expect(new Set(draw.map((entry) => entry.roomId)).size).toBe(n);
      }),
    );
    expect(perArm(drawRoomsToArms({ seed: "T-2026-04/ab", armIds: arms, roomIds: rooms(6) }))).toEqual([2, 2, 2]);
  });

  it("is reproduced exactly from the seed, whatever order the rooms were picked in, and changes with the seed", () => {
    const first = drawRoomsToArms({ seed: "T-2026-04/0123456789abcdef01234567", armIds: arms, roomIds: rooms(9) });
    const again = drawRoomsToArms({ seed: "T-2026-04/0123456789abcdef01234567", armIds: arms, roomIds: rooms(9).reverse() });
    expect(again).toEqual(first);
    const seeds = ["a", "b", "c", "d", "e", "f"].map((seed) =>
      JSON.stringify(drawRoomsToArms({ seed, armIds: arms, roomIds: rooms(9) }).map((entry) => [entry.roomId, entry.armId])),
    );
    expect(new Set(seeds).size).toBeGreaterThan(1);
  });

  it("draws each room to each arm about equally often over many seeds (no room tied to an arm)", () => {
    let firstRoomInArmA = 0;
    const draws = 3000;
    for (let i = 0; i < draws; i++) {
      const draw = drawRoomsToArms({ seed: `seed-${i}`, armIds: arms, roomIds: rooms(6) });
      if (draw.find((entry) => entry.roomId === "room-00")!.armId === "arm-a") firstRoomInArmA++;
    }
    // Binomial(3000, 1/3): mean 1000, SD 25.8; 4 SD either side.
    expect(Math.abs(firstRoomInArmA - 1000)).toBeLessThan(104);
  });

  it("refuses fewer rooms than arms, saying how many to pick", () => {
    expect(() => drawRoomsToArms({ seed: "s", armIds: arms, roomIds: rooms(2) })).toThrow(
      /at least 3 of your fruiting rooms.*You picked 2/,
    );
    expect(() => drawRoomsToArms({ seed: "s", armIds: arms, roomIds: ["r", "r", "q"] })).toThrow(/You picked 2/);
  });
});

describe("roomBlockList", () => {
  it("lists blocks per room, each taking its room's arm", () => {
    const draw = drawRoomsToArms({ seed: "x", armIds: arms, roomIds: rooms(3) });
    const list = roomBlockList(draw, 4, "T-2026-04-FF");
    expect(list).toHaveLength(12);
    expect(list[0].blockCode).toBe("T-2026-04-FF-01");
    expect(list[11].blockCode).toBe("T-2026-04-FF-12");
    for (const entry of list) expect(entry.armId).toBe(draw.find((room) => room.roomId === entry.roomId)!.armId);
    expect(list.filter((entry) => entry.roomId === draw[1].roomId).map((entry) => entry.sequence)).toEqual([5, 6, 7, 8]);
  });
});
