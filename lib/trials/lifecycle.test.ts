import { describe, expect, it } from "vitest";
import { assertMove, canMove, nextStatuses, trialStatuses, TrialRuleError, remindersRun } from "./lifecycle";

describe("trial lifecycle", () => {
  it("moves forward one step at a time: Draft → Open for enrolment → Running → Collecting results → Published", () => {
    expect(canMove("draft", "open")).toBe(true);
    expect(canMove("open", "running")).toBe(true);
    expect(canMove("running", "collecting")).toBe(true);
    expect(canMove("collecting", "published")).toBe(true);
  });

  it("refuses skipping, going back and leaving a finished trial", () => {
    expect(() => assertMove("draft", "running")).toThrow(TrialRuleError);
    expect(() => assertMove("draft", "published")).toThrow(
      /cannot move to "Published"; it can move to "Open for enrolment" or "Withdrawn"/,
    );
    expect(() => assertMove("running", "open")).toThrow(TrialRuleError);
    expect(() => assertMove("published", "withdrawn")).toThrow(/finished/);
    expect(() => assertMove("withdrawn", "draft")).toThrow(/finished/);
    expect(() => assertMove("open", "open")).toThrow(TrialRuleError);
  });

  it("lets every unfinished trial be withdrawn, and nothing else from the end states", () => {
    for (const status of trialStatuses) {
      const finished = status === "published" || status === "withdrawn";
      expect(canMove(status, "withdrawn")).toBe(!finished);
      if (finished) expect(nextStatuses(status)).toEqual([]);
    }
  });

  it("sends reminders only while the trial runs, never once it is closed", () => {
    expect(trialStatuses.filter(remindersRun)).toEqual(["running"]);
  });
});
