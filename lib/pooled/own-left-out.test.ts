import { describe, expect, it } from "vitest";
import { ownLeftOutNotes } from "./own-left-out";

const strain = { strainName: "Grey Morning", noDryMass: 0, noFruitingMethod: 0, noRecipe: 0 };
const anyFilter = { byFruitingMethod: false, byRecipe: false };

describe("what keeps the viewer's own blocks out of a pooled figure", () => {
  it("says nothing when every block can count", () => {
    expect(ownLeftOutNotes([strain], { byFruitingMethod: true, byRecipe: true })).toEqual([]);
  });

  it("names blocks without a dry substrate mass, with the count and its verb agreeing", () => {
    const [one] = ownLeftOutNotes([{ ...strain, noDryMass: 1 }], anyFilter);
    expect(one.text).toMatch(/^Your 1 block of Grey Morning with a harvest has no dry substrate mass/);
    expect(one.text).toContain("block_wet_weight and substrate_moisture");
    expect(one.fix.href).toBe("/blocks");
    const [twelve] = ownLeftOutNotes([{ ...strain, noDryMass: 12 }], anyFilter);
    expect(twelve.text).toMatch(
      /^Your 12 blocks of Grey Morning with a harvest have no dry substrate mass \(.*\), so they have no BE and are not/,
    );
  });

  it("names a missing fruiting method or recipe only under that filter", () => {
    const gaps = { ...strain, noFruitingMethod: 12, noRecipe: 3 };
    expect(ownLeftOutNotes([gaps], anyFilter)).toEqual([]);
    const byMethod = ownLeftOutNotes([gaps], { byFruitingMethod: true, byRecipe: false });
    expect(byMethod).toHaveLength(1);
    expect(byMethod[0].text).toMatch(/^Your 12 blocks of Grey Morning have no fruiting method/);
    expect(byMethod[0].text).toContain("fruiting_method column");
    expect(byMethod[0].fix.href).toBe("/season-logs/columns");
    const byRecipe = ownLeftOutNotes([gaps], { byFruitingMethod: false, byRecipe: true });
    expect(byRecipe[0].text).toMatch(/^Your 3 blocks of Grey Morning have no substrate recipe/);
  });
});
