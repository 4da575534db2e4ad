import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { metaAnalysis } from "./meta-analysis";

// metafor dat.bcg: tpos, tneg, cpos, cneg for 13 BCG vaccine trials.
const bcg = [
  [4, 119, 11, 128],
  [6, 300, 29, 274],
  [3, 228, 11, 209],
  [62, 13536, 248, 12619],
  [33, 5036, 47, 5761],
  [180, 1361, 372, 1079],
  [8, 2537, 10, 619],
  [505, 87886, 499, 87892],
  [29, 7470, 45, 7232],
  [17, 1699, 65, 1600],
  [186, 50448, 141, 27197],
  [5, 2493, 3, 2338],
  [27, 16886, 29, 17825],
];
// Log risk ratios and their variances, as metafor's escalc(measure = "RR").
const logRiskRatios = bcg.map(([tpos, tneg, cpos, cneg]) => ({
  y: Math.log(tpos / (tpos + tneg) / (cpos / (cpos + cneg))),
  v: 1 / tpos - 1 / (tpos + tneg) + 1 / cpos - 1 / (cpos + cneg),
}));

describe("metaAnalysis", () => {
  it("matches metafor rma(method = 'FE') and rma(method = 'DL') on dat.bcg", () => {
    const r = metaAnalysis(logRiskRatios);
    // metafor, fixed effect
    expect(r.fixed.estimate).toBeCloseTo(-0.430285163654091, 13);
    expect(r.fixed.se).toBeCloseTo(0.0404987517108638, 14);
    expect(r.q).toBeCloseTo(152.233008082373, 10);
    expect(r.df).toBe(12);
    expect(r.pQ).toBeGreaterThan(0);
    expect(r.pQ).toBeLessThan(1e-25);
    // metafor, DerSimonian–Laird
    expect(r.random.estimate).toBeCloseTo(-0.714117222073227, 13);
    expect(r.random.se).toBeCloseTo(0.178742089535403, 13);
    expect(r.random.lower).toBeCloseTo(-1.06444528008405, 12);
    expect(r.random.upper).toBeCloseTo(-0.363789164062403, 12);
    expect(r.random.tau2).toBeCloseTo(0.308760262862376, 13);
    expect(r.i2).toBeCloseTo(92.1173468545621, 11); // percent, as metafor prints it
    // metafor's own tests against Stata metan, 4 decimals
    expect(r.fixed.estimate).toBeCloseTo(-0.4303, 4);
    expect(r.random.lower).toBeCloseTo(-1.0644, 4);
  });

  it("gets the hand-checkable example exactly", () => {
    // By hand: y = (0, 2, 4), v = 1 → FE 2, Q = 8, I² = 75 %, τ² = 3, random SE 2/√3,
    // and P(χ²₂ > 8) = e⁻⁴ exactly.
    const r = metaAnalysis([
      { y: 0, v: 1 },
      { y: 2, v: 1 },
      { y: 4, v: 1 },
    ]);
    expect(r.fixed.estimate).toBe(2);
    expect(r.fixed.se).toBeCloseTo(1 / Math.sqrt(3), 15);
    expect(r.q).toBe(8);
    expect(r.i2).toBeCloseTo(75, 12);
    expect(r.random.tau2).toBeCloseTo(3, 14);
    expect(r.random.se).toBeCloseTo(2 / Math.sqrt(3), 14);
    expect(r.pQ).toBeCloseTo(Math.exp(-4), 15);
  });

  it("sets τ² and I² to 0 when studies agree more than chance allows", () => {
    const r = metaAnalysis([
      { y: 1, v: 1 },
      { y: 1.1, v: 1 },
    ]);
    expect(r.random.tau2).toBe(0);
    expect(r.i2).toBe(0);
    expect(r.random.estimate).toBeCloseTo(r.fixed.estimate, 15);
  });

  it("has intervals that contain the estimate and widen as the level rises", () => {
    const study = fc.record({
      y: fc.double({ min: -5, max: 5, noNaN: true }),
      v: fc.double({ min: 0.001, max: 10, noNaN: true }),
    });
    fc.assert(
      fc.property(fc.array(study, { minLength: 2, maxLength: 20 }), (studies) => {
        const r = metaAnalysis(studies, 0.9);
        const wide = metaAnalysis(studies, 0.99);
        for (const pooled of [r.fixed, r.random]) {
          expect(pooled.lower).toBeLessThan(pooled.estimate);
          expect(pooled.upper).toBeGreaterThan(pooled.estimate);
        }
        expect(wide.random.upper - wide.random.lower).toBeGreaterThan(r.random.upper - r.random.lower);
        expect(r.random.se).toBeGreaterThanOrEqual(r.fixed.se);
      }),
    );
  });
});
