import { describe, expect, it } from "vitest";
import {
  assertMove,
  canMove,
  canSeeTrial,
  nextStatuses,
  openingProblem,
  publishingProblem,
  remindersRun,
  startingProblem,
  trialStatuses,
  TrialRuleError,
} from "./lifecycle";

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

describe("what must hold before a trial moves on", () => {
  it("shows a draft to the coordinator alone, and every later state to every member", () => {
    expect(trialStatuses.filter((status) => canSeeTrial("farm_manager", status))).toEqual(
      trialStatuses.filter((status) => status !== "draft"),
    );
    for (const role of ["grower", "observer", "farm_manager"] as const) expect(canSeeTrial(role, "draft")).toBe(false);
    expect(trialStatuses.every((status) => canSeeTrial("coordinator", status))).toBe(true);
  });

  it("opens enrolment only with two arms or more and exactly one reference", () => {
    expect(openingProblem([{ isReference: true }])).toMatch(/at least 2 arms/);
    expect(openingProblem([{ isReference: false }, { isReference: false }])).toMatch(/exactly one arm as the reference/);
    expect(openingProblem([{ isReference: true }, { isReference: true }])).toMatch(/exactly one arm as the reference/);
    expect(openingProblem([{ isReference: true }, { isReference: false }])).toBeNull();
  });

  it("starts only with at least the co-op's minimum of farms, and says how many accepted", () => {
    expect(startingProblem(0, 3)).toMatch(/No farm has accepted/);
    expect(startingProblem(1, 3)).toMatch(/^Only 1 farm has accepted\. .*at least 3 farms/);
    expect(startingProblem(2, 3)).toMatch(/^Only 2 farms have accepted/);
    expect(startingProblem(3, 3)).toBeNull();
  });

  it("publishes only a run of the analysis that exists", () => {
    expect(publishingProblem(0)).toMatch(/no analysis yet/);
    expect(publishingProblem(1)).toBeNull();
  });
});
