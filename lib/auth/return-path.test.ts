import { describe, expect, it } from "vitest";
import { safeReturnPath } from "./return-path";

describe("the return address after signing in", () => {
  it("keeps the path and query of our own pages", () => {
    expect(safeReturnPath("http://localhost:3000/results?species=oyster")).toBe("/results?species=oyster");
    expect(safeReturnPath("/trials")).toBe("/trials");
  });

  it("never sends anyone to another site", () => {
    expect(safeReturnPath("https://elsewhere.example/steal")).toBe("/steal");
    expect(safeReturnPath("//elsewhere.example/x")).toBe("/x");
    expect(safeReturnPath("/\\elsewhere.example")).not.toMatch(/^\/\//);
  });

  it("falls back to the start page", () => {
    expect(safeReturnPath(undefined)).toBe("/");
    expect(safeReturnPath("/sign-in?x=1")).toBe("/");
  });
});
