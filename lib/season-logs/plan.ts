import type { IssueCode, SeasonLogIssue, SeasonRecord } from "../import";
import { type NamedRoom, readRoomCell } from "../import/cells";
import { RegisterMatcher, registerKey } from "../import/registers";

/** A block as stored, in the shape the planner compares (masses in grams, dates YYYY-MM-DD). */
export interface StoredBlock {
  id: string;
  code: string;
  strainId: string;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
  trialArmId: string | null;
  inoculatedOn: string | null;
  /** The season the season log named (its starting year); null or absent when it follows the inoculation date. */
  seasonYear?: number | null;
  wetMassG: number | null;
  moisture: number | null;
  contaminated: boolean;
  contaminatedOn: string | null;
  spentMassG: number | null;
  notes: string;
  /** The room of the block's move "from the start of fruiting" (moved_on null); null or absent when none is recorded. */
  roomId?: string | null;
}

export interface StoredHarvest {
  id: string;
  blockCode: string;
  flush: number;
  harvestedOn: string | null;
  freshMassG: number;
  dryMassG: number | null;
  /** False for a flush recorded with the phone form, true for one from a season log. */
  fromFile?: boolean;
}

/** What the farm has stored that the file does not have: harvests of the file's blocks, and how many blocks it leaves out. */
export interface NotInFile {
  harvests: StoredHarvest[];
  blocks: number;
}

export interface RegistryEntry {
  id: string;
  code: string;
  /** Names a file may use instead of the code (the register's name). */
  names?: readonly string[];
}

/** A block code on the farm's randomised list, with the arm it runs and what that arm fixes: strain and, if any, fruiting method. */
export interface TrialAssignment {
  blockCode: string;
  armId: string;
  armLabel: string;
  trialCode: string;
  trialTitle?: string;
  strainId: string;
  strainCode: string;
  /** The arm's fruiting method; null when the arm fixes none (no treatment, or one of another kind such as a humidity regime). */
  fruitingMethod?: { id: string; code: string; name: string } | null;
}

export interface PlanInput {
  records: readonly SeasonRecord[];
  storedBlocks: readonly StoredBlock[];
  storedHarvests: readonly StoredHarvest[];
  strains: readonly RegistryEntry[];
  substrateRecipes: readonly RegistryEntry[];
  fruitingMethods: readonly RegistryEntry[];
  assignments: readonly TrialAssignment[];
  /** The farm's own fruiting rooms (row-level security gives no other farm's): the fruiting_room column names one of them. */
  rooms?: readonly NamedRoom[];
}

/** The block row a commit writes: the stored values and the masses as written; `id` is the stored block's, null for a new one. */
export interface BlockWrite extends Omit<StoredBlock, "id" | "seasonYear" | "roomId"> {
  id: string | null;
  seasonYear: number | null;
  /** The room from the start of fruiting: the file's, else the one stored (a blank cell never erases it). */
  roomId: string | null;
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
  /** Kept unless the grower chooses to remove these harvests (`withNotInFileRemoved`). */
  notInFile: NotInFile;
  /** Problems only the stored data and registries reveal (unknown substrate, trial strain mismatch …). */
  issues: SeasonLogIssue[];
  /** Each block whose rows name a room of the farm, with that room's name as the farm keeps it (in the file's order). */
  rooms: BlockRoom[];
}

/** A block's fruiting room as the file gives it, for the review: a new block's, one added to a stored block, a changed one, or the same as stored. */
export interface BlockRoom {
  blockCode: string;
  room: string;
  change: "new" | "added" | "changed" | "same";
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

/** A stored value as value history keeps it: numbers to three decimals, booleans as "true"/"false". */
export function shown(value: number | string | boolean | null): string | null {
  if (value === null) return null;
  if (typeof value === "number") return String(Math.round(value * 1000) / 1000);
  return String(value);
}

function entryText(entry: { code: string; name?: string }): string {
  return entry.name && registerKey(entry.name) !== registerKey(entry.code) ? `"${entry.name}" (${entry.code})` : entry.code;
}

class Register {
  private readonly matcher: RegisterMatcher<RegistryEntry>;
  /** Texts as written, already looked up: a file repeats a handful of codes on every block. */
  private readonly byWritten = new Map<string, RegistryEntry | null>();
  readonly codeById = new Map<string, string>();
  readonly byId = new Map<string, RegistryEntry>();

  constructor(entries: readonly RegistryEntry[]) {
    for (const entry of entries) {
      this.codeById.set(entry.id, entry.code);
      this.byId.set(entry.id, entry);
    }
    this.matcher = new RegisterMatcher(entries);
  }

  /** The entry a cell names by code or by name. */
  find(text: string): RegistryEntry | null {
    let entry = this.byWritten.get(text);
    if (entry === undefined) {
      entry = this.matcher.find(text);
      this.byWritten.set(text, entry);
    }
    return entry;
  }

  suggestion(text: string): string {
    return this.matcher.suggestion(text);
  }

  /** `"Slits cut across the bag" (SLIT-ACROSS)`: what a message calls an entry; `fallback` for one no longer active. */
  described(id: string, fallback: string): string {
    const entry = this.byId.get(id);
    return entry ? entryText({ code: entry.code, name: entry.names?.[0] }) : fallback;
  }
}

/**
 * What a block on the randomised list must agree with: its arm's trial, label, strain and
 * fruiting method. A blank cell says nothing; a cell that names something else is an error
 * that says what the list expects.
 */
function againstTheList(
  record: SeasonRecord,
  assignment: TrialAssignment,
  strain: RegistryEntry,
  method: RegistryEntry | null,
  strains: Register,
  methods: Register,
): SeasonLogIssue[] {
  const issues: SeasonLogIssue[] = [];
  const where = `Line ${record.line}: block ${record.blockCode} is in arm ${assignment.armLabel} of trial ${assignment.trialCode}`;
  const check = (code: IssueCode, column: string, value: string, expects: string, says: string, fix: string) =>
    issues.push({
      line: record.line,
      code,
      column,
      value,
      severity: "error",
      message: `${where}, ${expects}; this row says ${says}. ${fix}, or check the block code against your farm's trial list.`,
    });
  const trialNamed = record.trialCode ? registerKey(record.trialCode) : null;
  if (
    trialNamed !== null &&
    trialNamed !== registerKey(assignment.trialCode) &&
    !(assignment.trialTitle && trialNamed === registerKey(assignment.trialTitle))
  )
    check(
      "trial_differs",
      "trial",
      record.trialCode!,
      "on your farm's randomised list",
      `trial "${record.trialCode}"`,
      `Write ${assignment.trialCode}`,
    );
  if (record.arm && registerKey(record.arm) !== registerKey(assignment.armLabel))
    check("trial_arm_differs", "arm", record.arm, "on your farm's randomised list", `arm "${record.arm}"`, `Write ${assignment.armLabel}`);
  if (assignment.strainId !== strain.id)
    check(
      "trial_strain_differs",
      "strain",
      record.strainCode,
      `which uses strain ${strains.described(assignment.strainId, assignment.strainCode)}`,
      `"${record.strainCode}"`,
      "Correct the strain",
    );
  const expected = assignment.fruitingMethod;
  if (expected && method && method.id !== expected.id)
    check(
      "trial_fruiting_method_differs",
      "fruiting_method",
      record.fruitingMethod!,
      `which fruits with ${entryText(expected)}`,
      methods.described(method.id, method.code),
      "Correct the fruiting method",
    );
  return issues;
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
  const rooms = input.rooms ?? [];
  const roomNames = new Map(rooms.map((room) => [room.id, room.name]));
  const roomOf = (id: string | null | undefined) => (id ? (roomNames.get(id) ?? null) : null);
  const blockRooms: BlockRoom[] = [];
  // A file names a handful of rooms on thousands of blocks: each text is matched once.
  const roomReadings = new Map<string, ReturnType<typeof readRoomCell>>();
  const readRoom = (text: string) => {
    let reading = roomReadings.get(text);
    if (reading === undefined) {
      reading = readRoomCell(text, rooms);
      roomReadings.set(text, reading);
    }
    return reading;
  };
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
        message: `Line ${record.line}: block ${code} has substrate recipe "${record.substrate}", which is neither a code nor a name in the co-op's recipe register.${recipes.suggestion(record.substrate)} Use a recipe from the register, or leave the cell blank.`,
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
        message: `Line ${record.line}: block ${code} has fruiting method "${record.fruitingMethod}", which is neither a code nor a name in the co-op's register.${methods.suggestion(record.fruitingMethod)} Use a fruiting method from the register, or leave the cell blank.`,
      });
    }
    const room = record.fruitingRoom === null ? null : readRoom(record.fruitingRoom);
    if (room !== null && "code" in room)
      issues.push({
        line: record.line,
        code: room.code,
        column: "fruiting_room",
        value: record.fruitingRoom ?? "",
        severity: "error",
        message: `Line ${record.line}, block ${code}: ${room.message}`,
      });
    const named = room !== null && "value" in room ? room.value : null;
    // As for a move on the block's page: no block starts fruiting in a retired room, though a file may restate one it already did.
    const retired = named !== null && named.retiredOn != null && stored?.roomId !== named.id;
    if (named !== null && retired)
      issues.push({
        line: record.line,
        code: "fruiting_room_retired",
        column: "fruiting_room",
        value: record.fruitingRoom ?? "",
        severity: "error",
        message: `Line ${record.line}, block ${code}: the room "${named.name}" was retired on ${named.retiredOn}, so no block can start fruiting in it. Write the room the block fruited in, put the room back in use on the Rooms page, or leave the cell blank.`,
      });
    const roomId = named !== null && !retired ? named.id : null;
    const assignment = assignmentByCode.size === 0 ? null : (assignmentByCode.get(key(code)) ?? null);
    if (assignment) issues.push(...againstTheList(record, assignment, strain, method, strains, methods));
    // The same words whether or not another farm lists this code: the farm learns nothing about other farms' lists.
    if (!assignment && (record.trialCode || record.arm)) {
      const named = record.trialCode ? `trial "${record.trialCode}"` : `arm "${record.arm}"`;
      issues.push({
        line: record.line,
        code: "trial_block_not_listed",
        column: record.trialCode ? "trial" : "arm",
        value: record.trialCode ?? record.arm ?? "",
        severity: "error",
        message: `Line ${record.line}: block ${code} names ${named}, but your farm's randomised list has no block ${code}. Check the block code against your trial list, or leave the trial and arm cells blank to record it as an ordinary block.`,
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
      seasonYear: record.seasonYear ?? stored?.seasonYear ?? null,
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
      roomId: roomId ?? stored?.roomId ?? null,
    };
    if (named !== null && !retired)
      blockRooms.push({
        blockCode: code,
        room: named.name,
        change: !stored ? "new" : !stored.roomId ? "added" : stored.roomId === roomId ? "same" : "changed",
      });
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
    compare("season", shown(stored.seasonYear ?? null), shown(write.seasonYear));
    if (!sameNumber(stored.wetMassG, write.wetMassG, gramsTolerance))
      compare("block_wet_weight", shown(stored.wetMassG), shown(write.wetMassG));
    if (!sameNumber(stored.moisture, write.moisture, moistureTolerance))
      compare("substrate_moisture", shown(stored.moisture), shown(write.moisture));
    compare("contaminated", shown(stored.contaminated), shown(write.contaminated));
    compare("contaminated_on", stored.contaminatedOn, write.contaminatedOn);
    if (!sameNumber(stored.spentMassG, write.spentMassG, gramsTolerance))
      compare("spent_weight", shown(stored.spentMassG), shown(write.spentMassG));
    compare("notes", stored.notes || null, write.notes || null);
    // Kept by name, as the farm calls the room: history reads as the grower wrote it.
    if ((stored.roomId ?? null) !== write.roomId) compare("fruiting_room", roomOf(stored.roomId), roomOf(write.roomId));
    if (changes.length > before) {
      counts.changedBlocks++;
      blocks.push(write);
    } else {
      counts.untouchedBlocks++;
    }
  }

  const harvests: HarvestWrite[] = [];
  const inFile = new Set<string>();
  for (const record of input.records) {
    if (record.flush !== null) inFile.add(`${record.blockCode}\u0000${record.flush}`);
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

  const notInFile: NotInFile = {
    harvests: input.storedHarvests.filter(
      (harvest) => firstRecord.has(harvest.blockCode) && !inFile.has(`${harvest.blockCode}\u0000${harvest.flush}`),
    ),
    blocks: input.storedBlocks.filter((block) => !firstRecord.has(block.code)).length,
  };
  return { blocks, harvests, changes, newBlockCodes, counts, issues, notInFile, rooms: blockRooms };
}

/**
 * The plan when the grower chose to remove the stored harvests of the file's blocks that the file
 * does not have: each removal is a value change (its values to blank), kept in the history like
 * any other. Blocks the file leaves out are never removed: a file may hold only some blocks.
 */
export function withNotInFileRemoved(plan: CommitPlan): CommitPlan & { removedHarvests: StoredHarvest[] } {
  const removals = plan.notInFile.harvests.flatMap((harvest) =>
    harvestRemovalChanges(harvest).map((change) => ({ ...change, blockCode: harvest.blockCode })),
  );
  return { ...plan, changes: [...plan.changes, ...removals], removedHarvests: plan.notInFile.harvests };
}

/** A harvest removed, as value history keeps it: each of its values goes to blank. */
export function harvestRemovalChanges(harvest: {
  flush: number;
  harvestedOn: string | null;
  freshMassG: number;
  dryMassG: number | null;
}): Omit<ValueChange, "blockCode">[] {
  const changes: Omit<ValueChange, "blockCode">[] = [
    { flush: harvest.flush, field: "fresh_weight", oldValue: shown(harvest.freshMassG), newValue: null },
  ];
  if (harvest.harvestedOn !== null)
    changes.push({ flush: harvest.flush, field: "harvested_on", oldValue: harvest.harvestedOn, newValue: null });
  if (harvest.dryMassG !== null)
    changes.push({ flush: harvest.flush, field: "dry_weight", oldValue: shown(harvest.dryMassG), newValue: null });
  return changes;
}
