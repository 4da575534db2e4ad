import { createHash } from "node:crypto";
import { trialOutcomeRecords, type TrialBlockRow, type TrialOutcomeProtocol } from "./outcome";
import { formatDay, utcDisplay, type TimeDisplay } from "@/lib/time/display";

/**
 * What one run of a trial's analysis read: the inputs the coordinator sees beside each run, so two
 * runs can be told apart by their data and not only by their date. Counts only, never a mass.
 */
export interface AnalysisInputCounts {
  /** Farms with at least one block in the trial's arms. */
  farms: number;
  blocks: number;
  /** Harvest records (one per block and flush) of those blocks. */
  harvests: number;
  /** Blocks the outcome compared, and those it left out (listed by reason in the report). */
  compared: number;
  leftOut: number;
  /**
   * One fingerprint per farm of that farm's values, sorted (no farm id beside them): two runs show
   * how many farms' records changed between them, and nobody learns which. Their block ids (random
   * UUIDs) are part of each, so none can be worked back to a farm's masses.
   */
  farmFingerprints: string[];
}

/** Everything a run's result depends on, apart from the pseudonyms it draws and the time it ran. */
export interface AnalysisInputs {
  outcome: TrialOutcomeProtocol;
  minimumFarms: number;
  showPerFarmEstimates: boolean;
  arms: readonly { id: string; label: string; isReference: boolean }[];
  enrolments: readonly { status: string }[];
  assignedByArm: Readonly<Record<string, number>>;
  blockRows: readonly TrialBlockRow[];
  harvestRows: readonly { blockId: string; flush: number; freshMassG: number }[];
  /** A room-level trial's blocks' fruiting rooms (trialBlockRooms): moving a block changes its room's mean. */
  blockRooms?: ReadonlyMap<string, string | null>;
}

export function analysisInputCounts(inputs: AnalysisInputs): AnalysisInputCounts {
  const records = trialOutcomeRecords([...inputs.blockRows], [...inputs.harvestRows], inputs.outcome);
  return {
    farms: new Set(inputs.blockRows.map((row) => row.farmId)).size,
    blocks: inputs.blockRows.length,
    harvests: inputs.harvestRows.length,
    compared: records.filter((record) => record.value !== null).length,
    leftOut: records.filter((record) => record.excluded !== null).length,
    farmFingerprints: [...new Set(inputs.blockRows.map((row) => row.farmId))]
      .map((farmId) => {
        const own = new Set(inputs.blockRows.filter((row) => row.farmId === farmId).map((row) => row.id));
        return sha(
          canonicalBlocks(
            inputs.blockRows.filter((row) => own.has(row.id)),
            inputs.harvestRows.filter((row) => own.has(row.blockId)),
            inputs.blockRooms,
          ),
        );
      })
      .sort(byText),
  };
}

/**
 * How many farms' records differ between two runs, from their farm fingerprints: a farm changed,
 * added or gone counts once.
 */
export function farmsChangedBetween(before: readonly string[], after: readonly string[]): number {
  const missingFrom = (from: readonly string[], other: readonly string[]) => {
    const left = [...other];
    return from.filter((fingerprint) => {
      const at = left.indexOf(fingerprint);
      if (at === -1) return true;
      left.splice(at, 1);
      return false;
    }).length;
  };
  return Math.max(missingFrom(after, before), missingFrom(before, after));
}

const sha = (value: unknown) => createHash("sha256").update(JSON.stringify(value)).digest("hex").slice(0, 32);

function canonicalBlocks(
  blockRows: readonly TrialBlockRow[],
  harvestRows: AnalysisInputs["harvestRows"],
  blockRooms?: AnalysisInputs["blockRooms"],
) {
  const harvestsByBlock = new Map<string, [number, number][]>();
  for (const harvest of harvestRows)
    harvestsByBlock.set(harvest.blockId, [...(harvestsByBlock.get(harvest.blockId) ?? []), [harvest.flush, Number(harvest.freshMassG)]]);
  const numberOrNull = (value: number | null) => (value === null ? null : Number(value));
  return [...blockRows]
    .sort((a, b) => byText(a.id, b.id))
    .map((row) => [
      row.id,
      row.farmId,
      row.armId,
      numberOrNull(row.wetMassG),
      numberOrNull(row.moisture),
      row.contaminated,
      numberOrNull(row.spentMassG),
      (harvestsByBlock.get(row.id) ?? []).sort((a, b) => a[0] - b[0] || a[1] - b[1]),
      // Only for a room-level trial, so other trials' fingerprints stay as they were.
      ...(blockRooms ? [blockRooms.get(row.id) ?? null] : []),
    ]);
}

const byText = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/**
 * A fingerprint of the values a run analysed (SHA-256, 32 hex): the same data give the same
 * fingerprint whatever order the database returned them in, and any changed mass, moisture,
 * flush, contamination mark, arm, protocol or co-op setting gives another. Masses are taken as
 * numbers, so 2500 and 2500.0 are the same value.
 */
export function analysisFingerprint(inputs: AnalysisInputs): string {
  return sha({
    outcome: [inputs.outcome.flushes, inputs.outcome.contaminatedHandling],
    settings: [inputs.minimumFarms, inputs.showPerFarmEstimates],
    arms: [...inputs.arms].sort((a, b) => byText(a.id, b.id)).map((arm) => [arm.id, arm.label, arm.isReference]),
    enrolments: inputs.enrolments.map((enrolment) => enrolment.status).sort(byText),
    assigned: Object.entries(inputs.assignedByArm).sort(([a], [b]) => byText(a, b)),
    blocks: canonicalBlocks(inputs.blockRows, inputs.harvestRows, inputs.blockRooms),
  });
}

/** An amendment says why the published analysis changed; a word or two is not a reason a reader can weigh. */
export const amendmentReasonMinimum = 10;

export function amendmentReasonProblem(reason: string): string | null {
  const trimmed = reason.trim();
  if (trimmed.length < amendmentReasonMinimum)
    return `Say why the published analysis is amended, in at least ${amendmentReasonMinimum} characters (e.g. "Farm records of flush 2 arrived after publication").`;
  if (trimmed.length > 1000) return "Keep the reason for the amendment under 1000 characters.";
  return null;
}

/**
 * The line above an amended report: "Amended on 2027-03-02: reason. The original analysis of
 * 2027-02-10 is below." `before` is the version it replaced (its run's date), shown below it.
 */
export function amendmentLine(
  amendment: { publishedAt: Date; reason: string | null },
  before: { version: number; ranAt: Date } | null,
  display: TimeDisplay = utcDisplay,
): string {
  const day = (date: Date) => formatDay(date, display);
  const reason = (amendment.reason ?? "").trim();
  const sentence = `Amended on ${day(amendment.publishedAt)}: ${reason}${/[.!?]$/.test(reason) ? "" : "."}`;
  if (!before) return sentence;
  return before.version === 1
    ? `${sentence} The original analysis of ${day(before.ranAt)} is below.`
    : `${sentence} Version ${before.version}, the analysis of ${day(before.ranAt)}, is below.`;
}
