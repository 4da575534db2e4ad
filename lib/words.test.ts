import { describe, expect, it } from "vitest";
import { agree, count, listInWords } from "./words";

// English grammar (common practice): a count of exactly one takes the singular noun and verb; zero and
// every other count take the plural ("0 farms", "1 farm", "2 farms"; "1 farm has", "3 farms have").
describe("plurals and lists", () => {
  it("counts one, none and many", () => {
    expect(count(1, "farm")).toBe("1 farm");
    expect(count(2, "farm")).toBe("2 farms");
    expect(count(1, "entry", "entries")).toBe("1 entry");
    expect(count(12, "entry", "entries")).toBe("12 entries");
    expect(count(1, "block")).toBe("1 block");
    expect(count(3, "block")).toBe("3 blocks");
    expect(count(0, "harvest")).toBe("0 harvests");
    expect(count(2, "harvest removed", "harvests removed")).toBe("2 harvests removed");
  });

  it("joins a list with commas and a final and", () => {
    expect(listInWords([])).toBe("");
    expect(listInWords(["a"])).toBe("a");
    expect(listInWords(["a", "b"])).toBe("a and b");
    expect(listInWords(["a", "b", "c"])).toBe("a, b and c");
  });
});

describe("verbs that agree with a count", () => {
  it("takes the singular only for one", () => {
    expect(`${count(1, "farm")} ${agree(1, "has", "have")}`).toBe("1 farm has");
    expect(`${count(0, "farm")} ${agree(0, "has", "have")}`).toBe("0 farms have");
    expect(`${count(3, "farm")} ${agree(3, "has", "have")}`).toBe("3 farms have");
  });
});
