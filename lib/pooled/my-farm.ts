import { biologicalEfficiency, flushProfile, forecastRemaining, massLoss, StatsInputError, type FlushProfile } from "@/lib/stats";
import { percentileOf, type EfficiencyBins } from "./bins";

export interface OwnBlock {
  id: string;
  strainId: string;
  strainName: string;
  speciesName: string;
  contaminated: boolean;
  wetG: number | null;
  moisture: number | null;
  spentG: number | null;
  harvests: { flush: number; freshG: number }[];
}

export interface OwnStrainSummary {
  strainId: string;
  strainName: string;
  speciesName: string;
  blocks: number;
  activeBlocks: number;
  contaminated: number;
  contaminationPercent: number;
  harvests: number;
  freshG: number;
  /** Uncontaminated blocks that fruited but lack a wet block weight or moisture, so have no BE. */
  withoutDryMass: number;
  /** Mean BE (%) of the farm's uncontaminated blocks that fruited and whose substrate was weighed. */
  meanEfficiency: number | null;
  /** Mean mass loss (%) of finished blocks (spent mass weighed). */
  meanMassLoss: number | null;
  /** Percent of the co-op's blocks below the farm's mean BE, as published (see publishedPercentile); a message when withheld. */
  percentile: { status: "published"; value: number } | { status: "suppressed"; message: string };
  /** Fresh grams expected from active blocks, from the co-op's flush profile; null without one. */
  expectedRemaining: { expectedG: number; lowerG: number; upperG: number; blocks: number } | null;
  ownCumulative: number[] | null;
  coopCumulative: number[] | null;
}

function blockEfficiency(block: OwnBlock): number | null {
  if (block.contaminated || !block.wetG || block.moisture === null || block.harvests.length === 0) return null;
  const freshG = block.harvests.reduce((sum, harvest) => sum + harvest.freshG, 0);
  return biologicalEfficiency({ freshG, wetBlockG: block.wetG, moisture: block.moisture });
}

/**
 * A farm's place among the co-op's blocks, in whole percent and held between 10 and 90: a farm
 * that tries its own figures up and down cannot read the co-op's tails, where single blocks lie.
 */
export function publishedPercentile(percentile: number): number {
  return Math.min(90, Math.max(10, Math.round(percentile)));
}

const mean = (values: number[]) => (values.length ? values.reduce((sum, value) => sum + value, 0) / values.length : null);

/**
 * The farm's own season by strain, set against the co-op: `benchmarks` holds per strain the
 * co-op's BE bins and flush profile, each null where fewer than the minimum farms contributed.
 */
export function summariseOwnFarm(
  blocks: readonly OwnBlock[],
  benchmarks: Map<string, { bins: EfficiencyBins | null; profile: FlushProfile | null }>,
  minimumFarms: number,
): OwnStrainSummary[] {
  const byStrain = new Map<string, OwnBlock[]>();
  for (const block of blocks) byStrain.set(block.strainId, [...(byStrain.get(block.strainId) ?? []), block]);
  return [...byStrain.values()]
    .map((strainBlocks) => {
      const first = strainBlocks[0];
      const benchmark = benchmarks.get(first.strainId);
      const efficiencies = strainBlocks.map(blockEfficiency).filter((value): value is number => value !== null);
      const finished = strainBlocks.filter((block) => !block.contaminated && block.spentG !== null);
      const active = strainBlocks.filter((block) => !block.contaminated && block.spentG === null);
      const meanEfficiency = mean(efficiencies);
      const contaminated = strainBlocks.filter((block) => block.contaminated).length;

      let percentile: OwnStrainSummary["percentile"] = { status: "suppressed", message: `fewer than ${minimumFarms} farms` };
      const withoutDryMass = strainBlocks.filter(
        (block) => !block.contaminated && block.harvests.length > 0 && blockEfficiency(block) === null,
      ).length;
      if (meanEfficiency === null)
        percentile = {
          status: "suppressed",
          message:
            withoutDryMass > 0 ? "none: your blocks have no dry substrate mass (see above)" : "no blocks with a biological efficiency yet",
        };
      else if (benchmark?.bins)
        percentile = { status: "published", value: publishedPercentile(percentileOf(benchmark.bins, meanEfficiency)) };

      let expectedRemaining: OwnStrainSummary["expectedRemaining"] = null;
      if (benchmark?.profile) {
        const total = { expectedG: 0, lowerG: 0, upperG: 0, blocks: 0 };
        for (const block of active) {
          if (block.harvests.length === 0) continue;
          try {
            const forecast = forecastRemaining({ flushesSoFar: block.harvests }, benchmark.profile);
            total.expectedG += forecast.expectedRemainingG;
            total.lowerG += forecast.lower;
            total.upperG += forecast.upper;
            total.blocks += 1;
          } catch (error) {
            if (!(error instanceof StatsInputError)) throw error;
          }
        }
        if (total.blocks > 0) expectedRemaining = total;
      }

      let ownCumulative: number[] | null = null;
      try {
        ownCumulative = flushProfile(finished.flatMap((block) => block.harvests.map((harvest) => ({ blockId: block.id, ...harvest })))).map(
          (share) => share.cumulativeShare,
        );
      } catch (error) {
        if (!(error instanceof StatsInputError)) throw error;
      }

      return {
        strainId: first.strainId,
        strainName: first.strainName,
        speciesName: first.speciesName,
        blocks: strainBlocks.length,
        activeBlocks: active.length,
        contaminated,
        contaminationPercent: (100 * contaminated) / strainBlocks.length,
        harvests: strainBlocks.reduce((sum, block) => sum + block.harvests.length, 0),
        withoutDryMass,
        freshG: strainBlocks.reduce((sum, block) => sum + block.harvests.reduce((total, harvest) => total + harvest.freshG, 0), 0),
        meanEfficiency,
        meanMassLoss: mean(finished.filter((block) => block.wetG).map((block) => massLoss(block.wetG!, block.spentG!))),
        percentile,
        expectedRemaining,
        ownCumulative,
        coopCumulative: benchmark?.profile?.map((share) => share.cumulativeShare) ?? null,
      };
    })
    .sort((a, b) => a.speciesName.localeCompare(b.speciesName) || a.strainName.localeCompare(b.strainName));
}
