import { StatsInputError, sampleSizePairwiseBlocked } from "@/lib/stats";

export interface SampleSizeInput {
  /** Smallest difference in biological efficiency worth detecting, in BE percentage points. */
  difference: number;
  /** Expected spread (SD) of BE between blocks of one arm on one farm, in percentage points; farm-to-farm differences are blocked out. */
  sd: number;
  plannedFarms: number;
  /** Share of blocks expected to be lost (contamination, dropped), 0 ≤ loss < 1. */
  expectedLoss: number;
  arms: number;
}

export interface SampleSizeRow {
  power: number;
  /** Blocks per arm the analysis needs (exact, before rounding): see trialSampleSize. */
  exactPerArm: number;
  /** Blocks per arm to make once the expected loss is allowed for, spread evenly over farms. */
  perArmToMake: number;
  perFarmPerArm: number;
  totalBlocks: number;
}

export type SampleSizePanel =
  | {
      ok: true;
      rows: SampleSizeRow[];
      /** Pairs of arms the analysis compares, all with Tukey's adjustment (1 for two arms: no adjustment). */
      pairs: number;
    }
  | { ok: false; problems: Record<string, string> };

/**
 * Blocks per arm so that each pair of arms is found different with the given power, as the trial
 * report will compare them: the model BE ~ arm + farm (farms as blocks, each costing one error
 * degree of freedom) with Tukey-adjusted comparisons of every pair of arms at the two-sided 5 %
 * level (lib/stats sampleSizePairwiseBlocked; for two arms on one farm, R's power.t.test). Then
 * made larger for the expected loss and rounded up so every farm runs the same whole number per arm.
 */
export function trialSampleSize(input: SampleSizeInput, powers: readonly number[] = [0.8, 0.9]): SampleSizePanel {
  const problems: Record<string, string> = {};
  if (!(input.difference > 0)) problems.smallestDifference = "Give the smallest difference worth finding, in BE points, above 0 (e.g. 10).";
  if (!(input.sd > 0)) problems.expectedSd = "Give the expected spread between blocks, in BE points, above 0 (e.g. 14).";
  if (!Number.isInteger(input.plannedFarms) || input.plannedFarms < 1)
    problems.plannedFarms = "Give the number of farms you plan to enrol, 1 or more.";
  if (!(input.expectedLoss >= 0 && input.expectedLoss < 1)) problems.expectedLoss = "Give the expected loss as a percentage from 0 to 99.";
  if (Object.keys(problems).length) return { ok: false, problems };
  try {
    const arms = Math.max(input.arms, 2);
    const rows = powers.map((power) => {
      const exact = sampleSizePairwiseBlocked({ delta: input.difference, sd: input.sd, power, arms, farms: input.plannedFarms }).nPerGroup;
      const afterLoss = exact / (1 - input.expectedLoss);
      const perFarmPerArm = Math.ceil(afterLoss / input.plannedFarms - 1e-9);
      const perArmToMake = perFarmPerArm * input.plannedFarms;
      return { power, exactPerArm: exact, perArmToMake, perFarmPerArm, totalBlocks: perArmToMake * arms };
    });
    return { ok: true, rows, pairs: (arms * (arms - 1)) / 2 };
  } catch (error) {
    if (error instanceof StatsInputError) return { ok: false, problems: { form: error.message } };
    throw error;
  }
}
