import { describe, expect, it } from "vitest";
import { signInPace, waitBeforeNextTry, waitInWords } from "./sign-in-pace";

const rule = signInPace.accountAndAddress;

describe("pacing wrong passwords", () => {
  it("lets the first few failures through without a wait", () => {
    for (let failures = 0; failures < rule.free; failures++) expect(waitBeforeNextTry(rule, failures, 0)).toBe(0);
  });

  it("doubles the wait with every further failure, up to the ceiling, and never locks for good", () => {
    const waits = Array.from({ length: 14 }, (_, extra) => waitBeforeNextTry(rule, rule.free + extra, 0));
    expect(waits.slice(0, 5)).toEqual([2, 4, 8, 16, 32]);
    expect(Math.max(...waits)).toBe(rule.ceilingSeconds);
    expect(waitBeforeNextTry(rule, 10_000, 0)).toBe(rule.ceilingSeconds);
  });

  it("counts the wait from the last failure", () => {
    expect(waitBeforeNextTry(rule, rule.free + 2, 3)).toBe(5);
    expect(waitBeforeNextTry(rule, rule.free + 2, 8)).toBe(0);
    expect(waitBeforeNextTry(rule, rule.free + 2, Infinity)).toBe(0);
  });

  it("says the wait in words a person reads", () => {
    expect(waitInWords(1)).toBe("1 second");
    expect(waitInWords(45)).toBe("45 seconds");
    expect(waitInWords(61)).toBe("2 minutes");
    expect(waitInWords(900)).toBe("15 minutes");
  });
});
