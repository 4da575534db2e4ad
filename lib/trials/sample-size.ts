import {
  StatsInputError,
  powerCrossedBlocked,
  powerPairwiseBlocked,
  sampleSizeCrossedBlocked,
  sampleSizePairwiseBlocked,
} from "@/lib/stats";
import { count } from "@/lib/words";

export interface SampleSizeInput {
  /** Smallest difference in biological efficiency worth detecting, in BE percentage points. */
  difference: number;
  /** Expected spread (SD) of BE between blocks of one arm on one farm, in percentage points; farm-to-farm differences are blocked out. */
  sd: number;
  plannedFarms: number;
  /** Share of blocks expected to be lost (contamination, dropped), 0 ≤ loss < 1. */
  expectedLoss: number;
  arms: number;
  /**
   * For arms crossing strains with fruiting methods: how many of each. The size is then for
   * comparing methods within one strain, as the report does when the best method depends on the
   * strain; the comparison averaged over strains needs fewer (given as `averagedPerArm`).
   */
  crossing?: { methods: number; strains: number } | null;
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
      /** Pairs of arms the analysis compares, all with Tukey's adjustment (1 for two arms: no adjustment); for a crossing, pairs of methods. */
      pairs: number;
      /** For a crossing: blocks per arm (exact) the method comparison averaged over strains needs at the first power. */
      averagedPerArm?: number;
    }
  | { ok: false; problems: Record<string, string> };

/**
 * Blocks per arm so that each pair of arms is found different with the given power, as the trial
 * report will compare them (for arms crossing strains with methods, each pair of methods within a
 * strain: lib/stats sampleSizeCrossedBlocked, Tukey over the methods on the full crossed model): the model BE ~ arm + farm (farms as blocks, each costing one error
 * degree of freedom) with Tukey-adjusted comparisons of every pair of arms at the two-sided 5 %
 * level (lib/stats sampleSizePairwiseBlocked; for two arms on one farm, R's power.t.test). Then
 * made larger for the expected loss and rounded up so every farm runs the same whole number per arm.
 */
/** What is wrong with the inputs every trial's sizing shares, keyed by the design form's field names. */
export function sizingInputProblems(
  input: Pick<SampleSizeInput, "difference" | "sd" | "plannedFarms" | "expectedLoss">,
): Record<string, string> {
  const problems: Record<string, string> = {};
  if (!(input.difference > 0)) problems.smallestDifference = "Give the smallest difference worth finding, in BE points, above 0 (e.g. 10).";
  if (!(input.sd > 0)) problems.expectedSd = "Give the expected spread between blocks, in BE points, above 0 (e.g. 14).";
  if (!Number.isInteger(input.plannedFarms) || input.plannedFarms < 1)
    problems.plannedFarms = "Give the number of farms you plan to enrol, 1 or more.";
  if (!(input.expectedLoss >= 0 && input.expectedLoss < 1)) problems.expectedLoss = "Give the expected loss as a percentage from 0 to 99.";
  return problems;
}

export function trialSampleSize(input: SampleSizeInput, powers: readonly number[] = [0.8, 0.9]): SampleSizePanel {
  const problems = sizingInputProblems(input);
  if (Object.keys(problems).length) return { ok: false, problems };
  try {
    const arms = Math.max(input.arms, 2);
    const crossing = input.crossing && input.crossing.methods >= 2 && input.crossing.strains >= 2 ? input.crossing : null;
    const crossed = (power: number, comparison: "within" | "averaged") =>
      sampleSizeCrossedBlocked({
        delta: input.difference,
        sd: input.sd,
        power,
        levels: crossing!.methods,
        otherLevels: crossing!.strains,
        farms: input.plannedFarms,
        comparison,
      }).nPerGroup;
    const rows = powers.map((power) => {
      const exact = crossing
        ? crossed(power, "within")
        : sampleSizePairwiseBlocked({ delta: input.difference, sd: input.sd, power, arms, farms: input.plannedFarms }).nPerGroup;
      const afterLoss = exact / (1 - input.expectedLoss);
      const perFarmPerArm = Math.ceil(afterLoss / input.plannedFarms - 1e-9);
      const perArmToMake = perFarmPerArm * input.plannedFarms;
      return { power, exactPerArm: exact, perArmToMake, perFarmPerArm, totalBlocks: perArmToMake * arms };
    });
    if (crossing)
      return {
        ok: true,
        rows,
        pairs: (crossing.methods * (crossing.methods - 1)) / 2,
        averagedPerArm: crossed(powers[0], "averaged"),
      };
    return { ok: true, rows, pairs: (arms * (arms - 1)) / 2 };
  } catch (error) {
    if (error instanceof StatsInputError) return { ok: false, problems: { form: error.message } };
    throw error;
  }
}

export interface EnrolmentCheck {
  /** Farms that accepted, and the blocks per arm they committed between them. */
  acceptedFarms: number;
  blocksPerArm: number;
  minimumFarms: number;
}

export interface EnrolmentWarning {
  kind: "below_minimum_farms" | "fewer_farms_than_planned" | "fewer_blocks_than_planned";
  message: string;
}

/**
 * What the coordinator should hear before starting a trial, from the farms that accepted against
 * the plan (trialSampleSize at 80 % power): fewer farms than the co-op's minimum (the trial cannot
 * start), fewer than planned, and fewer blocks per arm than the plan needs once the expected loss
 * is allowed for, with the power the committed blocks give (powerPairwiseBlocked on the farms
 * that accepted, same adjustment and blocking as the plan). No plan figures: only the minimum.
 */
export function enrolmentWarnings(plan: SampleSizeInput | null, enrolment: EnrolmentCheck): EnrolmentWarning[] {
  const warnings: EnrolmentWarning[] = [];
  const { acceptedFarms, blocksPerArm, minimumFarms } = enrolment;
  const farmsWord = (n: number) => `${count(n, "farm")}`;
  if (acceptedFarms < minimumFarms)
    warnings.push({
      kind: "below_minimum_farms",
      message: `${farmsWord(acceptedFarms)} ${acceptedFarms === 1 ? "has" : "have"} accepted; a trial starts only with at least ${minimumFarms} (the co-op's minimum), so that its report never shows one farm's figures.`,
    });
  const panel = plan ? trialSampleSize(plan, [0.8]) : null;
  if (!plan || !panel?.ok) return warnings;
  if (acceptedFarms < plan.plannedFarms)
    warnings.push({
      kind: "fewer_farms_than_planned",
      message: `${farmsWord(acceptedFarms)} of the ${plan.plannedFarms} planned ${acceptedFarms === 1 ? "has" : "have"} accepted.`,
    });
  const needed = panel.rows[0].perArmToMake;
  if (acceptedFarms > 0 && blocksPerArm < needed) {
    const kept = blocksPerArm * (1 - plan.expectedLoss);
    const arms = Math.max(plan.arms, 2);
    // The error needs degrees of freedom left after arms and farms; below that no power can be given.
    const crossing = plan.crossing && plan.crossing.methods >= 2 && plan.crossing.strains >= 2 ? plan.crossing : null;
    const power =
      arms * kept - arms - acceptedFarms + 1 < 1
        ? null
        : crossing
          ? powerCrossedBlocked(kept, {
              delta: plan.difference,
              sd: plan.sd,
              levels: crossing.methods,
              otherLevels: crossing.strains,
              farms: acceptedFarms,
              alpha: 0.05,
              comparison: "within",
            })
          : powerPairwiseBlocked(kept, { delta: plan.difference, sd: plan.sd, arms, farms: acceptedFarms, alpha: 0.05 });
    warnings.push({
      kind: "fewer_blocks_than_planned",
      message:
        `The farms that accepted make ${blocksPerArm} blocks per arm between them; the plan needs ${needed} for 80 % power to find ${plan.difference} BE points` +
        (plan.expectedLoss > 0 ? ` once ${Math.round(plan.expectedLoss * 100)} % are lost` : "") +
        (power === null
          ? ", and so few blocks leave nothing to judge the spread by."
          : `. With what is committed the power is about ${Math.round(power * 100)} %: invite more farms or ask for more blocks per arm.`),
    });
  }
  return warnings;
}

/** How many strains and fruiting methods a crossed trial's arms hold; null for a one-factor trial. */
export function crossingOf(
  designKind: string | undefined,
  arms: readonly { strainId: string; treatmentId: string | null }[],
): { methods: number; strains: number } | null {
  if (designKind !== "strain_by_method") return null;
  return { methods: new Set(arms.map((arm) => arm.treatmentId)).size, strains: new Set(arms.map((arm) => arm.strainId)).size };
}
