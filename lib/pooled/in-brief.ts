import type { PooledResults } from "./results";

const points = (value: number) => String(Math.round(Math.abs(value)));

/**
 * The answer before the evidence: two or three sentences that say which strain did best, by how
 * much over the next, and how sure the co-op can be, from the same published figures the tables
 * below show (the farm-adjusted means and their Tukey comparison), so the page gives one answer.
 */
export function resultsInBrief(results: PooledResults): string[] {
  const published = results.strains.flatMap((strain) =>
    strain.efficiency.status === "published" ? [{ name: strain.strainName, ...strain.efficiency.value }] : [],
  );
  if (published.length === 0)
    return [
      `No strain has been grown on at least ${results.minimumFarms} farms under these choices, so there is no figure to publish yet. Try any recipe and any fruiting method, or another species.`,
    ];
  const [best, next] = [...published].sort((a, b) => b.estimate - a.estimate);
  const mean = `${best.estimate.toFixed(1)} % biological efficiency on average (95 % interval ${best.lower.toFixed(1)} to ${best.upper.toFixed(1)}), from ${best.farms} farms and ${best.blocks} blocks`;
  if (!next)
    return [
      `Only ${best.name} has enough data to publish: ${mean}.`,
      `A comparison needs a second strain grown on at least ${results.minimumFarms} farms.`,
    ];
  const lead = `${best.name} gave the most: ${mean}${best.adjustedForFarm ? ", allowing for the farm each block grew on" : ""}.`;
  if (results.pairwise.status !== "published")
    return [lead, `Its difference from ${next.name} is not published: ${results.pairwise.message}.`];
  const pair = results.pairwise.value.find(
    (candidate) =>
      (candidate.strainA === best.name && candidate.strainB === next.name) ||
      (candidate.strainA === next.name && candidate.strainB === best.name),
  );
  if (!pair) return [lead];
  // The pair is strainB − strainA; turned round so it reads as best − next.
  const sign = pair.strainB === best.name ? 1 : -1;
  const [estimate, lower, upper] = [
    pair.estimate * sign,
    Math.min(pair.lower * sign, pair.upper * sign),
    Math.max(pair.lower * sign, pair.upper * sign),
  ];
  const interval = `95 % interval ${Math.round(lower)} to ${Math.round(upper)}`;
  if (lower <= 0)
    return [
      lead,
      `${next.name} came next, ${points(estimate)} BE points lower (${interval}).`,
      `That interval includes no difference, so the data cannot yet tell ${best.name} and ${next.name} apart: more blocks on more farms would.`,
    ];
  return [
    lead,
    `That is ${points(estimate)} BE points more than ${next.name}, the next best (${interval}).`,
    `The whole interval is above zero, so the lead is unlikely to be chance, though ${best.name} may gain more or less than that in your own rooms.`,
  ];
}
