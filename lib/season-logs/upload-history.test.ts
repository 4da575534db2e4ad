import { describe, expect, it } from "vitest";
import { changesInWords, uploadHistoryDetails, uploadOutcomeWords, type UploadHistoryFacts } from "./upload-history";

const counts = { newBlocks: 2, changedBlocks: 0, untouchedBlocks: 4, newHarvests: 1, changedHarvests: 0, untouchedHarvests: 9 };
const facts = (over: Partial<UploadHistoryFacts> = {}): UploadHistoryFacts => ({
  outcome: "received",
  committedAt: null,
  undoneAt: null,
  undoneBy: "",
  check: { rowCount: 12, errorCount: 0, warningCount: 1, counts, firstIssues: [] },
  ...over,
});

describe("a past upload's row", () => {
  it("says the last check's counts with plurals right, and what a commit would change", () => {
    expect(uploadHistoryDetails(facts())).toEqual([
      { label: "Last check", value: "12 rows, 0 errors and 1 warning" },
      { label: "Committing it would change", value: "2 new blocks and 1 new harvest" },
    ]);
  });

  it("lists the first problems and says how many more there are", () => {
    const details = uploadHistoryDetails(
      facts({
        outcome: "rejected",
        check: {
          rowCount: 1,
          errorCount: 4,
          warningCount: 0,
          counts,
          firstIssues: [{ line: 2, severity: "error", message: 'Line 2, column "strain": PO-1O is not a strain in the register.' }],
        },
      }),
    );
    expect(details).toEqual([
      { label: "Last check", value: "1 row, 4 errors and 0 warnings" },
      { label: "Error", value: 'Line 2, column "strain": PO-1O is not a strain in the register.' },
      { label: "Not listed here", value: "3 more problems; check the file again to see them all" },
    ]);
  });

  it("says when it was committed and undone, and by whom", () => {
    const details = uploadHistoryDetails(
      facts({
        outcome: "committed",
        committedAt: "2026-04-12T09:30:00.000Z",
        undoneAt: "2026-04-13T10:00:00.000Z",
        undoneBy: "Noor Castell",
      }),
    );
    expect(details).toContainEqual({ label: "The commit changed", value: "2 new blocks and 1 new harvest" });
    expect(details).toContainEqual({ label: "Committed", value: "2026-04-12 09:30 UTC" });
    expect(details).toContainEqual({ label: "Undone", value: "2026-04-13 10:00 UTC by Noor Castell" });
    expect(uploadOutcomeWords({ outcome: "committed", undoneAt: "2026-04-13T10:00:00.000Z" })).toBe("Committed, undone 2026-04-13");
  });

  it("says a file that changes nothing changes nothing", () => {
    expect(changesInWords({ ...counts, newBlocks: 0, newHarvests: 0 })).toBeNull();
    expect(
      uploadHistoryDetails(facts({ check: { ...facts().check, counts: { ...counts, newBlocks: 0, newHarvests: 0 } } })),
    ).toContainEqual({
      label: "Committing it would change",
      value: "nothing",
    });
  });
});
