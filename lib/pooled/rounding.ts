import type { RegimeComparison } from "./regime-results";
import type { Published, PooledResults, StrainResult } from "./results";
import { comparisonSentence, strainSentence } from "./sentences";

/**
 * The precision every pooled figure is published at: what the page shows, and no more in the
 * API or the CSV, so that two releases (or two filters) cannot be subtracted to the third
 * decimal. Steps are in the figure's own unit.
 */
export const publishedSteps = {
  /** Biological efficiency and differences of BE, in BE points (percent). */
  efficiencyPoints: 0.1,
  /** Contamination rate, percent. */
  contaminationPercent: 1,
  /** Days from inoculation to first harvest. */
  days: 1,
  /** Shares of a block's yield by flush (fractions): whole percent. */
  flushShare: 0.01,
  /** p-values. */
  p: 0.001,
  /** I², percent. */
  i2Percent: 1,
  /** Drying ratio (dry ÷ fresh, a fraction): a tenth of a percent. */
  dryingRatio: 0.001,
} as const;

/** Rounds to a multiple of `step`, without the binary noise that would give 80.30000000000001. */
export function roundTo(value: number, step: number): number {
  const decimals = Math.max(0, Math.ceil(-Math.log10(step)));
  return Number((Math.round(value / step) * step).toFixed(decimals));
}

const be = (value: number) => roundTo(value, publishedSteps.efficiencyPoints);

function mapPublished<T>(figure: Published<T>, round: (value: T) => T): Published<T> {
  return figure.status === "published" ? { status: "published", value: round(figure.value) } : figure;
}

function roundStrain(strain: StrainResult, minimumFarms: number): StrainResult {
  const rounded: StrainResult = {
    ...strain,
    efficiency: mapPublished(strain.efficiency, (value) => ({
      ...value,
      estimate: be(value.estimate),
      lower: be(value.lower),
      upper: be(value.upper),
    })),
    contamination: mapPublished(strain.contamination, (value) => ({
      ...value,
      estimate: roundTo(value.estimate, publishedSteps.contaminationPercent),
      lower: roundTo(value.lower, publishedSteps.contaminationPercent),
      upper: roundTo(value.upper, publishedSteps.contaminationPercent),
    })),
    firstHarvestDays: mapPublished(strain.firstHarvestDays, (value) => ({ ...value, mean: roundTo(value.mean, publishedSteps.days) })),
    flushProfile: mapPublished(strain.flushProfile, (profile) =>
      profile.map((share) => ({
        flush: share.flush,
        meanShare: roundTo(share.meanShare, publishedSteps.flushShare),
        lower: roundTo(share.lower, publishedSteps.flushShare),
        upper: roundTo(share.upper, publishedSteps.flushShare),
        cumulativeShare: roundTo(share.cumulativeShare, publishedSteps.flushShare),
      })),
    ),
    spread: mapPublished(strain.spread, (spread) => spread.map((value) => (value === null ? null : be(value))) as typeof spread),
    drying: mapPublished(strain.drying, (value) => ({
      ...value,
      estimate: roundTo(value.estimate, publishedSteps.dryingRatio),
      lower: roundTo(value.lower, publishedSteps.dryingRatio),
      upper: roundTo(value.upper, publishedSteps.dryingRatio),
    })),
  };
  // The sentence repeats the rounded figures, so it reads the same as the table beside it.
  return { ...rounded, sentence: strainSentence(rounded, minimumFarms) };
}

/** The pooled results as published: every figure at its step, the sentences made again from the rounded figures. */
export function roundPooledResults(results: PooledResults): PooledResults {
  return {
    ...results,
    strains: results.strains.map((strain) => roundStrain(strain, results.minimumFarms)),
    pairwise: mapPublished(results.pairwise, (pairs) =>
      pairs.map((pair) => {
        const estimate = be(pair.estimate);
        const lower = be(pair.lower);
        const upper = be(pair.upper);
        // The sentence's figures: strain totals of farms and blocks stay as counted.
        const from = pair.sentence.match(/from (\d+) farms and (\d+) blocks/);
        return {
          ...pair,
          estimate,
          lower,
          upper,
          pAdjusted: roundTo(pair.pAdjusted, publishedSteps.p),
          sentence: from
            ? comparisonSentence({
                better: pair.strainB,
                base: pair.strainA,
                estimate,
                lower,
                upper,
                farms: Number(from[1]),
                blocks: Number(from[2]),
              })
            : pair.sentence,
        };
      }),
    ),
    heterogeneity: mapPublished(results.heterogeneity, (value) => ({
      ...value,
      strains: value.strains.map((strain) => {
        const estimate = be(strain.estimate);
        const lower = be(strain.lower);
        const upper = be(strain.upper);
        return {
          ...strain,
          estimate,
          lower,
          upper,
          i2: roundTo(strain.i2, publishedSteps.i2Percent),
          tau: be(strain.tau),
          pHolm: roundTo(strain.pHolm, publishedSteps.p),
          sentence: comparisonSentence({
            better: strain.strainName,
            base: value.referenceStrainName,
            estimate,
            lower,
            upper,
            farms: strain.farms,
            blocks: strain.blocks,
          }),
          forest: strain.forest.map((row) => ({ ...row, estimate: be(row.estimate), lower: be(row.lower), upper: be(row.upper) })),
        };
      }),
    })),
  };
}

/** The comparison by climate regime as published: BE to 0.1 point, contamination whole percent, F to 0.01, p to 0.001. */
export function roundRegimeComparison(comparison: RegimeComparison): RegimeComparison {
  const percent = (value: number) => roundTo(value, publishedSteps.contaminationPercent);
  return {
    ...comparison,
    regimes: comparison.regimes.map((regime) => ({
      ...regime,
      contamination: mapPublished(regime.contamination, (value) => ({
        estimate: percent(value.estimate),
        lower: percent(value.lower),
        upper: percent(value.upper),
        meanRoomRate: percent(value.meanRoomRate),
      })),
      efficiency: mapPublished(regime.efficiency, (value) => ({
        ...value,
        estimate: be(value.estimate),
        lower: be(value.lower),
        upper: be(value.upper),
      })),
    })),
    model: mapPublished(comparison.model, (value) => ({
      ...value,
      f: roundTo(value.f, 0.01),
      p: roundTo(value.p, publishedSteps.p),
      differences: value.differences.map((difference) => ({
        ...difference,
        estimate: be(difference.estimate),
        lower: be(difference.lower),
        upper: be(difference.upper),
        pAdjusted: roundTo(difference.pAdjusted, publishedSteps.p),
      })),
    })),
  };
}
