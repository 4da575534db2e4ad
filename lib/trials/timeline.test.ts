import { describe, expect, it } from "vitest";
import {
  addDays,
  attentionThisWeek,
  behindReasons,
  daysBetween,
  missingData,
  reminderToSend,
  timelineAllowances,
  timelineBar,
  timelineInWords,
  timelineProblems,
  type TimelineProgress,
  type TrialTimeline,
} from "./timeline";

// Check values are counted by hand on the Gregorian calendar (ISO 8601 dates, both window ends included).
const timeline: TrialTimeline = {
  inoculationFrom: "2027-03-01",
  inoculationTo: "2027-03-14",
  fruitingFrom: "2027-04-01",
  fruitingTo: "2027-05-31",
  dataDue: "2027-06-15",
};
const empty: TrialTimeline = { inoculationFrom: null, inoculationTo: null, fruitingFrom: null, fruitingTo: null, dataDue: null };

const complete: TimelineProgress = { blocksListed: 12, blocksMade: 12, fruiting: 11, contaminated: 1, flushesRecorded: [11, 11] };
const noBlocks: TimelineProgress = { blocksListed: 12, blocksMade: 0, fruiting: 0, contaminated: 0, flushesRecorded: [0, 0] };
const noHarvests: TimelineProgress = { blocksListed: 12, blocksMade: 12, fruiting: 0, contaminated: 0, flushesRecorded: [0, 0] };
const flushTwoMissing: TimelineProgress = { blocksListed: 12, blocksMade: 12, fruiting: 12, contaminated: 0, flushesRecorded: [12, 9] };

describe("calendar days", () => {
  it("adds and counts days across month ends and a leap day", () => {
    expect(addDays("2027-02-28", 1)).toBe("2027-03-01");
    expect(addDays("2028-02-28", 1)).toBe("2028-02-29");
    expect(addDays("2027-01-01", -1)).toBe("2026-12-31");
    expect(daysBetween("2027-03-01", "2027-04-01")).toBe(31);
    expect(daysBetween("2028-03-01", "2028-02-28")).toBe(-2);
  });
});

describe("the timeline's own order", () => {
  it("accepts a timeline in order, or none at all", () => {
    expect(timelineProblems(timeline)).toEqual([]);
    expect(timelineProblems(empty)).toEqual([]);
    // A one-day window is in order: both ends are included.
    expect(timelineProblems({ ...timeline, inoculationTo: "2027-03-01" })).toEqual([]);
  });

  it("says which field is wrong and why, in plain words", () => {
    expect(timelineProblems({ ...timeline, inoculationTo: "2027-02-20" })).toEqual([
      {
        field: "inoculationTo",
        message: "The inoculation window ends (2027-02-20) before it starts (2027-03-01): the last day must be on or after the first.",
      },
    ]);
    expect(timelineProblems({ ...timeline, fruitingTo: null })).toEqual([
      { field: "fruitingTo", message: "Give both the first and the last day of the fruiting window, or leave both empty." },
    ]);
    expect(timelineProblems({ ...timeline, dataDue: "2027-04-01" }).map((problem) => problem.field)).toEqual(["dataDue"]);
    expect(timelineProblems({ ...timeline, dataDue: "2027-04-01" })[0].message).toMatch(
      /due date must come after the fruiting window opens/,
    );
    expect(timelineProblems({ ...timeline, fruitingFrom: "2027-02-01" }).map((problem) => problem.field)).toEqual(["fruitingFrom"]);
  });
});

describe("being behind", () => {
  it("is never a matter of the trial having started: nothing is behind before a date has passed", () => {
    expect(behindReasons(timeline, noBlocks, "2027-03-14")).toEqual([]);
    expect(behindReasons(empty, noBlocks, "2030-01-01")).toEqual([]);
  });

  it("counts blocks still missing once the inoculation window has closed", () => {
    expect(behindReasons(timeline, noBlocks, "2027-03-15")).toEqual([
      "12 listed blocks are not in the season log, and the inoculation window closed on 2027-03-14",
    ]);
    expect(behindReasons(timeline, complete, "2027-03-15")).toEqual([]);
  });

  it("allows the grace period after fruiting was expected before a farm without any harvest is behind", () => {
    const grace = timelineAllowances.harvestGraceDays;
    expect(behindReasons(timeline, noHarvests, addDays("2027-04-01", grace))).toEqual([]);
    expect(behindReasons(timeline, noHarvests, addDays("2027-04-01", grace + 1))).toEqual([
      `no harvest is recorded yet, more than ${grace} days after fruiting was expected to start (2027-04-01)`,
    ]);
  });

  it("counts anything still missing once the due date has passed, and only then", () => {
    expect(behindReasons(timeline, flushTwoMissing, "2027-06-15")).toEqual([]);
    expect(behindReasons(timeline, flushTwoMissing, "2027-06-16")).toEqual([
      "the data were due on 2027-06-15 and are still missing: flush 2 of 3 blocks",
    ]);
    expect(behindReasons(timeline, complete, "2027-06-16")).toEqual([]);
  });

  it("lists what is missing: blocks not in the season log, then each flush short of the live blocks", () => {
    expect(missingData(complete)).toEqual([]);
    expect(missingData({ blocksListed: 12, blocksMade: 10, fruiting: 9, contaminated: 1, flushesRecorded: [9, 7] })).toEqual([
      "2 listed blocks not yet in the season log",
      "flush 2 of 2 blocks",
    ]);
  });
});

describe("the daily reminder", () => {
  it("reminds a farm with data missing once in the week before the due date", () => {
    const lead = addDays("2027-06-15", -timelineAllowances.reminderLeadDays);
    expect(lead).toBe("2027-06-08");
    expect(reminderToSend(timeline, flushTwoMissing, "2027-06-07", null)).toBeNull();
    expect(reminderToSend(timeline, flushTwoMissing, "2027-06-08", null)).toEqual({ kind: "before-due", items: ["flush 2 of 3 blocks"] });
    expect(reminderToSend(timeline, flushTwoMissing, "2027-06-10", "2027-06-08")).toBeNull();
    // Reminded before the week began (when it was behind for another reason): it hears again in the week.
    expect(reminderToSend(timeline, flushTwoMissing, "2027-06-10", "2027-05-20")?.kind).toBe("before-due");
  });

  it("sends nothing to a farm with nothing missing, nor to a trial without a timeline", () => {
    expect(reminderToSend(timeline, complete, "2027-06-10", null)).toBeNull();
    expect(reminderToSend(timeline, complete, "2027-07-10", null)).toBeNull();
    expect(reminderToSend(empty, flushTwoMissing, "2027-06-10", null)).toBeNull();
  });

  it("reminds a farm behind why, and again only after a week", () => {
    expect(reminderToSend(timeline, flushTwoMissing, "2027-06-16", "2027-06-08")).toEqual({
      kind: "behind",
      items: ["the data were due on 2027-06-15 and are still missing: flush 2 of 3 blocks"],
    });
    expect(reminderToSend(timeline, noBlocks, "2027-03-20", "2027-03-15")).toBeNull();
    expect(reminderToSend(timeline, noBlocks, "2027-03-22", "2027-03-15")?.kind).toBe("behind");
  });

  it("never sends twice on one day", () => {
    expect(reminderToSend(timeline, noBlocks, "2027-03-20", "2027-03-20")).toBeNull();
  });
});

describe("the timeline bar", () => {
  it("places each period and the marks as percentages of the span, both ends included", () => {
    // 2027-03-01 to 2027-06-15 is 106 days apart, so the bar spans 107 days.
    const bar = timelineBar(timeline, "2027-04-01")!;
    expect(bar.start).toBe("2027-03-01");
    expect(bar.end).toBe("2027-06-15");
    expect(bar.periods).toEqual([
      { key: "inoculation", label: "Inoculation", from: "2027-03-01", to: "2027-03-14", left: 0, width: 13.1 },
      { key: "fruiting", label: "Fruiting expected", from: "2027-04-01", to: "2027-05-31", left: 29, width: 57 },
    ]);
    expect(bar.due).toEqual({ date: "2027-06-15", at: 99.1 });
    expect(bar.today).toEqual({ date: "2027-04-01", at: 29, within: true });
  });

  it("keeps today at an end of the bar when it falls outside, and draws nothing without dates", () => {
    expect(timelineBar(timeline, "2027-01-01")!.today).toEqual({ date: "2027-01-01", at: 0, within: false });
    expect(timelineBar(timeline, "2027-09-01")!.today).toEqual({ date: "2027-09-01", at: 100, within: false });
    expect(timelineBar(empty, "2027-01-01")).toBeNull();
  });

  it("says the same in words", () => {
    expect(timelineInWords(timeline, "2027-04-01")).toEqual([
      "Inoculation: 2027-03-01 to 2027-03-14 (ended 18 days ago).",
      "Fruiting expected: 2027-04-01 to 2027-05-31 (under way, ends in 60 days).",
      "Data due: 2027-06-15 (in 75 days).",
    ]);
    expect(timelineInWords(timeline, "2027-02-28")[0]).toBe("Inoculation: 2027-03-01 to 2027-03-14 (starts tomorrow).");
  });
});

describe("needs attention this week", () => {
  it("lists farms behind and the next seven days' dates, soonest first, and nothing of closed trials", () => {
    const items = attentionThisWeek(
      [
        {
          id: "t1",
          code: "T-1",
          status: "running",
          enrolmentDeadline: null,
          timeline,
          farms: [{ farmName: "Fernbrook", behind: ["late"] }],
        },
        { id: "t2", code: "T-2", status: "open", enrolmentDeadline: "2027-06-12", timeline: empty, farms: [] },
        { id: "t3", code: "T-3", status: "collecting", enrolmentDeadline: null, timeline, farms: [{ farmName: "Mill", behind: ["late"] }] },
        { id: "t4", code: "T-4", status: "open", enrolmentDeadline: "2027-06-16", timeline: empty, farms: [] },
      ],
      "2027-06-09",
    );
    expect(items.map((item) => [item.trialCode, item.date, item.text])).toEqual([
      ["T-1", "2027-06-09", "Fernbrook is behind: late"],
      ["T-2", "2027-06-12", "Enrolment closes"],
      ["T-1", "2027-06-15", "The data are due"],
    ]);
  });
});
