import type { Published, StrainResult } from "./results";

export type StrainTableRow = Record<
  "strain" | "farms" | "blocks" | "efficiency" | "contamination" | "firstHarvest" | "flushProfile" | "drying",
  string
>;

const one = (value: number) => value.toFixed(1);
/** A drying ratio (a fraction) as the percent the page shows, to a tenth. */
export const dryingPercent = (ratio: number) => (ratio * 100).toFixed(1);

/**
 * A strain's row of "Strains side by side". A figure withheld says why once, in the first cell
 * withheld; the row's other withheld cells only say "withheld", so the reason is read once.
 */
export function strainTableRow(result: StrainResult): StrainTableRow {
  let reasonGiven = false;
  const show = <T>(figure: Published<T>, format: (value: T) => string): string => {
    if (figure.status === "published") return format(figure.value);
    if (reasonGiven) return "withheld";
    reasonGiven = true;
    return figure.message;
  };
  return {
    strain: result.strainName,
    farms: show(result.farms, String),
    blocks: show(result.blocks, String),
    efficiency: show(
      result.efficiency,
      (v) => `${one(v.estimate)} % (${one(v.lower)} to ${one(v.upper)})${v.adjustedForFarm ? "" : " not adjusted for farm"}`,
    ),
    contamination: show(result.contamination, (v) => `${v.estimate} % (${v.lower} to ${v.upper})`),
    firstHarvest: show(result.firstHarvestDays, (v) => `${Math.round(v.mean)} days`),
    flushProfile: show(result.flushProfile, (profile) =>
      profile.map((share) => `${share.flush}: ${Math.round(share.meanShare * 100)} %`).join(", "),
    ),
    drying: show(result.drying, (v) => `${dryingPercent(v.estimate)} % (${dryingPercent(v.lower)} to ${dryingPercent(v.upper)})`),
  };
}
