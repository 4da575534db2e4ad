import { seededRandom } from "@/lib/random";
import { TrialRuleError } from "./lifecycle";

export interface ListEntry {
  sequence: number;
  /** Which run of consecutive codes the entry belongs to; each run holds every arm once. */
  permutedBlock: number;
  blockCode: string;
  armId: string;
}

/**
 * A farm's randomised list by permuted blocks: the codes come in runs of one block per arm,
 * each run in its own shuffled order, so the arms stay balanced however far a farm gets.
 * The same seed gives the same list, so anyone can reproduce and audit it.
 */
export function permutedBlockList(options: {
  seed: string;
  armIds: readonly string[];
  blocksPerArm: number;
  codePrefix: string;
}): ListEntry[] {
  const { seed, armIds, blocksPerArm, codePrefix } = options;
  if (armIds.length < 2) throw new TrialRuleError(`A trial needs at least 2 arms to randomise; it has ${armIds.length}.`);
  if (!Number.isInteger(blocksPerArm) || blocksPerArm < 1) {
    throw new TrialRuleError(`Blocks per arm must be a whole number of 1 or more; got ${blocksPerArm}.`);
  }
  const random = seededRandom(seed);
  const width = String(blocksPerArm * armIds.length).length < 2 ? 2 : String(blocksPerArm * armIds.length).length;
  const list: ListEntry[] = [];
  for (let run = 1; run <= blocksPerArm; run++) {
    for (const armId of random.shuffle(armIds)) {
      const sequence = list.length + 1;
      list.push({ sequence, permutedBlock: run, blockCode: `${codePrefix}-${String(sequence).padStart(width, "0")}`, armId });
    }
  }
  return list;
}

/** The prefix of a farm's block codes: trial code and the farm's initials, e.g. T-2026-03-FB. */
export function blockCodePrefix(trialCode: string, farmName: string): string {
  const initials = farmName
    .split(/\s+/)
    .map((word) =>
      word
        .replace(/[^A-Za-z0-9]/g, "")
        .charAt(0)
        .toUpperCase(),
    )
    .join("")
    .slice(0, 3);
  return initials ? `${trialCode}-${initials}` : trialCode;
}

/**
 * Checks an uploaded block against the trial's list: a block code of the trial must be grown
 * with its arm's strain. Returns the arm to attach, or a message for the upload report.
 */
export function matchTrialBlock(
  assignment: { armId: string; armLabel: string; strainId: string; strainCode: string } | undefined,
  uploaded: { code: string; strainId: string },
): { armId: string | null; problem: string | null } {
  if (!assignment) return { armId: null, problem: null };
  if (assignment.strainId !== uploaded.strainId) {
    return {
      armId: null,
      problem: `Block ${uploaded.code} is on the trial list for arm "${assignment.armLabel}", which uses strain ${assignment.strainCode}; correct the strain or the block code.`,
    };
  }
  return { armId: assignment.armId, problem: null };
}
