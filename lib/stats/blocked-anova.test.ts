import { describe, expect, it } from "vitest";
import { blockedAnova, type BlockedAnovaObservation } from "./blocked-anova";
import { studentTQuantile } from "./distributions";
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
  const random = seededRandom(seed).next;
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
