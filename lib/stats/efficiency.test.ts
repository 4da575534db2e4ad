import { describe, expect, it } from "vitest";
import { biologicalEfficiency, dryMass, massLoss } from "./efficiency";

// 1 lb = 453.592 37 g exactly; 1 oz = 1/16 lb (NIST Handbook 44, Appendix C).
const GRAMS_PER_POUND = 453.59237;
const GRAMS_PER_OUNCE = GRAMS_PER_POUND / 16;

describe("dryMass", () => {
  it("follows the wet-basis definition (IRRI worked example)", () => {
    // IRRI Rice Knowledge Bank: 1000 kg at 25 % dried to 14 % weighs 1000 × 75/86 = 872.093 kg.
    const dryMatter = dryMass(1_000_000, 0.25);
    expect(dryMatter).toBe(750_000);
    expect(dryMatter / (1 - 0.14) / 1000).toBeCloseTo(872.093, 3);
  });

  it("gives 0.95 kg dry for a 2.5 kg block at 62 % (docs/references.md, computed)", () => {
    expect(dryMass(2500, 0.62)).toBeCloseTo(950, 10);
  });
});

describe("biologicalEfficiency", () => {
  it("is 84.2105263 % for 0.80 kg from a 2.5 kg block at 62 % (docs/references.md, computed)", () => {
    expect(biologicalEfficiency({ freshG: 800, wetBlockG: 2500, moisture: 0.62 })).toBeCloseTo(84.2105263, 7);
  });

  it("is 100 % for 2 lb from a 5 lb block at 60 % (docs/references.md, computed)", () => {
    const wetBlockG = 5 * GRAMS_PER_POUND;
    expect(wetBlockG).toBeCloseTo(2267.96185, 8); // 5 lb = 2.267 961 85 kg
    expect(dryMass(wetBlockG, 0.6)).toBeCloseTo(2 * GRAMS_PER_POUND, 10);
    expect(biologicalEfficiency({ freshG: 2 * GRAMS_PER_POUND, wetBlockG, moisture: 0.6 })).toBeCloseTo(100, 12);
  });

  it("works for three blocks' pooled pick of 11.5 oz (common practice)", () => {
    // 11.5 oz picked from three blocks is 326.02 g.
    const freshG = 11.5 * GRAMS_PER_OUNCE;
    expect(freshG).toBeCloseTo(326.02, 2);
    // Three 5 lb blocks at 60 % hold 6 lb = 96 oz of dry substrate: BE = 11.5/96.
    const wetBlockG = 3 * 5 * GRAMS_PER_POUND;
    expect(biologicalEfficiency({ freshG, wetBlockG, moisture: 0.6 })).toBeCloseTo((11.5 / 96) * 100, 12);
  });

  it("falls inside the published range for oyster on sawdust for a typical block", () => {
    // Tisdale, Miyasaka & Hemmes 2006: oyster on sawdust 44.2–78.5 %. A 2.5 kg block at
    // 60 % (Royse & Shen 2005) giving 600 g is 60 %.
    const be = biologicalEfficiency({ freshG: 600, wetBlockG: 2500, moisture: 0.6 });
    expect(be).toBeCloseTo(60, 12);
    expect(be).toBeGreaterThan(44.2);
    expect(be).toBeLessThan(78.5);
  });
});

describe("massLoss", () => {
  it("is 29/96 ≈ 30.2 % for a 6 lb block that weighs 4 lb 3 oz after its second flush (common practice)", () => {
    const initialG = 6 * GRAMS_PER_POUND;
    expect(initialG / 1000).toBeCloseTo(2.72155422, 8); // 6 lb = 2.721 554 22 kg
    const spentG = 4 * GRAMS_PER_POUND + 3 * GRAMS_PER_OUNCE;
    expect(massLoss(initialG, spentG)).toBeCloseTo((29 / 96) * 100, 12);
    expect(massLoss(initialG, spentG)).toBeCloseTo(30.2, 1);
  });

  it("is negative when a soaked block weighs more than when made", () => {
    expect(massLoss(2000, 2100)).toBeCloseTo(-5, 12);
  });
});
