import { describe, expect, it } from "vitest";
import type { StrainResult } from "./results";
import { strainTableRow } from "./strain-row";

const withheld = { status: "suppressed", message: "fewer than 3 farms grew it" } as const;

describe("a strain's row of the side-by-side table", () => {
  it("says why a figure is withheld once, and only 'withheld' in the row's other cells", () => {
    const row = strainTableRow({
      strainId: "s",
      strainName: "Slate Blue",
      farms: withheld,
      blocks: withheld,
      efficiency: withheld,
      contamination: withheld,
      firstHarvestDays: withheld,
      flushProfile: withheld,
      spread: withheld,
      drying: withheld,
      sentence: "",
    } satisfies StrainResult);
    const cells = Object.values(row);
    expect(cells.filter((cell) => cell === "fewer than 3 farms grew it")).toHaveLength(1);
    expect(row.farms).toBe("fewer than 3 farms grew it");
    expect(row.efficiency).toBe("withheld");
  });

  it("writes published figures as the page reads them", () => {
    const row = strainTableRow({
      strainId: "s",
      strainName: "Grey Morning",
      farms: { status: "published", value: 5 },
      blocks: { status: "published", value: 40 },
      efficiency: {
        status: "published",
        value: { estimate: 61.24, lower: 57.5, upper: 65.04, adjustedForFarm: true, farms: 5, blocks: 40 },
      },
      contamination: { status: "published", value: { estimate: 4, lower: 1, upper: 12, contaminated: 2, blocks: 40 } },
      firstHarvestDays: { status: "published", value: { mean: 30.6, blocks: 40 } },
      flushProfile: withheld,
      spread: withheld,
      drying: { status: "published", value: { estimate: 0.094, lower: 0.089, upper: 0.099, farms: 4, blocks: 37 } },
      sentence: "",
    } satisfies StrainResult);
    expect(row).toMatchObject({
      drying: "9.4 % (8.9 to 9.9)",
      farms: "5",
      efficiency: "61.2 % (57.5 to 65.0)",
      firstHarvest: "31 days",
      flushProfile: "fewer than 3 farms grew it",
    });
  });
});
