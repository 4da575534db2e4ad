import type { StrainResult } from "./results";

function points(value: number): string {
  return String(Math.round(value));
}

/** "Strain B gave 9 BE points more than strain A (95 % interval 3 to 15), from 7 farms and 412 blocks." */
export function comparisonSentence(input: {
  better: string;
  base: string;
  estimate: number;
  lower: number;
  upper: number;
  farms: number;
  blocks: number;
}): string {
  const { better, base, estimate, lower, upper, farms, blocks } = input;
  const from = `from ${farms} farms and ${blocks} blocks`;
  const interval = `(95 % interval ${points(lower)} to ${points(upper)})`;
  if (Math.round(estimate) === 0) return `${better} gave about the same biological efficiency as ${base} ${interval}, ${from}.`;
  const direction = estimate > 0 ? "more" : "fewer";
  const sentence = `${better} gave ${points(Math.abs(estimate))} BE points ${direction} than ${base} ${interval}, ${from}.`;
  return lower <= 0 && upper >= 0 ? `${sentence} The interval includes no difference, so the data cannot tell them apart.` : sentence;
}

export function strainSentence(result: StrainResult, minimumFarms: number): string {
  if (result.efficiency.status === "suppressed") {
    return `${result.strainName}: not enough data to publish (${result.efficiency.message}; the co-op publishes a figure only when at least ${minimumFarms} farms contributed).`;
  }
  const { estimate, lower, upper, farms, blocks, adjustedForFarm } = result.efficiency.value;
  return `${result.strainName} averaged ${estimate.toFixed(1)} % biological efficiency (95 % interval ${lower.toFixed(1)} to ${upper.toFixed(1)}${adjustedForFarm ? ", adjusted for farm" : ""}), from ${farms} farms and ${blocks} blocks that fruited.`;
}
