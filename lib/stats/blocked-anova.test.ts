import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { blockedAnova, blockedAnovaFromCells, type BlockedAnovaCell, type BlockedAnovaObservation } from "./blocked-anova";
import { sumOfSquares } from "./describe";
import { studentTQuantile, studentTTwoSidedP } from "./distributions";
import { StatsInputError } from "./errors";
import { seededRandom } from "@/lib/random";

// Montgomery, Design and Analysis of Experiments, Example 4.1: extrusion pressure × batch.
const montgomery: Record<string, number[]> = {
  "8500": [90.3, 89.2, 98.2, 93.9, 87.4, 97.9],
  "8700": [92.5, 89.5, 90.6, 94.7, 87.0, 95.8],
  "8900": [85.5, 90.8, 89.6, 86.2, 88.0, 93.4],
  "9100": [82.5, 89.5, 85.6, 87.4, 78.9, 90.7],
};
const montgomeryObservations: BlockedAnovaObservation[] = Object.entries(montgomery).flatMap(([treatment, ys]) =>
  ys.map((y, batch) => ({ treatment, block: `batch ${batch + 1}`, y })),
);

describe("blockedAnova on a complete block design", () => {
  it("matches Montgomery Ex. 4.1", () => {
    const r = blockedAnova(montgomeryObservations);
    // Montgomery Ex. 4.1 (F and p computed with R 4.2.2; the book prints F = 8.11)
    expect(r.treatment.df).toBe(3);
    expect(r.treatment.ss).toBeCloseTo(178.17125, 10);
    expect(r.treatment.f).toBeCloseTo(8.10707663606684, 11);
    expect(r.treatment.p).toBeCloseTo(0.00191629972965406, 14);
    expect(r.block.df).toBe(5);
    expect(r.block.ss).toBeCloseTo(192.252083333333, 10);
    expect(r.residual.df).toBe(15);
    expect(r.residual.ss).toBeCloseTo(109.88625, 10);
  });

  it("gives the plain treatment means with SE √(MSE/b) when the design is balanced", () => {
    const r = blockedAnova(montgomeryObservations);
    const half = studentTQuantile(0.975, 15) * Math.sqrt(109.88625 / 15 / 6);
    r.means.forEach((m) => {
      const ys = montgomery[m.treatment];
      expect(m.estimate).toBeCloseTo(ys.reduce((a, b) => a + b, 0) / ys.length, 12);
      expect(m.upper - m.estimate).toBeCloseTo(half, 12);
      expect(m.estimate - m.lower).toBeCloseTo(half, 12);
    });
  });
});

// ---- An independent second method: dummy-coded least squares by Householder QR ----

type Fit = { rss: number; coefficients: number[]; rInverse: number[][] };

function leastSquares(x: number[][], y: number[]): Fit {
  const rows = x.length;
  const cols = x[0].length;
  const a = x.map((row) => [...row]);
  const b = [...y];
  for (let k = 0; k < cols; k++) {
    let norm = 0;
    for (let i = k; i < rows; i++) norm += a[i][k] * a[i][k];
    norm = Math.sqrt(norm);
    const alpha = a[k][k] > 0 ? -norm : norm;
    const v = new Array<number>(rows).fill(0);
    for (let i = k; i < rows; i++) v[i] = a[i][k];
    v[k] -= alpha;
    let vv = 0;
    for (let i = k; i < rows; i++) vv += v[i] * v[i];
    for (let j = k; j < cols; j++) {
      let dot = 0;
      for (let i = k; i < rows; i++) dot += v[i] * a[i][j];
      for (let i = k; i < rows; i++) a[i][j] -= (2 * dot * v[i]) / vv;
    }
    let dot = 0;
    for (let i = k; i < rows; i++) dot += v[i] * b[i];
    for (let i = k; i < rows; i++) b[i] -= (2 * dot * v[i]) / vv;
  }
  const coefficients = new Array<number>(cols).fill(0);
  for (let i = cols - 1; i >= 0; i--) {
    let sum = b[i];
    for (let j = i + 1; j < cols; j++) sum -= a[i][j] * coefficients[j];
    coefficients[i] = sum / a[i][i];
  }
  let rss = 0;
  for (let i = cols; i < rows; i++) rss += b[i] * b[i];
  const rInverse = Array.from({ length: cols }, () => new Array<number>(cols).fill(0));
  for (let j = 0; j < cols; j++) {
    rInverse[j][j] = 1 / a[j][j];
    for (let i = j - 1; i >= 0; i--) {
      let sum = 0;
      for (let k = i + 1; k <= j; k++) sum += a[i][k] * rInverse[k][j];
      rInverse[i][j] = -sum / a[i][i];
    }
  }
  return { rss, coefficients, rInverse };
}

function crossCheck(obs: BlockedAnovaObservation[]) {
  const treatments = [...new Set(obs.map((o) => o.treatment))];
  const blocks = [...new Set(obs.map((o) => o.block))];
  // Dummy coding with the first level of each factor as reference.
  const design = (withTreatment: boolean, withBlock: boolean) =>
    obs.map((o) => [
      1,
      ...(withTreatment ? treatments.slice(1).map((t) => (o.treatment === t ? 1 : 0)) : []),
      ...(withBlock ? blocks.slice(1).map((b) => (o.block === b ? 1 : 0)) : []),
    ]);
  const y = obs.map((o) => o.y);
  const full = leastSquares(design(true, true), y);
  const treatmentsOnly = leastSquares(design(true, false), y);
  const blocksOnly = leastSquares(design(false, true), y);
  const dfResidual = obs.length - treatments.length - blocks.length + 1;
  const ms = full.rss / dfResidual;
  const tCritical = studentTQuantile(0.975, dfResidual);
  const means = treatments.map((t, s) => {
    // L = intercept + treatment dummy + average of the block dummies.
    const l = [1, ...treatments.slice(1).map((_, i) => (i + 1 === s ? 1 : 0)), ...blocks.slice(1).map(() => 1 / blocks.length)];
    const estimate = l.reduce((sum, li, i) => sum + li * full.coefficients[i], 0);
    // Var = σ² ‖R⁻ᵀ L‖², with (XᵀX)⁻¹ = R⁻¹R⁻ᵀ.
    let variance = 0;
    for (let j = 0; j < l.length; j++) {
      let z = 0;
      for (let i = 0; i <= j; i++) z += full.rInverse[i][j] * l[i];
      variance += z * z;
    }
    const half = tCritical * Math.sqrt(ms * variance);
    return { treatment: t, estimate, lower: estimate - half, upper: estimate + half };
  });
  return {
    treatmentSs: blocksOnly.rss - full.rss,
    blockSs: treatmentsOnly.rss - full.rss,
    residualSs: full.rss,
    dfResidual,
    means,
  };
}

function unbalancedDesign(seed: number): BlockedAnovaObservation[] {
  const generator = seededRandom(seed);
  const random = () => generator.next();
  const strainEffect: Record<string, number> = { "blue oyster": 8, "pearl oyster": 0, "lion's mane": -6, shiitake: 3 };
  const farms = ["Alder Hollow", "Birch Creek", "Cedar Run", "Dogwood", "Elm Ridge"];
  const obs: BlockedAnovaObservation[] = [];
  farms.forEach((farm, f) => {
    const farmEffect = 15 * (f - 2);
    for (const strain of Object.keys(strainEffect)) {
      // Farm 2 never grew lion's mane, farm 4 only two strains: missing cells.
      if (f === 1 && strain === "lion's mane") continue;
      if (f === 3 && (strain === "shiitake" || strain === "blue oyster")) continue;
      const blocksRun = 1 + Math.floor(random() * 6);
      for (let k = 0; k < blocksRun; k++) {
        obs.push({ treatment: strain, block: farm, y: 70 + farmEffect + strainEffect[strain] + 10 * (random() - 0.5) });
      }
    }
  });
  return obs;
}

describe("blockedAnova on unbalanced data with missing cells", () => {
  for (const seed of [1, 2, 3, 42]) {
    it(`agrees with nested least-squares fits by QR (design ${seed})`, () => {
      const obs = unbalancedDesign(seed);
      const r = blockedAnova(obs);
      const check = crossCheck(obs);
      expect(r.residual.df).toBe(check.dfResidual);
      expect(r.treatment.ss).toBeCloseTo(check.treatmentSs, 8);
      expect(r.block.ss).toBeCloseTo(check.blockSs, 7);
      expect(r.residual.ss).toBeCloseTo(check.residualSs, 8);
      r.means.forEach((m, i) => {
        expect(m.treatment).toBe(check.means[i].treatment);
        expect(m.estimate).toBeCloseTo(check.means[i].estimate, 9);
        expect(m.lower).toBeCloseTo(check.means[i].lower, 9);
        expect(m.upper).toBeCloseTo(check.means[i].upper, 9);
      });
    });
  }

  it("differs from the unadjusted one-way split when farms run strains unevenly", () => {
    // Sanity that the adjustment matters: raw strain means are confounded with farms.
    const obs = unbalancedDesign(7);
    const r = blockedAnova(obs);
    const rawMean = (strain: string) => {
      const ys = obs.filter((o) => o.treatment === strain).map((o) => o.y);
      return ys.reduce((a, b) => a + b, 0) / ys.length;
    };
    const lionsMane = r.means.find((m) => m.treatment === "lion's mane");
    expect(lionsMane).toBeDefined();
    expect(Math.abs((lionsMane?.estimate ?? 0) - rawMean("lion's mane"))).toBeGreaterThan(0.5);
  });

  it("refuses a design whose strains never share a farm", () => {
    const obs: BlockedAnovaObservation[] = [
      { treatment: "A", block: "farm 1", y: 1 },
      { treatment: "A", block: "farm 1", y: 2 },
      { treatment: "B", block: "farm 2", y: 3 },
      { treatment: "B", block: "farm 2", y: 5 },
      { treatment: "A", block: "farm 3", y: 2 },
      { treatment: "B", block: "farm 3", y: 4 },
      { treatment: "C", block: "farm 4", y: 7 },
      { treatment: "C", block: "farm 4", y: 8 },
    ];
    expect(() => blockedAnova(obs)).toThrow(StatsInputError);
    try {
      blockedAnova(obs);
    } catch (error) {
      expect((error as StatsInputError).code).toBe("not_estimable");
    }
  });
});

// ---- Pairwise comparisons of least-squares means, as R's pairs(emmeans(...)) ----

// emmeans' `pigs` data (Windels 1964, via Oehlert 2000, Problem 10.8; six observations
// omitted by the package, so cells hold 1 to 3 values): leucine concentration by protein
// source (the treatment) and protein percentage (here the block). The emmeans vignette
// "comparisons" fits lm(log(conc) ~ source + factor(percent)) and shows pairs(emmeans(fit, "source")).
const pigs: [string, number, number][] = [
  ["fish", 9, 27.8],
  ["fish", 9, 23.7],
  ["fish", 12, 31.5],
  ["fish", 12, 28.5],
  ["fish", 12, 32.8],
  ["fish", 15, 34.0],
  ["fish", 15, 28.3],
  ["fish", 18, 30.6],
  ["fish", 18, 32.7],
  ["fish", 18, 33.7],
  ["soy", 9, 39.3],
  ["soy", 9, 34.8],
  ["soy", 9, 29.8],
  ["soy", 12, 39.8],
  ["soy", 12, 40.0],
  ["soy", 12, 39.1],
  ["soy", 15, 38.5],
  ["soy", 15, 39.2],
  ["soy", 15, 40.0],
  ["soy", 18, 42.9],
  ["skim", 9, 40.6],
  ["skim", 9, 31.0],
  ["skim", 9, 34.6],
  ["skim", 12, 42.9],
  ["skim", 12, 50.1],
  ["skim", 12, 37.4],
  ["skim", 15, 59.5],
  ["skim", 15, 41.4],
  ["skim", 18, 59.8],
];
const pigsObservations: BlockedAnovaObservation[] = pigs.map(([source, percent, conc]) => ({
  treatment: source,
  block: `${percent} %`,
  y: Math.log(conc),
}));
// The same without soy at 18 %: a block that lacks one treatment.
const pigsMissingCell = pigsObservations.filter((o) => !(o.treatment === "soy" && o.block === "18 %"));

type Expected = [string, string, number, number, number, number, number];
function expectComparisons(
  actual: ReturnType<typeof blockedAnova>["comparisons"],
  expected: Expected[],
  digits: { ci: number; p: number },
) {
  expect(actual.map((c) => `${c.a} - ${c.b}`)).toEqual(expected.map(([a, b]) => `${a} - ${b}`));
  actual.forEach((c, i) => {
    const [, , difference, se, lower, upper, p] = expected[i];
    expect(c.difference).toBeCloseTo(difference, 12);
    expect(c.se).toBeCloseTo(se, 12);
    expect(c.lower).toBeCloseTo(lower, digits.ci);
    expect(c.upper).toBeCloseTo(upper, digits.ci);
    expect(c.pAdjusted).toBeCloseTo(p, digits.p);
  });
}

describe("blockedAnova comparisons: Tukey on least-squares means, as emmeans", () => {
  it("matches pairs(emmeans(lm(log(conc) ~ source + factor(percent), pigs), 'source')) — docs/references.md", () => {
    const r = blockedAnova(pigsObservations);
    // R 4.2.2, emmeans 1.8.4.1: confint(pairs(...)) and summary(pairs(...)); the vignette prints
    // fish − soy −0.273 (SE 0.0529, p 0.0001), fish − skim −0.402 (0.0542, <.0001), soy − skim −0.130 (0.0530, 0.0570).
    expectComparisons(
      r.comparisons,
      [
        ["fish", "soy", -0.2727678441184361, 0.05293449913772472, -0.4053336281563023, -0.14020206008057, 9.170226807297954e-5],
        ["fish", "skim", -0.4022776790380172, 0.05415928809895833, -0.5379107464463072, -0.2666446116297272, 4.381143439147195e-7],
        ["soy", "skim", -0.1295098349195811, 0.05304279721789656, -0.2623468337633232, 0.003327163924160992, 0.05695631582536798],
      ],
      // R's qtukey is good to ~1e-7 relative (its secant steps stop at 1e-4), so limits agree to 7 decimals.
      { ci: 7, p: 9 },
    );
    // The exact critical value q(0.95; 3, 23)/√2, by SciPy 1.10.1 studentized_range.ppf.
    expect((r.comparisons[0].upper - r.comparisons[0].difference) / r.comparisons[0].se).toBeCloseTo(2.5043364009103732, 10);
    expect(r.residual.df).toBe(23);
    // car::Anova(fit, type = 2): source 0.7647592205157 (2 df), percent 0.3173579044325 (3), residuals 0.3048524533911.
    expect(r.treatment.ss).toBeCloseTo(0.7647592205157, 12);
    expect(r.block.ss).toBeCloseTo(0.3173579044325, 12);
    expect(r.residual.ss).toBeCloseTo(0.3048524533911, 12);
    // emmeans(fit, "source"): emmean and 95 % limits.
    const expectedMeans = [
      ["fish", 3.394492409558163, 3.318611515560412, 3.470373303555915],
      ["soy", 3.667260253676599, 3.589793200017776, 3.744727307335423],
      ["skim", 3.796770088596181, 3.715300488598728, 3.878239688593633],
    ] as const;
    r.means.forEach((mean, i) => {
      expect(mean.treatment).toBe(expectedMeans[i][0]);
      expect(mean.estimate).toBeCloseTo(expectedMeans[i][1], 12);
      expect(mean.lower).toBeCloseTo(expectedMeans[i][2], 12);
      expect(mean.upper).toBeCloseTo(expectedMeans[i][3], 12);
    });
  });

  it("matches emmeans at a 90 % level (confint(pairs(...), level = 0.9))", () => {
    const r = blockedAnova(pigsObservations, 0.9);
    // R 4.2.2, emmeans 1.8.4.1.
    const expected = [
      [-0.38706793605226, -0.15846775218461212],
      [-0.519222426029487, -0.28533293204654736],
      [-0.2440437720908502, -0.01497589774831208],
    ];
    r.comparisons.forEach((c, i) => {
      expect(c.lower).toBeCloseTo(expected[i][0], 7);
      expect(c.upper).toBeCloseTo(expected[i][1], 7);
      // q(0.90; 3, 23)/√2 = 2.1592741509639843 (SciPy 1.10.1 studentized_range.ppf).
      expect((c.upper - c.difference) / c.se).toBeCloseTo(2.1592741509639843, 10);
    });
  });

  it("is right when a block lacks a treatment (pigs without soy at 18 %), by R and by statsmodels", () => {
    const r = blockedAnova(pigsMissingCell);
    expect(r.residual.df).toBe(22);
    // R 4.2.2, emmeans 1.8.4.1.
    expectComparisons(
      r.comparisons,
      [
        ["fish", "soy", -0.2800114431835493, 0.05783312933813715, -0.425291916627431, -0.13473096973966761, 2.201876758148869e-4],
        ["fish", "skim", -0.4044404020557766, 0.05557110239226498, -0.5440385209495922, -0.26484228316196107, 7.986070290622038e-7],
        ["soy", "skim", -0.1244289588722273, 0.05601320245748802, -0.2651376610514405, 0.01627974330698587, 0.08960825359440971],
      ],
      { ci: 7, p: 9 },
    );
    // statsmodels 0.13.5 OLS contrasts (t_test) with SciPy 1.10.1 studentized_range: an independent fit
    // and an independent studentized range, whose quantile is exact where R's stops at 1e-7.
    const statsmodels = [
      [-0.2800114431835485, 0.05783312933813733, -0.4252919250717738, -0.1347309612953232, 0.0002201876760782318],
      [-0.404440402055777, 0.05557110239226513, -0.5440385290636525, -0.2648422750479015, 7.986063261800069e-7],
      [-0.1244289588722285, 0.05601320245748815, -0.2651376692300536, 0.0162797514855966, 0.08960825359390223],
    ];
    r.comparisons.forEach((c, i) => {
      expect(c.difference).toBeCloseTo(statsmodels[i][0], 12);
      expect(c.se).toBeCloseTo(statsmodels[i][1], 12);
      expect(c.lower).toBeCloseTo(statsmodels[i][2], 11);
      expect(c.upper).toBeCloseTo(statsmodels[i][3], 11);
      expect(c.pAdjusted).toBeCloseTo(statsmodels[i][4], 9);
    });
    // car::Anova(fit, type = 2) on the same rows.
    expect(r.treatment.ss).toBeCloseTo(0.7529877639213955, 12);
    expect(r.block.ss).toBeCloseTo(0.3038913892918667, 12);
    expect(r.residual.ss).toBeCloseTo(0.3031761598371028, 12);
  });

  it("differs from a one-way Tukey–Kramer that ignores the blocks (R TukeyHSD(aov(log(conc) ~ source, pigs)))", () => {
    // TukeyHSD ignoring percent: soy − fish 0.2345378929881532 (p 0.006129754410291700); the blocked model
    // gives fish − soy −0.2727678441184361 (p 9.17e-5). This is why the reports no longer use the one-way table.
    const r = blockedAnova(pigsObservations);
    const fishSoy = r.comparisons[0];
    expect(-fishSoy.difference - 0.2345378929881532).toBeGreaterThan(0.03);
  });
});

function cellsOf(obs: BlockedAnovaObservation[]): BlockedAnovaCell[] {
  const groups = new Map<string, BlockedAnovaObservation[]>();
  for (const o of obs) groups.set(`${o.treatment}\u0000${o.block}`, [...(groups.get(`${o.treatment}\u0000${o.block}`) ?? []), o]);
  return [...groups.values()].map((rows) => {
    const ys = rows.map((row) => row.y);
    const mean = ys.reduce((a, b) => a + b, 0) / ys.length;
    return { treatment: rows[0].treatment, block: rows[0].block, n: ys.length, mean, sumOfSquares: sumOfSquares(ys, mean) };
  });
}

describe("blockedAnovaFromCells", () => {
  it("gives the same fit from cell summaries as from the rows (pigs, and pigs with a missing cell)", () => {
    for (const obs of [pigsObservations, pigsMissingCell, unbalancedDesign(3)]) {
      const fromRows = blockedAnova(obs);
      const fromCells = blockedAnovaFromCells(cellsOf(obs));
      expect(fromCells.residual.ss).toBeCloseTo(fromRows.residual.ss, 10);
      expect(fromCells.treatment.p).toBeCloseTo(fromRows.treatment.p, 12);
      fromRows.comparisons.forEach((c, i) => {
        expect(fromCells.comparisons[i]).toMatchObject({ a: c.a, b: c.b });
        expect(fromCells.comparisons[i].difference).toBeCloseTo(c.difference, 10);
        expect(fromCells.comparisons[i].lower).toBeCloseTo(c.lower, 10);
        expect(fromCells.comparisons[i].pAdjusted).toBeCloseTo(c.pAdjusted, 12);
      });
    }
  });

  it("merges a cell given in two parts", () => {
    const whole = cellsOf(pigsObservations);
    const fish9 = pigsObservations.filter((o) => o.treatment === "fish" && o.block === "9 %").map((o) => o.y);
    const split = [
      ...whole.filter((cell) => !(cell.treatment === "fish" && cell.block === "9 %")),
      { treatment: "fish", block: "9 %", n: 1, mean: fish9[0], sumOfSquares: 0 },
      { treatment: "fish", block: "9 %", n: 1, mean: fish9[1], sumOfSquares: 0 },
    ];
    const r = blockedAnovaFromCells(split);
    expect(r.residual.ss).toBeCloseTo(0.3048524533911, 12);
    expect(r.comparisons[0].difference).toBeCloseTo(-0.2727678441184361, 12);
  });
});

// Random connected designs: 2–5 treatments, 2–6 blocks, 0–4 values per cell, every block with
// at least two treatments, treatment 0 in every block (so all are linked).
const designs = fc
  .record({
    treatments: fc.integer({ min: 2, max: 5 }),
    blocks: fc.integer({ min: 2, max: 6 }),
    seed: fc.integer({ min: 1, max: 1_000_000 }),
  })
  .map(({ treatments, blocks, seed }) => {
    const random = seededRandom(seed);
    const obs: BlockedAnovaObservation[] = [];
    for (let b = 0; b < blocks; b++) {
      const offset = 40 * random.next();
      for (let t = 0; t < treatments; t++) {
        const count = t === 0 || t === 1 + (b % (treatments - 1)) ? 1 + random.integer(0, 3) : random.integer(0, 4);
        for (let k = 0; k < count; k++) obs.push({ treatment: `t${t}`, block: `b${b}`, y: 60 + offset + 3 * t + random.normal(0, 5) });
      }
    }
    return obs;
  })
  .filter((obs) => obs.length - new Set(obs.map((o) => o.treatment)).size - new Set(obs.map((o) => o.block)).size + 1 >= 1);

describe("blockedAnova comparisons, properties", () => {
  it("are differences of the least-squares means, inside their intervals, wider at a higher level", () => {
    fc.assert(
      fc.property(designs, fc.double({ min: 0.5, max: 0.99, noNaN: true }), (obs, level) => {
        const r = blockedAnova(obs, level);
        const wider = blockedAnova(obs, Math.min(0.999, level + 0.005));
        const mean = new Map(r.means.map((m) => [m.treatment, m.estimate]));
        expect(r.comparisons).toHaveLength((r.means.length * (r.means.length - 1)) / 2);
        r.comparisons.forEach((c, i) => {
          expect(c.difference).toBeCloseTo(mean.get(c.a)! - mean.get(c.b)!, 9);
          expect(c.lower).toBeLessThan(c.difference);
          expect(c.upper).toBeGreaterThan(c.difference);
          expect(wider.comparisons[i].upper - wider.comparisons[i].lower).toBeGreaterThan(c.upper - c.lower);
          expect(c.pAdjusted).toBeGreaterThanOrEqual(0);
          expect(c.pAdjusted).toBeLessThanOrEqual(1);
        });
      }),
      { numRuns: 60 },
    );
  });

  it("do not move when one block's values all shift by the same amount", () => {
    fc.assert(
      fc.property(designs, fc.double({ min: -50, max: 50, noNaN: true }), (obs, shift) => {
        const shifted = obs.map((o) => (o.block === "b0" ? { ...o, y: o.y + shift } : o));
        const a = blockedAnova(obs).comparisons;
        const b = blockedAnova(shifted).comparisons;
        a.forEach((c, i) => {
          expect(b[i].difference).toBeCloseTo(c.difference, 8);
          expect(b[i].se).toBeCloseTo(c.se, 8);
        });
      }),
      { numRuns: 40 },
    );
  });

  it("reduce to the t test on the model's error when there are two treatments (Tukey with k = 2)", () => {
    fc.assert(
      fc.property(
        designs.filter((obs) => new Set(obs.map((o) => o.treatment)).size === 2),
        (obs) => {
          const r = blockedAnova(obs);
          const [c] = r.comparisons;
          const df = r.residual.df;
          expect(c.upper - c.difference).toBeCloseTo(studentTQuantile(0.975, df) * c.se, 8);
          expect(c.pAdjusted).toBeCloseTo(studentTTwoSidedP(c.difference / c.se, df), 8);
        },
      ),
      { numRuns: 30 },
    );
  });
});
