import { drySubstrateGrams } from "../units";

/**
 * The import's checks of a block and its harvests, as plain functions over plain values: the
 * season-log parser (stage 5, `blocks.ts`) and the quick harvest form both call these, so a
 * harvest is judged the same way whichever way it comes in. Each caller words the issue for
 * where it shows it (a line and column of a file, a field of a form) under the same code.
 */

/** Above this, a block's biological efficiency is implausible for sawdust blocks (a warning). */
export const highestPlausibleEfficiency = 250;

// Oyster and shiitake blocks give roughly 50–150 %, a single block rarely over 250 % (common
// practice). Beyond 400 % no block reaches: a unit or decimal mark is read wrong (an error).
export const lowestColumnEfficiency = 5;
export const highestPossibleEfficiency = 400;

/** A harvest dated before its block's inoculation (both YYYY-MM-DD): an error, `harvest_before_inoculation`. */
export function harvestBeforeInoculation(harvestedOn: string | null, inoculatedOn: string | null): boolean {
  return harvestedOn !== null && inoculatedOn !== null && harvestedOn < inoculatedOn;
}

/** The flush numbers below the highest that have no harvest: a warning, `flush_gap`. */
export function missingFlushes(flushes: readonly number[]): number[] {
  if (flushes.length === 0) return [];
  const largest = Math.max(...flushes);
  const missing: number[] = [];
  for (let flush = 1; flush < largest; flush++) if (!flushes.includes(flush)) missing.push(flush);
  return missing;
}

/** A flush heavier than the whole wet block: a warning, `flush_heavier_than_block`. */
export function flushHeavierThanBlock(freshGrams: number | null, wetBlockGrams: number | null): boolean {
  return freshGrams !== null && wetBlockGrams !== null && freshGrams > wetBlockGrams;
}

/**
 * A block's biological efficiency in percent from all its fresh harvest, or null when it has no
 * harvest or its wet weight or moisture is not known.
 */
export function efficiencyPercent(totalFreshGrams: number, wetBlockGrams: number | null, moisture: number | null): number | null {
  if (wetBlockGrams === null || moisture === null || totalFreshGrams === 0) return null;
  const dry = drySubstrateGrams(wetBlockGrams, moisture);
  return dry > 0 ? (totalFreshGrams / dry) * 100 : null;
}

/**
 * How far a block's efficiency is from what blocks reach: "implausible" above 250 % (a warning,
 * `efficiency_implausible`), "impossible" above 400 %, where a unit is surely wrong (an error).
 */
export function efficiencyVerdict(efficiency: number | null): "plausible" | "implausible" | "impossible" {
  if (efficiency === null || efficiency <= highestPlausibleEfficiency) return "plausible";
  return efficiency > highestPossibleEfficiency ? "impossible" : "implausible";
}

/**
 * A harvest on a block marked contaminated (a warning, `harvest_on_contaminated_block`): "after"
 * when it is dated after the day the contamination was found, "marked" when the block is only
 * marked. The importer warns of "after" only (a file holds a block's flushes from before it was
 * lost); the quick form of both, since a flush recorded now on a block already marked is unusual.
 */
export function harvestOnContaminatedBlock(
  block: { contaminated: boolean; contaminatedOn: string | null },
  harvestedOn: string | null,
): "after" | "marked" | null {
  if (!block.contaminated) return null;
  // The day it was found may still have had a last pick: only a later day is "after".
  return block.contaminatedOn !== null && harvestedOn !== null && harvestedOn > block.contaminatedOn ? "after" : "marked";
}

/** A flush weighed as nothing (`flush_weighs_nothing`): on the quick form, a flush of 0 is no flush to record. */
export function flushWeighsNothing(freshGrams: number): boolean {
  return freshGrams === 0;
}

/** Dried mushrooms keep about a tenth of their fresh weight (common practice): more than all of it, or under a hundredth, is a wrong unit. */
const fewestDryPerFresh = 0.01;

/** A dry weight that cannot go with its fresh weight (`dry_weight_implausible`, an error). 0 is "not weighed", as a generator rounding to whole ounces writes it. */
export function dryWeightImplausible(dryGrams: number, freshGrams: number): boolean {
  if (freshGrams === 0 || dryGrams === 0) return false;
  return dryGrams > freshGrams || dryGrams < fewestDryPerFresh * freshGrams;
}
