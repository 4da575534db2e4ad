import { describe, expect, it } from "vitest";
import { RegisterMatcher, editDistance, lookalikeDistance, registerKey } from "./registers";

const methods = new RegisterMatcher([
  { id: "m-across", code: "SLIT-ACROSS", names: ["Slits cut across the bag"] },
  { id: "m-along", code: "SLIT-ALONG", names: ["Slits cut along the bag"] },
  { id: "m-top", code: "TOP-OPEN", names: ["Bag opened at the top"] },
]);
const strains = new RegisterMatcher([
  { id: "s-10", code: "PO-10", names: ["Grey oyster, culture bank"] },
  { id: "s-11", code: "PO-11", names: ["Grey oyster, wild clone"] },
  { id: "s-le", code: "LE-01", names: ["Shiitake cold-weather line"] },
]);

describe("registerKey", () => {
  it("ignores case, accents, spaces and punctuation", () => {
    expect(registerKey(" po 03 ")).toBe("PO-03");
    expect(registerKey("po_03")).toBe(registerKey("PO-03"));
    expect(registerKey("Lion’s mane")).toBe(registerKey("lion's mane"));
    expect(registerKey("Pleurotus Ostréatus")).toBe("PLEUROTUS-OSTREATUS");
  });
});

describe("lookalikeDistance", () => {
  it("counts a letter taken for its look-alike digit as a quarter of an edit", () => {
    expect(lookalikeDistance("PO-1O", "PO-10")).toBe(0.25);
    expect(lookalikeDistance("PO-1O", "PO-11")).toBe(1);
    expect(lookalikeDistance("LE-OL", "LE-01")).toBe(0.5);
    expect(lookalikeDistance("PO-I0", "PO-10")).toBe(0.25);
  });

  it("is the plain edit distance for other edits", () => {
    expect(lookalikeDistance("KITTEN", "SITTING")).toBe(editDistance("KITTEN", "SITTING"));
    expect(editDistance("KITTEN", "SITTING")).toBe(3);
    expect(lookalikeDistance("", "ABC")).toBe(3);
  });
});

describe("RegisterMatcher", () => {
  it("finds an entry by its code or by its name, in any case", () => {
    expect(methods.find("slit-across")?.id).toBe("m-across");
    expect(methods.find("SLITS CUT ACROSS THE BAG")?.id).toBe("m-across");
    expect(methods.find("bag opened at the top")?.id).toBe("m-top");
    expect(strains.find("grey oyster, wild clone")?.id).toBe("s-11");
  });

  it("finds nothing for an unknown text or a name two entries share", () => {
    expect(methods.find("X-cut")).toBeNull();
    const shared = new RegisterMatcher([
      { id: "a", code: "PO-01", names: ["Grey oyster"] },
      { id: "b", code: "PO-02", names: ["Grey oyster"] },
    ]);
    expect(shared.find("grey oyster")).toBeNull();
    expect(shared.find("po-02")?.id).toBe("b");
  });

  it("suggests the nearest entry, weighing O/0 and l/1/I as near", () => {
    expect(strains.nearest("PO-1O")?.code).toBe("PO-10");
    expect(strains.nearest("PO-l1")?.code).toBe("PO-11");
    expect(strains.nearest("LE-Ol")?.code).toBe("LE-01");
    expect(methods.nearest("slits cut accross the bag")?.code).toBe("SLIT-ACROSS");
    expect(methods.nearest("slit along")?.code).toBe("SLIT-ALONG");
    expect(methods.suggestion("TOP-0PEN")).toBe(' Did you mean "TOP-OPEN" (Bag opened at the top)?');
  });

  it("suggests nothing when no entry is close", () => {
    expect(strains.nearest("reishi")).toBeNull();
    expect(methods.suggestion("")).toBe("");
  });
});
