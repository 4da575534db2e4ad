import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { StatsInputError } from "./errors";
import { designEffect, intraclassCorrelation, roomMeanAnalysis, roomsPerArm, type RoomObservation } from "./room-trials";
import { sampleSizeTwoMeans } from "./sample-size";

describe("designEffect", () => {
  it("is 1 + (m − 1)·ICC: ICC 0.04 with 100 per cluster needs about five times as many (Ip, Wasserman & Barkin 2011)", () => {
    // Contemp Clin Trials 32:225–232, introduction: "ICC … 0.04 … 100 patients in a clinic … requires five times as many patients".
    expect(designEffect(100, 0.04)).toBeCloseTo(4.96, 14);
    expect(designEffect(1, 0.3)).toBe(1);
    expect(designEffect(6, 0)).toBe(1);
  });

  it("refuses a room of no blocks and an ICC outside [0, 1)", () => {
    for (const [m, icc] of [
      [0, 0.1],
      [4, -0.1],
      [4, 1],
      [Number.NaN, 0.1],
    ]) {
      expect(() => designEffect(m, icc)).toThrow(StatsInputError);
    }
  });
});

// Shrout & Fleiss (1979), Psychological Bulletin 86:420–428, Table 2: six targets each rated by four
// judges, here six rooms of four blocks. Their ICC(1,1), the one-way estimator, is .17.
const shroutFleiss = [
  [9, 2, 5, 8],
  [6, 1, 3, 2],
  [8, 4, 6, 8],
  [7, 1, 2, 6],
  [10, 5, 6, 9],
  [6, 2, 4, 7],
];
const shroutFleissBlocks = shroutFleiss.flatMap((ratings, room) => ratings.map((y) => ({ room: `room ${room + 1}`, y })));

// Rooms within farms: three farms, three rooms of four blocks each (invented BE values).
const nested = [
  [71.2, 68.4, 74.9, 70.1, 80.3, 77.6, 79.9, 83.0, 66.5, 69.8, 64.2, 67.7],
  [88.1, 85.4, 90.2, 86.9, 79.5, 82.2, 78.8, 81.6, 92.4, 89.9, 94.1, 91.3],
  [60.2, 63.5, 58.9, 61.7, 70.8, 68.1, 72.6, 69.9, 65.4, 62.8, 66.9, 64.1],
].flatMap((values, farm) => values.map((y, i) => ({ farm: `farm ${farm + 1}`, room: `room ${Math.floor(i / 4) + 1}`, y })));

describe("intraclassCorrelation (one-way ANOVA estimator)", () => {
  it("gives Shrout & Fleiss's ICC(1,1) = .17 (R psych::ICC(lmer = FALSE): 0.1657417684054756) — docs/references.md", () => {
    const r = intraclassCorrelation(shroutFleissBlocks);
    expect(r.icc).toBeCloseTo(0.1657417684054756, 14);
    // Their Table 3 / R anova: between-targets MS 11.24, within 6.26.
    expect(r.msBetween).toBeCloseTo(11.241666666666664, 12);
    expect(r.msWithin).toBeCloseTo(6.263888888888889, 12);
    expect(r).toMatchObject({ dfBetween: 5, dfWithin: 18, m0: 4, rooms: 6, blocks: 24 });
  });

  it("uses m₀ = (N − Σnᵢ²/N)/(k − 1) for rooms of unequal size (R: anova(lm(y ~ target)) and the formula)", () => {
    // Shrout & Fleiss without five ratings (R rows 2, 7, 8, 15, 21).
    const dropped = new Set([1, 6, 7, 14, 20]);
    const r = intraclassCorrelation(shroutFleissBlocks.filter((_, i) => !dropped.has(i)));
    expect(r.msBetween).toBeCloseTo(8.257894736842102, 12);
    expect(r.msWithin).toBeCloseTo(6.346153846153839, 12);
    expect(r.m0).toBeCloseTo(3.136842105263158, 13);
    expect(r.icc).toBeCloseTo(0.08761968381206886, 13);
  });

  it("compares rooms within their farm: equals REML (R lme4 1.1.31, y ~ farm + (1 | room)) when rooms are equal", () => {
    const r = intraclassCorrelation(nested);
    // R anova(lm(y ~ farm + room)): room MS 133.63111111111, residual 4.26527777778; lme4 REML ICC 0.8834838243151942
    // (its optimiser stops at ~1e-8); the ANOVA estimate 0.8834838002265066.
    expect(r.msBetween).toBeCloseTo(133.63111111111, 9);
    expect(r.msWithin).toBeCloseTo(4.26527777778, 9);
    expect(r.icc).toBeCloseTo(0.8834838002265066, 13);
    expect(Math.abs(r.icc - 0.8834838243151942)).toBeLessThan(1e-7);
    expect(r.dfBetween).toBe(6);
  });

  it("uses m₀ = (N − Σnᵢ²/N_farm)/(rooms − farms) for unequal rooms within farms (R anova and the formula)", () => {
    const dropped = new Set([2, 9, 10, 29]);
    const r = intraclassCorrelation(nested.filter((_, i) => !dropped.has(i)));
    expect(r.msBetween).toBeCloseTo(122.9458627946129, 10);
    expect(r.msWithin).toBeCloseTo(3.216195652173894, 12);
    expect(r.m0).toBeCloseTo(3.508417508417509, 13);
    expect(r.icc).toBeCloseTo(0.9138732752106998, 13);
  });

  it("can fall below 0 by chance, and then plans with 0", () => {
    const r = intraclassCorrelation([
      { room: "a", y: 1 },
      { room: "a", y: 9 },
      { room: "b", y: 2 },
      { room: "b", y: 8 },
    ]);
    expect(r.icc).toBeLessThan(0);
    expect(r.forPlanning).toBe(0);
  });

  it("does not move when a farm's blocks all shift by the same amount", () => {
    fc.assert(
      fc.property(fc.double({ min: -40, max: 40, noNaN: true }), (shift) => {
        const shifted = nested.map((block) => (block.farm === "farm 2" ? { ...block, y: block.y + shift } : block));
        expect(intraclassCorrelation(shifted).icc).toBeCloseTo(intraclassCorrelation(nested).icc, 10);
      }),
    );
  });
});

describe("roomsPerArm", () => {
  it("is R's power.t.test on room means for two regimes on one farm (δ 8, σ 12, 6 blocks a room, ICC 0.05)", () => {
    const r = roomsPerArm({ delta: 8, sd: 12, blocksPerRoom: 6, icc: 0.05 });
    expect(r.designEffect).toBeCloseTo(1.25, 14);
    expect(r.roomMeanSd).toBeCloseTo(12 * Math.sqrt(1.25 / 6), 14);
    // R 4.2.2: power.t.test(delta = 8, sd = 12 * sqrt(1.25 / 6), power = 0.8, tol = 1e-13)$n = 8.435895785651109.
    expect(r.roomsPerArm).toBeCloseTo(8.435895785651109, 8);
    expect(r.roomsPerArmCeil).toBe(9);
    // The normal formula of Donner & Klar (CRTSize n4means before its t iteration): 7.358324750952268 rooms;
    // the t test on few rooms needs more.
    expect(r.roomsPerArm).toBeGreaterThan(7.358324750952268);
    expect(r.blocksPerArmIfBlocksRandomised).toBeCloseTo(sampleSizeTwoMeans({ delta: 8, sd: 12 }).nPerGroup, 9);
  });

  it("blocks by farm: four farms cost three error df (R 4.2.2: 8.687863715964069)", () => {
    expect(roomsPerArm({ delta: 8, sd: 12, blocksPerRoom: 6, icc: 0.05, farms: 4 }).roomsPerArm).toBeCloseTo(8.687863715964069, 8);
  });

  it("needs about the design effect times more blocks than randomising blocks, when many rooms are needed", () => {
    const r = roomsPerArm({ delta: 2, sd: 12, blocksPerRoom: 5, icc: 0.1 });
    const ratio = (r.roomsPerArm * 5) / r.blocksPerArmIfBlocksRandomised;
    expect(ratio / r.designEffect).toBeGreaterThan(1);
    expect(ratio / r.designEffect).toBeLessThan(1.01);
  });
});

// Yates (1935) oats, as in R MASS `oats` (Venables & Ripley, Modern Applied Statistics with S, 4th ed.,
// §6.7 split-plot experiments): varieties were randomised to whole plots within six blocks, each whole
// plot split into four sub-plots for nitrogen. A whole plot is a room: one variety (regime) for all its
// sub-plots (blocks). Yields of the sub-plots at 0, 0.2, 0.4, 0.6 cwt nitrogen.
const oats: Record<string, Record<string, number[]>> = {
  I: { "Golden rain": [117, 114, 161, 141], Marvellous: [105, 140, 118, 156], Victory: [111, 130, 157, 174] },
  II: { "Golden rain": [70, 108, 126, 149], Marvellous: [96, 124, 121, 144], Victory: [61, 91, 97, 100] },
  III: { "Golden rain": [60, 102, 89, 96], Marvellous: [89, 129, 132, 124], Victory: [68, 64, 112, 86] },
  IV: { "Golden rain": [64, 103, 132, 133], Marvellous: [70, 89, 104, 117], Victory: [74, 89, 81, 122] },
  V: { "Golden rain": [80, 82, 94, 126], Marvellous: [63, 70, 109, 99], Victory: [62, 90, 100, 116] },
  VI: { "Golden rain": [89, 82, 86, 104], Marvellous: [97, 99, 119, 121], Victory: [53, 74, 118, 113] },
};
function oatsObservations(order: string[]): RoomObservation[] {
  return order.flatMap((variety) =>
    Object.entries(oats).flatMap(([block, plots]) =>
      plots[variety].map((y) => ({ farm: block, room: `${block} ${variety}`, treatment: variety, y })),
    ),
  );
}

describe("roomMeanAnalysis", () => {
  it("gives the whole-plot test of the split-plot analysis (MASS §6.7: V F 1.485, p 0.2724 on 2 and 10 df)", () => {
    const r = roomMeanAnalysis(oatsObservations(["Victory", "Golden rain", "Marvellous"]));
    expect(r.rooms).toHaveLength(18);
    expect(r.rooms.every((room) => room.blocks === 4)).toBe(true);
    // R 4.2.2, MASS 7.3.58.2: summary(aov(Y ~ N * V + Error(B/V), oats)), stratum B:V, and anova(lm(Y ~ B + V)) on the whole-plot means.
    expect(r.analysis.treatment.df).toBe(2);
    expect(r.analysis.residual.df).toBe(10);
    expect(r.analysis.treatment.f).toBeCloseTo(1.485340379436341, 12);
    expect(r.analysis.treatment.p).toBeCloseTo(0.27238685673520596, 12);
    expect(r.analysis.treatment.ss).toBeCloseTo(446.5902777777776, 10);
    expect(r.analysis.block.ss).toBeCloseTo(3968.819444444448, 9);
    expect(r.analysis.residual.ss).toBeCloseTo(1503.3263888888896, 9);
    // emmeans 1.8.4.1 on the whole-plot means: Victory 97.625 [86.47195982029972, 108.7780401797003];
    // Victory − Golden rain −6.875, SE 7.07890384379034, Tukey [−26.28036462210021, 12.530364622100183], p 0.6103537592577559.
    expect(r.analysis.means[0].estimate).toBeCloseTo(97.625, 12);
    expect(r.analysis.means[0].lower).toBeCloseTo(86.47195982029972, 11);
    const [victoryGolden, victoryMarvellous] = r.analysis.comparisons;
    expect(victoryGolden.difference).toBeCloseTo(-6.875, 12);
    expect(victoryGolden.se).toBeCloseTo(7.07890384379034, 12);
    expect(victoryGolden.lower).toBeCloseTo(-26.28036462210021, 6);
    expect(victoryGolden.pAdjusted).toBeCloseTo(0.6103537592577559, 10);
    expect(victoryMarvellous.pAdjusted).toBeCloseTo(0.245830144977265, 10);
  });

  it("gives every room one vote whatever its number of blocks, and refuses a room under two treatments", () => {
    const random = seededRandom("rooms");
    const obs = oatsObservations(["Victory", "Golden rain", "Marvellous"]).filter(() => random.next() > 0.2);
    const r = roomMeanAnalysis(obs);
    const first = r.rooms[0];
    const values = obs.filter((o) => o.farm === first.farm && o.room === first.room).map((o) => o.y);
    expect(first.mean).toBeCloseTo(values.reduce((a, b) => a + b, 0) / values.length, 12);
    expect(() => roomMeanAnalysis([...obs, { ...obs[0], treatment: "Marvellous" }])).toThrow(/each room runs one treatment/);
  });
});
