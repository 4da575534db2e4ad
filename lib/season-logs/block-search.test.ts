import { describe, expect, it } from "vitest";
import { blockSearchFromSearchParam, containsPattern, longestBlockSearch } from "./block-search";

describe("a search in the blocks page's address", () => {
  it("is trimmed, its spaces made one, and a blank one is none", () => {
    expect(blockSearchFromSearchParam("  tray   4 ")).toBe("tray 4");
    expect(blockSearchFromSearchParam("FE-001")).toBe("FE-001");
    expect(blockSearchFromSearchParam("   ")).toBeNull();
    expect(blockSearchFromSearchParam("")).toBeNull();
    expect(blockSearchFromSearchParam(undefined)).toBeNull();
  });

  it("takes the first of a repeated parameter and cuts a long one", () => {
    expect(blockSearchFromSearchParam(["mould", "shelf"])).toBe("mould");
    expect(blockSearchFromSearchParam("x".repeat(500))).toHaveLength(longestBlockSearch);
  });
});

// PostgreSQL 15 manual, 9.7.1 LIKE (from memory): `_` matches any one character, `%` any run, and the
// default escape character is the backslash, so `\%`, `\_` and `\\` match themselves.
describe("the pattern a search becomes", () => {
  it("finds the words anywhere in a code or note", () => {
    expect(containsPattern("tray 4")).toBe("%tray 4%");
  });

  it("takes the marks LIKE reads as wildcards literally", () => {
    expect(containsPattern("10%")).toBe("%10\\%%");
    expect(containsPattern("FE_001")).toBe("%FE\\_001%");
    expect(containsPattern("a\\b")).toBe("%a\\\\b%");
  });
});
