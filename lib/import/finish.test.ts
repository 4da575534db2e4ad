import { describe, expect, it } from "vitest";
import { readDate } from "./dates";
import { decideDateOrder } from "./finish";
import { parseSeasonLog } from "./season-log";
import type { DateEvidence } from "./state";

const none: DateEvidence = { dayFirstOnly: 0, monthFirstOnly: 0, firstDayFirst: null, firstMonthFirst: null, firstEither: null };
const at = (value: string) => ({ line: 2, column: "inoculated_on", value });

describe("decideDateOrder (stage 6)", () => {
  it("takes the grower's order, else the dates that read one way only, the majority winning", () => {
    expect(decideDateOrder({ ...none, monthFirstOnly: 3 }, "dmy", readDate)).toEqual({ order: "dmy" });
    expect(decideDateOrder({ ...none, dayFirstOnly: 1, firstDayFirst: at("21.03.2026") }, undefined, readDate)).toEqual({ order: "dmy" });
    expect(
      decideDateOrder(
        { ...none, dayFirstOnly: 1, monthFirstOnly: 2, firstDayFirst: at("21/03/2026"), firstMonthFirst: at("03/21/2026") },
        undefined,
        readDate,
      ),
    ).toEqual({ order: "mdy" });
    expect(decideDateOrder(none, undefined, readDate)).toEqual({ order: null });
  });

  it("never guesses: as many of each, or only dates that read both ways, ask the grower", () => {
    const tie = decideDateOrder(
      { ...none, dayFirstOnly: 1, monthFirstOnly: 1, firstDayFirst: at("21/03/2026"), firstMonthFirst: at("03/21/2026") },
      undefined,
      readDate,
    );
    expect(tie.order).toBe("ambiguous");
    expect(tie.issue?.code).toBe("mixed_date_orders");
    const either = decideDateOrder({ ...none, firstEither: at("03/04/2026") }, undefined, readDate);
    expect(either.order).toBe("ambiguous");
    expect(either.issue?.code).toBe("ambiguous_date_order");
    expect(either.issue?.message).toContain("2026-04-03");
  });
});

describe("groupRepeatedIssues", () => {
  it("makes one issue of the same problem on many rows, naming the runs of lines and the value as written", () => {
    const lines = [4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 22];
    const text = parseSeasonLog(
      `block_id,strain,contaminated\n${Array.from({ length: 22 }, (_, index) => `B-${index + 2},PO-03,${lines.includes(index + 2) ? "kaputt" : "nein"}`).join("\n")}\n`,
      { today: "2026-12-31" },
    );
    expect(text.issues).toHaveLength(1);
    expect(text.issues[0]).toMatchObject({ line: 4, code: "not_yes_or_no", column: "contaminated", value: "kaputt", count: 17 });
    expect(text.issues[0].lineRanges).toEqual([
      [4, 19],
      [22, 22],
    ]);
    expect(text.issues[0].message).toMatch(/^Lines 4–19 and 22 \(17 rows\), column "contaminated": "kaputt" is not yes or no/);
  });

  it("keeps problems apart that differ in value, column or wording", () => {
    const result = parseSeasonLog("block_id,strain,contaminated\nB-1,PO-03,kaputt\nB-2,PO-03,vielleicht\nB-3,PO-03,kaputt\n");
    expect(result.issues.map((issue) => [issue.line, issue.value, issue.count ?? 1])).toEqual([
      [2, "kaputt", 2],
      [3, "vielleicht", 1],
    ]);
  });
});
