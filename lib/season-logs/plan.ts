import type { SeasonLogIssue, SeasonRecord } from "../import";
import { StrainRegister } from "../import/strains";

/** A block as stored, in the shape the planner compares (masses in grams, dates YYYY-MM-DD). */
export interface StoredBlock {
  id: string;
  code: string;
  strainId: string;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
  trialArmId: string | null;
  inoculatedOn: string | null;
  wetMassG: number | null;
  moisture: number | null;
  contaminated: boolean;
  contaminatedOn: string | null;
  spentMassG: number | null;
  notes: string;
}

export interface StoredHarvest {
  id: string;
  blockCode: string;
  flush: number;
  harvestedOn: string | null;
  freshMassG: number;
  dryMassG: number | null;
}

export interface RegistryEntry {
  id: string;
  code: string;
}

/** A block code on the farm's randomised list, with the arm it runs and that arm's strain. */
export interface TrialAssignment {
  blockCode: string;
  armId: string;
  armLabel: string;
  trialCode: string;
  strainId: string;
  strainCode: string;
}

export interface PlanInput {
  records: readonly SeasonRecord[];
  storedBlocks: readonly StoredBlock[];
  storedHarvests: readonly StoredHarvest[];
  strains: readonly RegistryEntry[];
  substrateRecipes: readonly RegistryEntry[];
  fruitingMethods: readonly RegistryEntry[];
  assignments: readonly TrialAssignment[];
}

/** The block row a commit writes: the stored values and the masses as written; `id` is the stored block's, null for a new one. */
export interface BlockWrite extends Omit<StoredBlock, "id"> {
  id: string | null;
  wetMassAsWritten: string | null;
  wetMassUnit: string | null;
  spentMassAsWritten: string | null;
  spentMassUnit: string | null;
}

/** `id` is the stored harvest's and `blockId` the stored block's, each null when new. */
export interface HarvestWrite extends Omit<StoredHarvest, "id"> {
  id: string | null;
  blockId: string | null;
  freshMassAsWritten: string | null;
  freshMassUnit: string | null;
  dryMassAsWritten: string | null;
  dryMassUnit: string | null;
}

/** One stored value the commit replaces; kept in value_changes. */
export interface ValueChange {
  blockCode: string;
  flush: number | null;
  field: string;
  oldValue: string | null;
  newValue: string | null;
}

export interface PlanCounts {
  newBlocks: number;
  changedBlocks: number;
  untouchedBlocks: number;
  newHarvests: number;
  changedHarvests: number;
  untouchedHarvests: number;
}

export interface CommitPlan {
  /** Blocks to insert (id null) or update (new and changed only). */
  blocks: BlockWrite[];
  /** Harvests to insert (id null) or update (new and changed only). */
  harvests: HarvestWrite[];
  changes: ValueChange[];
  newBlockCodes: string[];
  counts: PlanCounts;
  /** Problems only the stored data and registries reveal (unknown substrate, trial strain mismatch …). */
  issues: SeasonLogIssue[];
}

const gramsTolerance = 0.001;
const moistureTolerance = 0.00001;

function key(code: string): string {
  return code
    .trim()
    .toUpperCase()
    .replace(/[\s_.\-/]+/g, "-");
}

function sameNumber(a: number | null, b: number | null, tolerance: number): boolean {
  if (a === null || b === null) return a === b;
  return Math.abs(a - b) <= tolerance;
}

function shown(value: number | string | boolean | null): string | null {
  if (value === null) return null;
  if (typeof value === "number") return String(Math.round(value * 1000) / 1000);
  return String(value);
}

class Register {
  private readonly byKey = new Map<string, RegistryEntry>();
  /** Codes as written, already looked up: a file repeats a handful of codes on every block. */
  private readonly byWritten = new Map<string, RegistryEntry | null>();
  private readonly nearest: StrainRegister;
  readonly codeById = new Map<string, string>();

  constructor(entries: readonly RegistryEntry[]) {
    for (const entry of entries) {
      this.byKey.set(key(entry.code), entry);
      this.codeById.set(entry.id, entry.code);
    }
    this.nearest = new StrainRegister(entries.map((entry) => entry.code));
  }

  find(code: string): RegistryEntry | null {
    let entry = this.byWritten.get(code);
    if (entry === undefined) {
      entry = this.byKey.get(key(code)) ?? null;
      this.byWritten.set(code, entry);
    }
    return entry;
  }

  suggestion(code: string): string {
    const near = this.nearest.nearest(code);
    return near ? ` Did you mean "${near}"?` : "";
  }
}

/**
 * Compares a parsed season log with what the farm has stored and says what a commit would do:
 * new blocks and harvests, changed values (old → new, kept as history) and untouched rows.
 * A blank cell never erases a stored value; harvests missing from the file stay as they are.
 */
export function planCommit(input: PlanInput): CommitPlan {
  const strains = new Register(input.strains);
  const recipes = new Register(input.substrateRecipes);
  const methods = new Register(input.fruitingMethods);
  const storedByCode = new Map(input.storedBlocks.map((block) => [block.code, block]));
  const assignmentByCode = new Map(input.assignments.map((assignment) => [key(assignment.blockCode), assignment]));
  const storedHarvests = new Map(input.storedHarvests.map((harvest) => [`${harvest.blockCode}\u0000${harvest.flush}`, harvest]));
  const issues: SeasonLogIssue[] = [];

  // The parser has already filled each block's blank columns from its other rows, so the first row speaks for the block.
  const firstRecord = new Map<string, SeasonRecord>();
  const notesByBlock = new Map<string, string[]>();
  for (const record of input.records) {
    if (record.blockCode === "") continue;
    if (!firstRecord.has(record.blockCode)) firstRecord.set(record.blockCode, record);
    if (record.notes) {
      const notes = notesByBlock.get(record.blockCode) ?? [];
      if (!notes.includes(record.notes)) notes.push(record.notes);
      notesByBlock.set(record.blockCode, notes);
    }
  }

  const blocks: BlockWrite[] = [];
  const changes: ValueChange[] = [];
  const newBlockCodes: string[] = [];
  const counts: PlanCounts = {
    newBlocks: 0,
    changedBlocks: 0,
    untouchedBlocks: 0,
    newHarvests: 0,
    changedHarvests: 0,
    untouchedHarvests: 0,
  };
  // Blocks the plan writes or keeps, with the stored id (null for a new block).
  const plannedBlocks = new Map<string, string | null>();

  for (const [code, record] of firstRecord) {
    const stored = storedByCode.get(code) ?? null;
    const strain = strains.find(record.strainCode);
    // The parser reports an unknown strain code (with the nearest one); the block cannot be planned without it.
    if (!strain) {
      continue;
    }
    plannedBlocks.set(code, stored?.id ?? null);
    const recipe = record.substrate ? recipes.find(record.substrate) : null;
    if (record.substrate && !recipe) {
      issues.push({
        line: record.line,
        code: "unknown_substrate",
        column: "substrate",
        value: record.substrate,
        severity: "error",
        message: `Line ${record.line}: block ${code} has substrate recipe "${record.substrate}", which is not in the co-op's recipe register.${recipes.suggestion(record.substrate)} Use a recipe code from the register, or leave the cell blank.`,
      });
    }
    const method = record.fruitingMethod ? methods.find(record.fruitingMethod) : null;
    if (record.fruitingMethod && !method) {
      issues.push({
        line: record.line,
        code: "unknown_fruiting_method",
        column: "fruiting_method",
        value: record.fruitingMethod,
        severity: "error",
        message: `Line ${record.line}: block ${code} has fruiting method "${record.fruitingMethod}", which is not in the co-op's register.${methods.suggestion(record.fruitingMethod)} Use a fruiting method code from the register, or leave the cell blank.`,
      });
    }
    const assignment = assignmentByCode.size === 0 ? null : (assignmentByCode.get(key(code)) ?? null);
    if (assignment && assignment.strainId !== strain.id) {
      issues.push({
        line: record.line,
        code: "trial_strain_differs",
        column: "strain",
        value: record.strainCode,
        severity: "error",
        message: `Line ${record.line}: block ${code} runs arm ${assignment.armLabel} of trial ${assignment.trialCode}, which uses strain ${assignment.strainCode}, but the file says "${record.strainCode}". Correct the strain, or check the block code against your farm's trial list.`,
      });
    }
    if (!assignment && record.trialCode) {
      issues.push({
        line: record.line,
        code: "trial_block_not_listed",
        column: "trial",
        value: record.trialCode,
        severity: "warning",
        message: `Line ${record.line}: block ${code} names trial "${record.trialCode}", but it is not on your farm's randomised list, so it is stored as an ordinary block. Check the block code against the trial list if it should be a trial block.`,
      });
    }

    const notes = (notesByBlock.get(code) ?? []).join("; ");
    const write: BlockWrite = {
      id: stored?.id ?? null,
      code,
      strainId: strain.id,
      substrateRecipeId: recipe?.id ?? stored?.substrateRecipeId ?? null,
      fruitingMethodId: method?.id ?? stored?.fruitingMethodId ?? null,
      trialArmId: assignment?.armId ?? stored?.trialArmId ?? null,
      inoculatedOn: record.inoculatedOn ?? stored?.inoculatedOn ?? null,
      wetMassG: record.wetBlockGrams ?? stored?.wetMassG ?? null,
      wetMassAsWritten: record.wetBlockAsWritten?.value ?? null,
      wetMassUnit: record.wetBlockAsWritten?.unit ?? null,
      moisture: record.moisture ?? stored?.moisture ?? null,
      contaminated: record.contaminated || (stored?.contaminated ?? false),
      contaminatedOn: record.contaminatedOn ?? stored?.contaminatedOn ?? null,
      spentMassG: record.spentGrams ?? stored?.spentMassG ?? null,
      spentMassAsWritten: record.spentAsWritten?.value ?? null,
      spentMassUnit: record.spentAsWritten?.unit ?? null,
      notes: notes || stored?.notes || "",
    };
    if (!stored) {
      counts.newBlocks++;
      blocks.push(write);
      newBlockCodes.push(code);
      continue;
    }
    const before = changes.length;
    const compare = (field: string, old: string | null, next: string | null) => {
      if (old !== next) changes.push({ blockCode: code, flush: null, field, oldValue: old, newValue: next });
    };
    compare("strain", strains.codeById.get(stored.strainId) ?? null, strain.code);
    compare(
      "substrate",
      stored.substrateRecipeId ? (recipes.codeById.get(stored.substrateRecipeId) ?? null) : null,
      write.substrateRecipeId ? (recipes.codeById.get(write.substrateRecipeId) ?? null) : null,
    );
    compare(
      "fruiting_method",
      stored.fruitingMethodId ? (methods.codeById.get(stored.fruitingMethodId) ?? null) : null,
      write.fruitingMethodId ? (methods.codeById.get(write.fruitingMethodId) ?? null) : null,
    );
    if (stored.trialArmId !== write.trialArmId) compare("arm", stored.trialArmId, write.trialArmId);
    compare("inoculated_on", stored.inoculatedOn, write.inoculatedOn);
    if (!sameNumber(stored.wetMassG, write.wetMassG, gramsTolerance))
      compare("block_wet_weight", shown(stored.wetMassG), shown(write.wetMassG));
    if (!sameNumber(stored.moisture, write.moisture, moistureTolerance))
      compare("substrate_moisture", shown(stored.moisture), shown(write.moisture));
    compare("contaminated", shown(stored.contaminated), shown(write.contaminated));
    compare("contaminated_on", stored.contaminatedOn, write.contaminatedOn);
    if (!sameNumber(stored.spentMassG, write.spentMassG, gramsTolerance))
      compare("spent_weight", shown(stored.spentMassG), shown(write.spentMassG));
    compare("notes", stored.notes || null, write.notes || null);
    if (changes.length > before) {
      counts.changedBlocks++;
      blocks.push(write);
    } else {
      counts.untouchedBlocks++;
    }
  }

  const harvests: HarvestWrite[] = [];
  for (const record of input.records) {
    if (record.flush === null || record.freshGrams === null) continue;
    const blockId = plannedBlocks.get(record.blockCode);
    if (blockId === undefined) continue;
    const stored = storedHarvests.get(`${record.blockCode}\u0000${record.flush}`);
    const write: HarvestWrite = {
      id: stored?.id ?? null,
      blockId,
      blockCode: record.blockCode,
      flush: record.flush,
      harvestedOn: record.harvestedOn,
      freshMassG: record.freshGrams,
      freshMassAsWritten: record.freshAsWritten?.value ?? null,
      freshMassUnit: record.freshAsWritten?.unit ?? null,
      dryMassG: record.dryGrams,
      dryMassAsWritten: record.dryAsWritten?.value ?? null,
      dryMassUnit: record.dryAsWritten?.unit ?? null,
    };
    if (!stored) {
      counts.newHarvests++;
      harvests.push(write);
      continue;
    }
    write.harvestedOn ??= stored.harvestedOn;
    write.dryMassG ??= stored.dryMassG;
    const before = changes.length;
    const compare = (field: string, old: string | null, next: string | null) => {
      if (old !== next) changes.push({ blockCode: record.blockCode, flush: record.flush, field, oldValue: old, newValue: next });
    };
    compare("harvested_on", stored.harvestedOn, write.harvestedOn);
    if (!sameNumber(stored.freshMassG, write.freshMassG, gramsTolerance))
      compare("fresh_weight", shown(stored.freshMassG), shown(write.freshMassG));
    if (!sameNumber(stored.dryMassG, write.dryMassG, gramsTolerance)) compare("dry_weight", shown(stored.dryMassG), shown(write.dryMassG));
    if (changes.length > before) {
      counts.changedHarvests++;
      harvests.push(write);
    } else {
      counts.untouchedHarvests++;
    }
  }

  return { blocks, harvests, changes, newBlockCodes, counts, issues };
}
