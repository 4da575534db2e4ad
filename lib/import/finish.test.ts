import { describe, expect, it } from "vitest";
import { readDate } from "./dates";
import { decideDateOrder } from "./finish";
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
