import { z } from "zod";
import { readDateCell, readMassCell, readMoistureCell, type IssueCode } from "../import";
import {
  dryWeightImplausible,
  efficiencyPercent,
  efficiencyVerdict,
  flushHeavierThanBlock,
  harvestBeforeInoculation,
  harvestOnContaminatedBlock,
  highestPlausibleEfficiency,
  highestPossibleEfficiency,
  missingFlushes,
} from "../import/harvest-checks";
import { formatMass } from "../units";
import { shown } from "./plan";
import { checkQuickHarvest, recordHarvestSchema, type HarvestProblem, type QuickHarvestCheck } from "./quick-harvest";

/**
 * Corrections made in the app: a harvest edited or deleted, a block's recorded values edited.
 * Each is judged by the import's own rules (`lib/import/cells.ts`, `lib/import/harvest-checks.ts`,
 * and for a harvest the quick form's `checkQuickHarvest`), and each needs a reason, kept in the
 * value history beside who changed what and when.
 */

const uuid = z.string().regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i, "Pick it again from the block's page.");

export const correctionReason = z
  .string()
  .trim()
  .min(3, "Say why, for example \u201ctyped kg for g\u201d or \u201cweighed the wrong bag\u201d.")
  .max(500, "Keep the reason under 500 characters.");

const massUnit = z.enum(["g", "kg", "lb", "oz"], { error: "Choose the unit you weighed in." });
const optionalDay = z
  .string()
  .trim()
  .refine((day) => day === "" || (/^\d{4}-\d{2}-\d{2}$/.test(day) && !Number.isNaN(Date.parse(`${day}T00:00:00Z`))), "Choose a real day.");

export const harvestCorrectionSchema = recordHarvestSchema
  .pick({ weight: true, unit: true, harvestedOn: true, acceptWarnings: true })
  .extend({
    harvestId: uuid,
    reason: correctionReason,
  });
export type HarvestCorrection = z.infer<typeof harvestCorrectionSchema>;

export const harvestRemovalSchema = z.object({
  harvestId: uuid,
  reason: correctionReason,
  acceptWarnings: recordHarvestSchema.shape.acceptWarnings,
});

export const blockCorrectionSchema = z.object({
  blockId: uuid,
  wetMass: z.string().trim().max(50, "Write the weight as a number with its unit, for example 2.5 kg."),
  wetUnit: massUnit,
  moisture: z.string().trim().max(20, "Write the moisture as a percentage such as 62 %."),
  inoculatedOn: optionalDay,
  // A checkbox: present when ticked.
  contaminated: z
    .string()
    .optional()
    .transform((value) => value === "on"),
  contaminatedOn: optionalDay,
  spentMass: z.string().trim().max(50, "Write the weight as a number with its unit, for example 1.9 kg."),
  spentUnit: massUnit,
  notes: z.string().trim().max(2000, "Keep the notes under 2000 characters."),
  reason: correctionReason,
  acceptWarnings: recordHarvestSchema.shape.acceptWarnings,
});
export type BlockCorrection = z.infer<typeof blockCorrectionSchema>;

export type BlockCorrectionField = "wetMass" | "moisture" | "inoculatedOn" | "contaminatedOn" | "spentMass";

export interface BlockProblem {
  code: IssueCode;
  field: BlockCorrectionField;
  message: string;
}

/** A block's recorded values, as stored (masses in grams, moisture a fraction, days YYYY-MM-DD). */
export interface BlockValues {
  inoculatedOn: string | null;
  wetMassG: number | null;
  wetMassAsWritten: string | null;
  wetMassUnit: string | null;
  moisture: number | null;
  contaminated: boolean;
  contaminatedOn: string | null;
  spentMassG: number | null;
  spentMassAsWritten: string | null;
  spentMassUnit: string | null;
  notes: string;
}

export interface BlockCorrectionCheck {
  errors: BlockProblem[];
  warnings: BlockProblem[];
  /** The values to store; null when there are errors. */
  values: BlockValues | null;
}

/** The stored harvests a block's values are judged against. */
export interface StoredFlush {
  flush: number;
  harvestedOn: string | null;
  freshMassG: number;
}

/** A mass typed in a form: blank is "not weighed"; a bare number takes the unit picked beside it, and keeps it as written. */
function massOf(text: string, unit: "g" | "kg" | "lb" | "oz", kind: "wet" | "spent") {
  if (text === "") return { grams: null, asWritten: null, unit: null };
  const reading = readMassCell(text, { kind, unit });
  if ("code" in reading) return reading;
  const written = reading.value.written.value;
  return {
    grams: reading.value.grams,
    asWritten: /[a-z]/i.test(written) ? written : `${written} ${unit}`,
    unit: reading.value.written.unit,
  };
}

/**
 * A block's edited values by the import's rules: each cell as the importer reads it, then the
 * block against its stored harvests (a flush before the new inoculation day is an error; a flush
 * heavier than the block, an efficiency above 250 %, a flush after contamination was found, a
 * contamination day on a block not marked contaminated are warnings; beyond 400 % an error, as on
 * the quick form). `today` is YYYY-MM-DD.
 */
export function checkBlockCorrection(
  entry: BlockCorrection,
  block: { code: string; harvests: readonly StoredFlush[] },
  today: string,
): BlockCorrectionCheck {
  const errors: BlockProblem[] = [];
  const warnings: BlockProblem[] = [];

  const wet = massOf(entry.wetMass, entry.wetUnit, "wet");
  if ("code" in wet) errors.push({ code: wet.code, field: "wetMass", message: wet.message });
  const spent = massOf(entry.spentMass, entry.spentUnit, "spent");
  if ("code" in spent) errors.push({ code: spent.code, field: "spentMass", message: spent.message });
  let moisture: number | null = null;
  if (entry.moisture !== "") {
    const reading = readMoistureCell(entry.moisture);
    if ("code" in reading) errors.push({ code: reading.code, field: "moisture", message: reading.message });
    else moisture = reading.value;
  }
  const day = (text: string, field: "inoculatedOn" | "contaminatedOn"): string | null => {
    if (text === "") return null;
    const reading = readDateCell(text, { today });
    if ("code" in reading) {
      errors.push({ code: reading.code, field, message: reading.message });
      return null;
    }
    if (reading.warning) warnings.push({ ...reading.warning, field });
    return reading.value;
  };
  const inoculatedOn = day(entry.inoculatedOn, "inoculatedOn");
  const contaminatedOn = day(entry.contaminatedOn, "contaminatedOn");

  const early = block.harvests.filter((harvest) => harvestBeforeInoculation(harvest.harvestedOn, inoculatedOn));
  if (early.length > 0)
    errors.push({
      code: "harvest_before_inoculation",
      field: "inoculatedOn",
      message: `Flush ${early.map((harvest) => `${harvest.flush} (${harvest.harvestedOn})`).join(", ")} of ${block.code} would be picked before the block was inoculated on ${inoculatedOn}. Check the inoculation day, or correct the harvest first.`,
    });
  if (contaminatedOn !== null && !entry.contaminated)
    warnings.push({
      code: "contamination_date_not_contaminated",
      field: "contaminatedOn",
      message: `${block.code} has a day contamination was found (${contaminatedOn}) but is not marked contaminated. Mark it contaminated, or clear the day.`,
    });
  const after = block.harvests.filter(
    (harvest) => harvestOnContaminatedBlock({ contaminated: entry.contaminated, contaminatedOn }, harvest.harvestedOn) === "after",
  );
  if (after.length > 0)
    warnings.push({
      code: "harvest_on_contaminated_block",
      field: "contaminatedOn",
      message: `Flush ${after.map((harvest) => harvest.flush).join(", ")} of ${block.code} was picked after the day contamination was found (${contaminatedOn}). Check the day; handle a contaminated block with respiratory protection.`,
    });

  const wetGrams = "code" in wet ? null : wet.grams;
  if (wetGrams !== null) {
    const heavier = block.harvests.filter((harvest) => flushHeavierThanBlock(harvest.freshMassG, wetGrams));
    if (heavier.length > 0)
      warnings.push({
        code: "flush_heavier_than_block",
        field: "wetMass",
        message: `Flush ${heavier.map((harvest) => harvest.flush).join(", ")} of ${block.code} weighs more than the whole wet block would (${formatMass(wetGrams, "metric")}). Check the weight and its unit.`,
      });
    const total = block.harvests.reduce((sum, harvest) => sum + harvest.freshMassG, 0);
    const efficiency = efficiencyPercent(total, wetGrams, moisture);
    const verdict = efficiencyVerdict(efficiency);
    const what = `With these values, ${block.code}'s ${formatMass(total, "metric")} of harvest is a biological efficiency of ${Math.round(efficiency ?? 0)} %`;
    if (verdict === "impossible")
      errors.push({
        code: "efficiency_implausible",
        field: "wetMass",
        message: `${what}, beyond the ${highestPossibleEfficiency} % no block reaches. Check the wet weight, its unit and the moisture.`,
      });
    else if (verdict === "implausible")
      warnings.push({
        code: "efficiency_implausible",
        field: "wetMass",
        message: `${what}, above the ${highestPlausibleEfficiency} % blocks plausibly reach. Check the wet weight, its unit and the moisture.`,
      });
  }

  if (errors.length > 0 || "code" in wet || "code" in spent) return { errors, warnings, values: null };
  return {
    errors,
    warnings,
    values: {
      inoculatedOn,
      wetMassG: wet.grams,
      wetMassAsWritten: wet.asWritten,
      wetMassUnit: wet.unit,
      moisture,
      contaminated: entry.contaminated,
      contaminatedOn,
      spentMassG: spent.grams,
      spentMassAsWritten: spent.asWritten,
      spentMassUnit: spent.unit,
      notes: entry.notes,
    },
  };
}

/**
 * An edited harvest by the quick form's rules, against the block's other harvests (so its own
 * flush is no duplicate), and its stored dry weight against the new fresh weight, as the importer
 * checks them (`dry_weight_implausible`, an error).
 */
export function checkHarvestCorrection(
  entry: Pick<HarvestCorrection, "weight" | "unit" | "harvestedOn">,
  harvest: { flush: number; dryMassG: number | null },
  block: Parameters<typeof checkQuickHarvest>[1],
  today: string,
): QuickHarvestCheck {
  const check = checkQuickHarvest({ ...entry, blockCode: block.code, flush: harvest.flush }, block, today);
  if (check.freshGrams !== null && harvest.dryMassG !== null && dryWeightImplausible(harvest.dryMassG, check.freshGrams))
    check.errors.push({
      code: "dry_weight_implausible",
      field: "weight",
      message: `Flush ${harvest.flush} of ${block.code} dried to ${formatMass(harvest.dryMassG, "metric")}; with "${check.asWritten}" (${formatMass(check.freshGrams, "metric")}) fresh that is ${harvest.dryMassG > check.freshGrams ? "more than" : "under a hundredth of"} the fresh weight, and dried mushrooms keep about a tenth. Check the weight and its unit.`,
    });
  return check;
}

/**
 * Deleting a flush that leaves a gap in the block's flush numbers (the importer's `flush_gap`, a
 * warning): the grower confirms it, as for a file with the gap.
 */
export function checkHarvestRemoval(blockCode: string, flush: number, otherFlushes: readonly number[]): HarvestProblem[] {
  const missing = missingFlushes(otherFlushes);
  if (missing.length === 0) return [];
  return [
    {
      code: "flush_gap",
      field: "flush",
      message: `Without flush ${flush}, ${blockCode} would have flushes ${[...otherFlushes].sort((a, b) => a - b).join(", ")} but no flush ${missing.join(", ")}. Check it is the flush to delete; the others keep their numbers.`,
    },
  ];
}

/** One replaced value, as value_changes keeps it (the planner's field names). */
export interface ChangedValue {
  flush: number | null;
  field: string;
  oldValue: string | null;
  newValue: string | null;
}

const blockFields: readonly [string, keyof BlockValues][] = [
  ["inoculated_on", "inoculatedOn"],
  ["block_wet_weight", "wetMassG"],
  ["substrate_moisture", "moisture"],
  ["contaminated", "contaminated"],
  ["contaminated_on", "contaminatedOn"],
  ["spent_weight", "spentMassG"],
  ["notes", "notes"],
];

/** The block's values that the correction changes, in the planner's field names and forms (`shown`). */
export function blockValueChanges(before: BlockValues, after: BlockValues): ChangedValue[] {
  const changes: ChangedValue[] = [];
  for (const [field, key] of blockFields) {
    const old = key === "notes" ? before.notes || null : shown(before[key]);
    const next = key === "notes" ? after.notes || null : shown(after[key]);
    if (old !== next) changes.push({ flush: null, field, oldValue: old, newValue: next });
  }
  return changes;
}

/** What a harvest's edit changes: its day and fresh weight. */
export function harvestValueChanges(
  flush: number,
  before: { harvestedOn: string | null; freshMassG: number },
  after: { harvestedOn: string; freshMassG: number },
): ChangedValue[] {
  const changes: ChangedValue[] = [];
  if (before.harvestedOn !== after.harvestedOn)
    changes.push({ flush, field: "harvested_on", oldValue: before.harvestedOn, newValue: after.harvestedOn });
  if (shown(before.freshMassG) !== shown(after.freshMassG))
    changes.push({ flush, field: "fresh_weight", oldValue: shown(before.freshMassG), newValue: shown(after.freshMassG) });
  return changes;
}
