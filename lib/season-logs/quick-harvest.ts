import { z } from "zod";
import { readDateCell, readMassCell, type IssueCode } from "../import";
import {
  efficiencyPercent,
  efficiencyVerdict,
  flushHeavierThanBlock,
  flushWeighsNothing,
  harvestBeforeInoculation,
  harvestOnContaminatedBlock,
  highestPlausibleEfficiency,
  highestPossibleEfficiency,
  missingFlushes,
} from "../import/harvest-checks";
import { formatMass, type MassUnitAsWritten } from "../units";
import { roomPickSchema } from "../rooms/schemas";

/** The quick harvest form, as a grower fills it in on a phone in the grow room. */
export const recordHarvestSchema = z.object({
  blockCode: z.string().trim().min(1, "Enter the block code written on the bag.").max(100, "A block code is at most 100 characters."),
  flush: z.coerce
    .number({ error: "Enter the flush number, 1 for the first." })
    .int("The flush is a whole number, 1 for the first.")
    .min(1, "The flush is 1 or more.")
    .max(20, "A block gives at most 20 flushes; check the number."),
  weight: z
    .string()
    .trim()
    .min(1, "Enter the fresh weight you picked, for example 640 or 1 lb 6 oz.")
    .max(50, "Write the weight as a number with its unit, for example 640 g."),
  unit: z.enum(["g", "kg", "lb", "oz"], { error: "Choose the unit you weighed in." }),
  harvestedOn: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/, "Choose the day you picked the flush.")
    .refine((day) => !Number.isNaN(Date.parse(`${day}T00:00:00Z`)), "Choose a real day."),
  // "Room it is in now": a move dated the harvest day is recorded when it differs from the block's room that day.
  roomId: roomPickSchema,
  // Made by the phone for this entry (a v4 uuid): sending it again finds the harvest stored the first time.
  clientKey: z.uuid({ error: "Reload the page: this entry has no key of its own." }).optional(),
  // The warnings the grower read and chose to save anyway ("Save anyway"), by code; never an error.
  acceptWarnings: z
    .string()
    .max(500)
    .optional()
    .transform((codes) => (codes ?? "").split(",").filter((code) => code !== "")),
});

export type QuickHarvestEntry = Omit<z.infer<typeof recordHarvestSchema>, "acceptWarnings" | "roomId"> & { roomId?: string | null };

/** What is stored of the block a harvest is for, as the checks need it. */
export interface StoredBlock {
  code: string;
  inoculatedOn: string | null;
  wetMassG: number | null;
  moisture: number | null;
  contaminated: boolean;
  contaminatedOn: string | null;
  harvests: readonly { flush: number; freshMassG: number }[];
}

export type QuickHarvestField = "blockCode" | "flush" | "weight" | "harvestedOn";

export interface HarvestProblem {
  code: IssueCode;
  field: QuickHarvestField;
  message: string;
}

export interface QuickHarvestCheck {
  /** Refuse the entry: each says what to correct, under its field. */
  errors: HarvestProblem[];
  /** Save only when the grower chose "Save anyway" for each; the words are kept with the harvest. */
  warnings: HarvestProblem[];
  /** The fresh weight in grams and as written with its unit ("12 oz", not "12"); null when unreadable. */
  freshGrams: number | null;
  asWritten: string | null;
  /** The unit that applied: the one typed, else the one picked ("lb+oz" for "1 lb 2 oz"). */
  unit: MassUnitAsWritten | null;
}

/**
 * The import's rules for one harvest from the quick form, against its stored block: the weight
 * and date cells as `lib/import/cells.ts` reads them, then the block checks the importer makes
 * (`lib/import/harvest-checks.ts`) with the importer's severities. The one weight entered is all
 * its "column" holds, so a block efficiency beyond what any block reaches (400 %) is an error
 * here, as the importer makes it for a column; above 250 % it is a warning, as for one block.
 * `today` is YYYY-MM-DD.
 */
export function checkQuickHarvest(entry: QuickHarvestEntry, block: StoredBlock, today: string): QuickHarvestCheck {
  const errors: HarvestProblem[] = [];
  const warnings: HarvestProblem[] = [];
  const flushWords = `flush ${entry.flush} of ${block.code}`;

  let freshGrams: number | null = null;
  let asWritten: string | null = null;
  let unit: MassUnitAsWritten | null = null;
  const mass = readMassCell(entry.weight, { kind: "fresh", unit: entry.unit });
  if ("code" in mass) errors.push({ code: mass.code, field: "weight", message: mass.message });
  else if (flushWeighsNothing(mass.value.grams))
    errors.push({
      code: "flush_weighs_nothing",
      field: "weight",
      message: `"${entry.weight}" is nothing picked. Enter the weight of the flush; if the block gave nothing, there is no flush to record.`,
    });
  else {
    freshGrams = mass.value.grams;
    unit = mass.value.written.unit;
    // A bare number took the unit picked beside it: keep that unit with it, as written.
    asWritten = /[a-z]/i.test(mass.value.written.value) ? mass.value.written.value : `${mass.value.written.value} ${entry.unit}`;
  }

  const date = readDateCell(entry.harvestedOn, { today });
  if ("code" in date) errors.push({ code: date.code, field: "harvestedOn", message: date.message });
  else if (date.warning) warnings.push({ code: date.warning.code, field: "harvestedOn", message: date.warning.message });

  if (block.harvests.some((harvest) => harvest.flush === entry.flush))
    errors.push({
      code: "duplicate_flush",
      field: "flush",
      message: `Flush ${entry.flush} of ${block.code} is already recorded. Use the next flush number, or correct the weight through a season log.`,
    });
  else {
    const missing = missingFlushes([...block.harvests.map((harvest) => harvest.flush), entry.flush]);
    if (missing.length > 0)
      warnings.push({
        code: "flush_gap",
        field: "flush",
        message: `${block.code} has no flush ${missing.join(", ")} recorded, so this would be flush ${entry.flush} after a gap. Check the flush number, or record the missing flush first.`,
      });
  }

  if (harvestBeforeInoculation(entry.harvestedOn, block.inoculatedOn))
    errors.push({
      code: "harvest_before_inoculation",
      field: "harvestedOn",
      message: `${block.code} was inoculated on ${block.inoculatedOn}; a flush cannot be picked before that (${entry.harvestedOn}). Check the day you picked it.`,
    });

  const contamination = harvestOnContaminatedBlock(block, entry.harvestedOn);
  if (contamination !== null)
    warnings.push({
      code: "harvest_on_contaminated_block",
      field: "blockCode",
      message:
        contamination === "after"
          ? `${block.code} was found contaminated on ${block.contaminatedOn}, before this flush. Check the block code, and handle the block with respiratory protection: mould spores.`
          : `${block.code} is marked contaminated. Check the block code; if it fruited before it was lost, save anyway, and handle it with respiratory protection.`,
    });

  if (freshGrams !== null) {
    const written = `"${asWritten}" (${formatMass(freshGrams, "metric")})`;
    if (flushHeavierThanBlock(freshGrams, block.wetMassG))
      warnings.push({
        code: "flush_heavier_than_block",
        field: "weight",
        message: `${written} is more than the whole wet block weighed when it was made (${formatMass(block.wetMassG as number, "metric")}). Check the weight and its unit.`,
      });
    const total = block.harvests.reduce((sum, harvest) => sum + harvest.freshMassG, 0) + freshGrams;
    const efficiency = efficiencyPercent(total, block.wetMassG, block.moisture);
    const verdict = efficiencyVerdict(efficiency);
    if (verdict !== "plausible") {
      const what = `With ${written}, ${block.code} would have given ${formatMass(total, "metric")} in all: a biological efficiency of ${Math.round(efficiency as number)} %`;
      if (verdict === "impossible")
        errors.push({
          code: "efficiency_implausible",
          field: "weight",
          message: `${what}, beyond the ${highestPossibleEfficiency} % no block reaches. Check the unit you picked and the weight (${flushWords}).`,
        });
      else
        warnings.push({
          code: "efficiency_implausible",
          field: "weight",
          message: `${what}, above the ${highestPlausibleEfficiency} % blocks plausibly reach. Check the weight and its unit.`,
        });
    }
  }
  return { errors, warnings, freshGrams, asWritten, unit };
}

/**
 * The warnings still standing after the grower's "Save anyway": none when every warning's code
 * was accepted. An accepted code can never stand in for an error.
 */
export function warningsNotAccepted<Problem extends { code: string }>(
  warnings: readonly Problem[],
  accepted: readonly string[],
): Problem[] {
  return warnings.filter((warning) => !accepted.includes(warning.code));
}

/** Today's date (YYYY-MM-DD) where the day begins first (UTC+14): a harvest is in the future only if it is everywhere. */
export function latestToday(now: Date = new Date()): string {
  return new Date(now.getTime() + 14 * 3_600_000).toISOString().slice(0, 10);
}
