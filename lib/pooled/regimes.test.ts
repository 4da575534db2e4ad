import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { intraclassCorrelation } from "@/lib/stats";
import { buildRegimeComparison, pooledRoomIcc } from "./regime-results";
import { matchingDay, regimeStatisticsRows, type RegimeBlock, type RegimeMove, type RoomRegime } from "./regimes";

// Yates (1935) oats, as in R MASS `oats` (Venables & Ripley, Modern Applied Statistics with S, 4th ed.,
// §6.7): varieties randomised to whole plots within six blocks, four sub-plots each. Read as a co-op: an
// oats block is a farm, a whole plot a fruiting room, its variety the room's climate regime, a sub-plot's
// yield a block's BE. The comparison by regime on room means with farm as block is then the whole-plot
// stratum of the split-plot analysis (the check values of lib/stats/room-trials.test.ts).
const oats: Record<string, Record<string, number[]>> = {
  I: { "Golden rain": [117, 114, 161, 141], Marvellous: [105, 140, 118, 156], Victory: [111, 130, 157, 174] },
  II: { "Golden rain": [70, 108, 126, 149], Marvellous: [96, 124, 121, 144], Victory: [61, 91, 97, 100] },
  III: { "Golden rain": [60, 102, 89, 96], Marvellous: [89, 129, 132, 124], Victory: [68, 64, 112, 86] },
  IV: { "Golden rain": [64, 103, 132, 133], Marvellous: [70, 89, 104, 117], Victory: [74, 89, 81, 122] },
  V: { "Golden rain": [80, 82, 94, 126], Marvellous: [63, 70, 109, 99], Victory: [62, 90, 100, 116] },
  VI: { "Golden rain": [89, 82, 86, 104], Marvellous: [97, 99, 119, 121], Victory: [53, 74, 118, 113] },
};
const varieties = ["Golden rain", "Marvellous", "Victory"];

function oatsCoop() {
  const blocks: RegimeBlock[] = [];
  const moves: RegimeMove[] = [];
  const regimes: RoomRegime[] = [];
  for (const [farm, plots] of Object.entries(oats)) {
    for (const variety of varieties) {
      const room = `${farm} ${variety}`;
      // Each room ran another regime before the season: blocks are matched by the day they fruited.
      regimes.push({ roomId: room, startsOn: "2025-01-01", regimeKindId: "earlier" });
      regimes.push({ roomId: room, startsOn: "2026-01-01", regimeKindId: variety });
      plots[variety].forEach((y, index) => {
        const id = `${room} ${index}`;
        // 100 g of dry substrate, so fresh grams are the BE.
        blocks.push({
          id,
          farmId: farm,
          speciesId: "oyster",
          contaminated: false,
          contaminatedOn: null,
          dryG: 100,
          freshG: y,
          firstHarvestOn: "2026-03-01",
        });
        moves.push({ blockId: id, roomId: "picking table", movedOn: null }, { blockId: id, roomId: room, movedOn: "2026-02-01" });
      });
    }
  }
  return { blocks, moves, regimes };
}

describe("figures by climate regime with the room as the unit", () => {
  it("gives the whole-plot test of the split plot from room means with farm as block (MASS §6.7: F 1.485, p 0.2724 on 2 and 10 df)", () => {
    const { blocks, moves, regimes } = oatsCoop();
    const rows = regimeStatisticsRows(blocks, moves, regimes);
    expect(rows).toHaveLength(18);
    expect(rows.every((row) => row.rooms === 1 && row.blocks === 4 && row.efficiencyBlocks === 4)).toBe(true);
    const comparison = buildRegimeComparison({ rows, regimes: varieties.map((name) => ({ id: name, name })), minimumFarms: 3 });
    if (comparison.model.status !== "published") throw new Error(comparison.model.message);
    // R 4.2.2, MASS 7.3.58.2: summary(aov(Y ~ N * V + Error(B/V), oats)), stratum B:V.
    expect(comparison.model.value.dfRegime).toBe(2);
    expect(comparison.model.value.dfResidual).toBe(10);
    expect(comparison.model.value.f).toBeCloseTo(1.485340379436341, 10);
    expect(comparison.model.value.p).toBeCloseTo(0.27238685673520596, 10);
    // emmeans 1.8.4.1 on the whole-plot means: Victory 97.625 [86.47195982029972, 108.7780401797003];
    // Victory − Golden rain −6.875, Tukey [−26.28036462210021, 12.530364622100183], p 0.6103537592577559.
    const victory = comparison.regimes.find((regime) => regime.regimeName === "Victory")!;
    if (victory.efficiency.status !== "published") throw new Error("Victory's BE should be published");
    expect(victory.efficiency.value.estimate).toBeCloseTo(97.625, 10);
    expect(victory.efficiency.value.lower).toBeCloseTo(86.47195982029972, 9);
    expect(victory.efficiency.value).toMatchObject({ adjustedForFarm: true, farms: 6, rooms: 6 });
    const victoryGolden = comparison.model.value.differences.find((d) => d.regimeA === "Golden rain" && d.regimeB === "Victory")!;
    expect(victoryGolden.estimate).toBeCloseTo(-6.875, 10);
    expect(victoryGolden.lower).toBeCloseTo(-26.28036462210021, 6);
    expect(victoryGolden.upper).toBeCloseTo(12.530364622100183, 6);
    expect(victoryGolden.pAdjusted).toBeCloseTo(0.6103537592577559, 8);
  });

  it("counts a room's blocks once however many blocks it holds: every room has one vote", () => {
    const { blocks, moves, regimes } = oatsCoop();
    // Farm I's Victory room gets 40 more blocks at its own mean: its room mean, and so the model, is unchanged.
    const extra = Array.from({ length: 40 }, (_, index) => ({
      ...blocks.find((block) => block.id === "I Victory 0")!,
      id: `I Victory extra ${index}`,
      freshG: 143,
    }));
    const rows = regimeStatisticsRows(
      [...blocks, ...extra],
      [...moves, ...extra.map((block) => ({ blockId: block.id, roomId: "I Victory", movedOn: null }))],
      regimes,
    );
    const comparison = buildRegimeComparison({ rows, regimes: varieties.map((name) => ({ id: name, name })), minimumFarms: 3 });
    if (comparison.model.status !== "published") throw new Error(comparison.model.message);
    expect(comparison.model.value.f).toBeCloseTo(1.485340379436341, 10);
  });

  it("pools contamination over rooms with Wilson's interval (Newcombe 1998, Table II: 15 of 148 gives 6.24 % to 16.05 %)", () => {
    // Three farms, two rooms each on one regime: 148 blocks, 15 contaminated, spread unevenly over rooms.
    const sizes = [30, 20, 28, 22, 25, 23];
    const contaminatedPerRoom = [5, 1, 4, 0, 3, 2];
    const blocks: RegimeBlock[] = [];
    const moves: RegimeMove[] = [];
    const regimes: RoomRegime[] = [];
    sizes.forEach((size, room) => {
      const farmId = `farm ${Math.floor(room / 2)}`;
      regimes.push({ roomId: `room ${room}`, startsOn: "2026-01-01", regimeKindId: "soaked" });
      for (let index = 0; index < size; index++) {
        const contaminated = index < contaminatedPerRoom[room];
        const id = `${room}-${index}`;
        blocks.push({
          id,
          farmId,
          speciesId: "oyster",
          contaminated,
          // A contaminated block that never fruited is placed on the day it was found.
          contaminatedOn: contaminated ? "2026-02-10" : null,
          dryG: contaminated ? null : 1000,
          freshG: contaminated ? null : 800,
          firstHarvestOn: contaminated ? null : "2026-02-20",
        });
        moves.push({ blockId: id, roomId: `room ${room}`, movedOn: null });
      }
    });
    const comparison = buildRegimeComparison({
      rows: regimeStatisticsRows(blocks, moves, regimes),
      regimes: [{ id: "soaked", name: "Soaked once a day" }],
      minimumFarms: 3,
    });
    const [soaked] = comparison.regimes;
    if (soaked.contamination.status !== "published") throw new Error("contamination should be published");
    expect(soaked.contamination.value.estimate).toBeCloseTo((100 * 15) / 148, 10);
    expect(soaked.contamination.value.lower).toBeCloseTo(6.23863995, 6);
    expect(soaked.contamination.value.upper).toBeCloseTo(16.04872417, 6);
    // The rooms' own rates first: their plain mean, each room one vote.
    const rates = sizes.map((size, room) => contaminatedPerRoom[room] / size);
    expect(soaked.contamination.value.meanRoomRate).toBeCloseTo((100 * rates.reduce((a, b) => a + b, 0)) / 6, 10);
    expect(soaked.rooms).toEqual({ status: "published", value: 6 });
    expect(soaked.farms).toEqual({ status: "published", value: 3 });
    // One regime: nothing to compare.
    expect(comparison.model.status).toBe("suppressed");
  });

  it("withholds a regime's figures with fewer than the minimum farms, and leaves it out of the model", () => {
    const { blocks, moves, regimes } = oatsCoop();
    const twoFarms = new Set(["I", "II"]);
    // Marvellous is run on two farms only.
    const kept = regimes.filter((regime) => !regime.roomId.endsWith("Marvellous") || twoFarms.has(regime.roomId.split(" ")[0]));
    const comparison = buildRegimeComparison({
      rows: regimeStatisticsRows(blocks, moves, kept),
      regimes: varieties.map((name) => ({ id: name, name })),
      minimumFarms: 3,
    });
    const marvellous = comparison.regimes.find((regime) => regime.regimeName === "Marvellous")!;
    expect(marvellous).toMatchObject({
      farms: { status: "suppressed" },
      rooms: { status: "suppressed" },
      contamination: { status: "suppressed" },
      efficiency: { status: "suppressed" },
    });
    if (comparison.model.status !== "published") throw new Error(comparison.model.message);
    expect(comparison.model.value.differences.map((d) => `${d.regimeA}|${d.regimeB}`)).toEqual(["Golden rain|Victory"]);
    expect(JSON.stringify(comparison)).not.toMatch(/"farmId"|"roomId"/);
  });
});

describe("the day a block is matched to its room and regime", () => {
  const block: RegimeBlock = {
    id: "b",
    farmId: "f",
    speciesId: "s",
    contaminated: true,
    contaminatedOn: "2026-02-10",
    dryG: null,
    freshG: null,
    firstHarvestOn: null,
  };
  it("is the first harvest, else the day contamination was found, else the latest dated move", () => {
    expect(matchingDay({ ...block, firstHarvestOn: "2026-03-01" }, [])).toBe("2026-03-01");
    expect(matchingDay(block, [])).toBe("2026-02-10");
    const moves = [
      { blockId: "b", roomId: "r1", movedOn: "2026-01-20" },
      { blockId: "b", roomId: "r2", movedOn: "2026-02-03" },
      { blockId: "b", roomId: "r0", movedOn: null },
    ];
    expect(matchingDay({ ...block, contaminatedOn: null }, moves)).toBe("2026-02-03");
    expect(matchingDay({ ...block, contaminatedOn: null }, [moves[2]])).toBeNull();
  });
});

describe("the co-op's intraclass correlation from released sums", () => {
  it("equals lib/stats intraclassCorrelation on the blocks, rooms compared within farm and regime", () => {
    const random = seededRandom("icc");
    const blocks: RegimeBlock[] = [];
    const moves: RegimeMove[] = [];
    const regimes: RoomRegime[] = [];
    const observations: { farm: string; room: string; y: number }[] = [];
    for (const farm of ["f1", "f2", "f3", "f4"]) {
      for (const regime of ["misted", "soaked"]) {
        for (let room = 0; room < 3; room++) {
          const roomId = `${farm} ${regime} ${room}`;
          regimes.push({ roomId, startsOn: "2026-01-01", regimeKindId: regime });
          const roomEffect = random.normal(0, 6);
          // Rooms of unequal size, so m₀ is not the plain mean.
          for (let index = 0; index < 3 + ((room + farm.length) % 4); index++) {
            const y = 80 + (regime === "soaked" ? 5 : 0) + roomEffect + random.normal(0, 10);
            const id = `${roomId} ${index}`;
            blocks.push({
              id,
              farmId: farm,
              speciesId: "oyster",
              contaminated: false,
              contaminatedOn: null,
              dryG: 100,
              freshG: y,
              firstHarvestOn: "2026-03-01",
            });
            moves.push({ blockId: id, roomId, movedOn: null });
            observations.push({ farm: `${farm}|${regime}`, room: roomId, y });
          }
        }
      }
    }
    const fromSums = pooledRoomIcc(regimeStatisticsRows(blocks, moves, regimes), 3)!;
    const fromBlocks = intraclassCorrelation(observations);
    expect(fromSums.icc).toBeCloseTo(fromBlocks.forPlanning, 10);
    expect(fromSums).toMatchObject({ farms: 4, rooms: 24 });
    // Fewer farms with two rooms of a regime than the minimum: not published.
    expect(pooledRoomIcc(regimeStatisticsRows(blocks, moves, regimes), 5)).toBeNull();
  });
});
