import { drySubstrateGrams, formatMass } from "../units";
import {
  efficiencyPercent,
  efficiencyVerdict,
  dryWeightImplausible,
  flushHeavierThanBlock as heavierThanBlock,
  harvestBeforeInoculation,
  harvestOnContaminatedBlock,
  highestPlausibleEfficiency,
  missingFlushes,
} from "./harvest-checks";
import { roomKey } from "./cells";
import { type IssueCode, cellIssue, shorten, writtenDate } from "./issues";
import { flushWeightColumn, harvestDateColumn } from "./layout";
import type { SeasonLogColumnName } from "./schema";
import type { ParseState } from "./state";
import { type SeasonRecord, absentColumn } from "./types";

const moistureTolerance = 0.0005;
const massTolerance = 0.005;

type BlockAttribute =
  | "substrate"
  | "trialCode"
  | "arm"
  | "inoculatedOn"
  | "wetBlockGrams"
  | "moisture"
  | "fruitingMethod"
  | "contaminatedOn"
  | "spentGrams"
  | "strainCode"
  | "seasonYear"
  | "fruitingRoom";

/** Position of each block attribute in `BlockState.source`. */
export const slot: Readonly<Record<BlockAttribute, number>> = {
  strainCode: 0,
  substrate: 1,
  trialCode: 2,
  arm: 3,
  inoculatedOn: 4,
  wetBlockGrams: 5,
  moisture: 6,
  fruitingMethod: 7,
  contaminatedOn: 8,
  spentGrams: 9,
  seasonYear: 10,
  fruitingRoom: 11,
};

/** What the file says about one block so far, across its rows. */
export interface BlockState {
  /** The code as first written; rows of the block share this one string. */
  code: string;
  firstLine: number;
  /** Index of the first record that gave each block attribute a value (by `slot`), or -1. */
  source: number[];
  /** The first yes/no written in the contaminated column, and its line. */
  contaminated: boolean | null;
  contaminatedLine: number;
  /** Flush number and line of each harvest, in pairs: [flush, line, flush, line …]. */
  harvests: readonly number[];
  /** Fresh weight of all its harvests. */
  freshGrams: number;
  /** The inoculation and contamination dates as written on the row that first gave them. */
  inoculatedWritten: string | null;
  contaminatedOnWritten: string | null;
}

// Block states are many in a large file: arrays made whole (not grown by push) hold no spare room.
const noHarvests: readonly number[] = [];

interface BlockAttributeRule {
  field: BlockAttribute;
  slot: number;
  column: SeasonLogColumnName;
  words: string;
  same: (a: SeasonRecord, b: SeasonRecord) => boolean;
  shown: (record: SeasonRecord) => string;
}

const sameText = (field: BlockAttribute) => (a: SeasonRecord, b: SeasonRecord) => a[field] === b[field];
const sameMass = (field: "wetBlockGrams" | "spentGrams") => (a: SeasonRecord, b: SeasonRecord) =>
  Math.abs((a[field] as number) - (b[field] as number)) <= massTolerance * Math.max(a[field] as number, b[field] as number);
const shownText = (field: BlockAttribute) => (record: SeasonRecord) => String(record[field]);
const shownMass = (written: "wetBlockAsWritten" | "spentAsWritten") => (record: SeasonRecord) => record[written]?.value ?? "";

function rule(
  field: BlockAttribute,
  column: SeasonLogColumnName,
  words: string,
  same = sameText(field),
  shown = shownText(field),
): BlockAttributeRule {
  return { field, slot: slot[field], column, words, same, shown };
}

// Block columns compared between rows while reading; the dates wait for the file's date order.
const rowBlockAttributes: readonly BlockAttributeRule[] = [
  rule("strainCode", "strain", "strain"),
  rule("substrate", "substrate", "substrate"),
  rule("trialCode", "trial", "trial"),
  rule("arm", "arm", "trial arm"),
  rule("wetBlockGrams", "block_wet_weight", "wet block weight", sameMass("wetBlockGrams"), shownMass("wetBlockAsWritten")),
  rule(
    "moisture",
    "substrate_moisture",
    "substrate moisture",
    (a, b) => Math.abs((a.moisture as number) - (b.moisture as number)) <= moistureTolerance,
    (record) => `${Math.round((record.moisture as number) * 1000) / 10} %`,
  ),
  rule("fruitingMethod", "fruiting_method", "fruiting method"),
  rule("spentGrams", "spent_weight", "spent block weight", sameMass("spentGrams"), shownMass("spentAsWritten")),
  rule("seasonYear", "season", "season"),
  // "Tent 1" and "tent 1" name the same room (matched so against the farm's rooms by the planner).
  rule("fruitingRoom", "fruiting_room", "fruiting room", (a, b) => roomKey(a.fruitingRoom as string) === roomKey(b.fruitingRoom as string)),
];
const dateBlockAttributes: readonly BlockAttributeRule[] = [
  rule("inoculatedOn", "inoculated_on", "inoculation date"),
  rule("contaminatedOn", "contaminated_on", "contamination date"),
];

/** The block a row belongs to, made the first time its code is seen. */
export function blockOf(state: ParseState, written: string, line: number, own: (text: string) => string): BlockState {
  let block = state.blocks.get(written);
  if (block === undefined) {
    const code = own(written);
    block = {
      code,
      firstLine: line,
      source: [-1, -1, -1, -1, -1, -1, -1, -1, -1, -1, -1, -1],
      contaminated: null,
      contaminatedLine: 0,
      harvests: noHarvests,
      freshGrams: 0,
      inoculatedWritten: null,
      contaminatedOnWritten: null,
    };
    state.blocks.set(code, block);
  }
  return block;
}

function blockIssue(state: ParseState, record: SeasonRecord, name: SeasonLogColumnName, code: IssueCode, value: string, what: string) {
  cellIssue(state.issues, record.line, state.layout.columns[name], code, value, "error", what);
}

/** `writtenHere`: the row's cell as written, where the reading differs from it (a moisture, a strain in the co-op's spelling). */
function disagreement(
  state: ParseState,
  rule: BlockAttributeRule,
  record: SeasonRecord,
  earlier: SeasonRecord,
  writtenHere?: string,
): void {
  const value = writtenHere ?? rule.shown(record);
  blockIssue(
    state,
    record,
    rule.column,
    "block_details_disagree",
    value,
    `block ${record.blockCode} has ${rule.words} "${shorten(value)}" here but "${shorten(rule.shown(earlier))}" on line ${earlier.line}. A block's details must be the same on every row: correct one of them.`,
  );
}

/** Stage 5, while reading: a harvest of the block. The same flush twice is an error. */
export function addFlush(state: ParseState, block: BlockState, record: SeasonRecord, flush: number, line: number): void {
  let earlier = -1;
  for (let index = 0; index < block.harvests.length; index += 2) if (block.harvests[index] === flush) earlier = block.harvests[index + 1];
  if (earlier !== -1) {
    cellIssue(
      state.issues,
      line,
      flushWeightColumn(state.layout, flush, "flush"),
      "duplicate_flush",
      String(flush),
      "error",
      `block ${record.blockCode} has flush ${flush} twice: on line ${earlier} and here. Delete the duplicate row, or correct the flush number.`,
    );
  } else {
    block.harvests = [...block.harvests, flush, line];
  }
  // Summed as the rows come in (NaN: a weight read at the end, added there). Summed at the end
  // instead, the first fraction written turned the field from whole numbers to decimals on
  // every block already made, and V8 then migrated each block object: it tripled the end's time.
  if (record.freshGrams !== null && !Number.isNaN(record.freshGrams)) block.freshGrams += record.freshGrams;
}

/**
 * Stage 5, while reading: compares the block columns of a row with the block's earlier rows.
 * The first row that gives a column its value becomes the block's source for that column.
 */
export function compareBlock(
  state: ParseState,
  block: BlockState,
  recordIndex: number,
  line: number,
  contaminated: boolean | null,
  cells: readonly string[],
): void {
  const record = state.records[recordIndex];
  for (const rule of rowBlockAttributes) {
    const value = record[rule.field];
    // NaN: a mass whose decimal mark the end of the file settles; compared there (`compareSettledMasses`).
    if (value === null || value !== value || (rule.field === "strainCode" && value === "")) continue;
    const source = block.source[rule.slot];
    if (source === -1) {
      block.source[rule.slot] = recordIndex;
      continue;
    }
    const earlier = state.records[source];
    if (!rule.same(earlier, record)) {
      const index = state.layout.columns[rule.column].index;
      disagreement(state, rule, record, earlier, index >= 0 && index < cells.length ? cells[index].trim() : undefined);
    }
  }
  if (contaminated !== null) {
    if (block.contaminated === null) {
      block.contaminated = contaminated;
      block.contaminatedLine = line;
    } else if (block.contaminated !== contaminated) {
      blockIssue(
        state,
        record,
        "contaminated",
        "contamination_disagrees",
        cells[state.layout.columns.contaminated.index]?.trim() ?? "",
        `block ${record.blockCode} is marked ${contaminated ? "contaminated" : "not contaminated"} here but ${block.contaminated ? "contaminated" : "not contaminated"} on line ${block.contaminatedLine}. A block's details must be the same on every row: correct one of them.`,
      );
    }
  }
  if (record.inoculatedOn !== null && block.source[slot.inoculatedOn] === -1) {
    block.source[slot.inoculatedOn] = recordIndex;
    block.inoculatedWritten = record.inoculatedOn;
  }
  if (record.contaminatedOn !== null && block.source[slot.contaminatedOn] === -1) {
    block.source[slot.contaminatedOn] = recordIndex;
    block.contaminatedOnWritten = record.contaminatedOn;
  }
}

/** At the end of the file, a mass whose decimal mark was settled there: compared with the block's other rows as `compareBlock` does. */
export function compareSettledMass(state: ParseState, block: BlockState, recordIndex: number, field: "wetBlockGrams" | "spentGrams"): void {
  const record = state.records[recordIndex];
  if (record[field] === null) return;
  const rule = rowBlockAttributes.find((candidate) => candidate.field === field) as BlockAttributeRule;
  const source = block.source[rule.slot];
  if (source === -1) block.source[rule.slot] = recordIndex;
  else if (source !== recordIndex && state.records[source][field] !== null && !rule.same(state.records[source], record))
    disagreement(state, rule, record, state.records[source]);
}

/** The dates of a record as written in the file, kept while the end of the file resolves them. */
export interface WrittenDates {
  inoculatedOn: string | null;
  harvestedOn: string | null;
  contaminatedOn: string | null;
}

/**
 * Stage 5, at the end of the file (dates resolved): compares the block's dates between rows,
 * fills the record's blank block columns from the block's other rows, and checks the harvest
 * against the inoculation and the contamination date against the contaminated column.
 */
export function blockAtFinish(state: ParseState, block: BlockState, record: SeasonRecord, index: number, written: WrittenDates): void {
  const records = state.records;
  const source = block.source;
  for (const rule of dateBlockAttributes) {
    const from = source[rule.slot];
    if (record[rule.field] === null || from === -1 || from === index) continue;
    const earlier = records[from];
    if (earlier[rule.field] === null || earlier.line === record.line || rule.same(earlier, record)) continue;
    const here = rule.field === "inoculatedOn" ? written.inoculatedOn : written.contaminatedOn;
    const there = rule.field === "inoculatedOn" ? block.inoculatedWritten : block.contaminatedOnWritten;
    blockIssue(
      state,
      record,
      rule.column,
      "block_details_disagree",
      here ?? "",
      `block ${record.blockCode} has ${rule.words} "${shorten(here ?? "")}" here but "${shorten(there ?? "")}" on line ${earlier.line}. A block's details must be the same on every row: correct one of them.`,
    );
  }
  if (record.substrate === null && source[slot.substrate] !== -1) record.substrate = records[source[slot.substrate]].substrate;
  if (record.trialCode === null && source[slot.trialCode] !== -1) record.trialCode = records[source[slot.trialCode]].trialCode;
  if (record.arm === null && source[slot.arm] !== -1) record.arm = records[source[slot.arm]].arm;
  if (record.inoculatedOn === null && source[slot.inoculatedOn] !== -1)
    record.inoculatedOn = records[source[slot.inoculatedOn]].inoculatedOn;
  if (record.wetBlockGrams === null && source[slot.wetBlockGrams] !== -1) {
    record.wetBlockGrams = records[source[slot.wetBlockGrams]].wetBlockGrams;
    record.wetBlockAsWritten = records[source[slot.wetBlockGrams]].wetBlockAsWritten;
  }
  if (record.moisture === null && source[slot.moisture] !== -1) record.moisture = records[source[slot.moisture]].moisture;
  if (record.seasonYear === null && source[slot.seasonYear] !== -1) record.seasonYear = records[source[slot.seasonYear]].seasonYear;
  if (record.fruitingRoom === null && source[slot.fruitingRoom] !== -1)
    record.fruitingRoom = records[source[slot.fruitingRoom]].fruitingRoom;
  if (record.fruitingMethod === null && source[slot.fruitingMethod] !== -1)
    record.fruitingMethod = records[source[slot.fruitingMethod]].fruitingMethod;
  if (record.contaminatedOn === null && source[slot.contaminatedOn] !== -1)
    record.contaminatedOn = records[source[slot.contaminatedOn]].contaminatedOn;
  if (record.spentGrams === null && source[slot.spentGrams] !== -1) {
    record.spentGrams = records[source[slot.spentGrams]].spentGrams;
    record.spentAsWritten = records[source[slot.spentGrams]].spentAsWritten;
  }
  record.contaminated = block.contaminated ?? record.contaminatedOn !== null;
  if (record.harvestedOn !== null && record.inoculatedOn !== null && harvestBeforeInoculation(record.harvestedOn, record.inoculatedOn)) {
    const harvested = written.harvestedOn ?? record.harvestedOn;
    const inoculated = written.inoculatedOn ?? block.inoculatedWritten ?? record.inoculatedOn;
    cellIssue(
      state.issues,
      record.line,
      harvestDateColumn(state.layout, record.flush),
      "harvest_before_inoculation",
      harvested,
      "error",
      `flush ${record.flush} of block ${record.blockCode} was harvested on ${writtenDate(harvested, record.harvestedOn)}, before the block was inoculated (${writtenDate(inoculated, record.inoculatedOn)}). Correct the harvest date or the inoculation date.`,
    );
  }
  if (
    record.flush !== null &&
    record.contaminated &&
    record.harvestedOn !== null &&
    record.contaminatedOn !== null &&
    harvestOnContaminatedBlock({ contaminated: true, contaminatedOn: record.contaminatedOn }, record.harvestedOn) === "after"
  ) {
    const harvested = written.harvestedOn ?? record.harvestedOn;
    const found = written.contaminatedOn ?? block.contaminatedOnWritten ?? record.contaminatedOn;
    cellIssue(
      state.issues,
      record.line,
      harvestDateColumn(state.layout, record.flush),
      "harvest_on_contaminated_block",
      harvested,
      "warning",
      `flush ${record.flush} of block ${record.blockCode} was harvested on ${writtenDate(harvested, record.harvestedOn)}, after the block was found contaminated (${writtenDate(found, record.contaminatedOn)}). Check the dates and the block code; handle a contaminated block with respiratory protection.`,
    );
  }
  if (block.contaminated === false && record.contaminatedOn !== null && source[slot.contaminatedOn] === index) {
    const date = written.contaminatedOn ?? record.contaminatedOn;
    cellIssue(
      state.issues,
      record.line,
      state.layout.columns.contaminated_on,
      "contamination_date_not_contaminated",
      date,
      "warning",
      `block ${record.blockCode} has a contamination date (${writtenDate(date, record.contaminatedOn)}) but is marked not contaminated on line ${block.contaminatedLine}. Mark it contaminated, or clear the date.`,
    );
  }
}

/** At the end of the file: a harvest's dry weight against its fresh weight. */
export function dryAgainstFresh(state: ParseState, record: SeasonRecord): void {
  const { dryGrams, freshGrams } = record;
  if (dryGrams === null || freshGrams === null || !dryWeightImplausible(dryGrams, freshGrams)) return;
  const dry = record.dryAsWritten?.value ?? "";
  const fresh = record.freshAsWritten?.value ?? "";
  const what = `the dry weight "${shorten(dry)}" (${formatMass(dryGrams, "metric")}) is ${dryGrams > freshGrams ? "more than" : "under a hundredth of"} the fresh weight "${shorten(fresh)}" (${formatMass(freshGrams, "metric")}); dried mushrooms keep about a tenth. Check the units of both weights.`;
  // Either weight can be the one read wrong: each column gets the issue.
  cellIssue(state.issues, record.line, state.layout.columns.dry_weight, "dry_weight_implausible", dry, "error", what);
  cellIssue(
    state.issues,
    record.line,
    flushWeightColumn(state.layout, record.flush, "fresh_weight"),
    "dry_weight_implausible",
    fresh,
    "error",
    what,
  );
}

/** Stage 5, at the end of the file: a flush heavier than the whole wet block. */
export function flushHeavierThanBlock(state: ParseState, record: SeasonRecord): void {
  if (
    record.flush !== null &&
    record.freshGrams !== null &&
    record.wetBlockGrams !== null &&
    heavierThanBlock(record.freshGrams, record.wetBlockGrams)
  ) {
    const wetColumn = state.layout.columns.block_wet_weight;
    cellIssue(
      state.issues,
      record.line,
      flushWeightColumn(state.layout, record.flush, "fresh_weight"),
      "flush_heavier_than_block",
      record.freshAsWritten?.value ?? "",
      "warning",
      `flush ${record.flush} of block ${record.blockCode} weighs "${shorten(record.freshAsWritten?.value ?? "")}" (${formatMass(record.freshGrams, "metric")}), more than the whole wet block ("${shorten(record.wetBlockAsWritten?.value ?? "")}", ${formatMass(record.wetBlockGrams, "metric")}${wetColumn.index === -1 ? "" : `, column "${wetColumn.header}"`}). Check the weight and its unit.`,
    );
  }
}

/** A block's biological efficiency in percent, or null when its wet weight, moisture or harvests are missing. */
export function blockEfficiency(state: ParseState, block: BlockState): number | null {
  const wetSource = block.source[slot.wetBlockGrams];
  const moistureSource = block.source[slot.moisture];
  if (wetSource === -1 || moistureSource === -1 || block.freshGrams === 0) return null;
  const wet = state.records[wetSource].wetBlockGrams;
  const moisture = state.records[moistureSource].moisture;
  return efficiencyPercent(block.freshGrams, wet, moisture);
}

/** Stage 5, at the end of the file: gaps in the block's flush numbers, and its biological efficiency. */
export function blockTotals(state: ParseState, code: string, block: BlockState, efficiencyChecked: boolean): void {
  const flushes = block.harvests.filter((_, index) => index % 2 === 0);
  const missing = missingFlushes(flushes);
  if (missing.length > 0) {
    const after = Math.min(...flushes.filter((flush) => flush > missing[0]));
    const line = block.harvests[block.harvests.indexOf(after) + 1];
    const recorded = [...flushes].sort((a, b) => a - b).join(", ");
    cellIssue(
      state.issues,
      line,
      flushWeightColumn(state.layout, after, "flush"),
      "flush_gap",
      String(after),
      "warning",
      `block ${code} has flushes ${recorded} but no flush ${missing.join(", ")}. Add the missing flush, or renumber the flushes.`,
    );
  }
  const wetSource = block.source[slot.wetBlockGrams];
  const moistureSource = block.source[slot.moisture];
  if (!efficiencyChecked || wetSource === -1 || moistureSource === -1 || block.freshGrams === 0) return;
  const wetGrams = state.records[wetSource].wetBlockGrams;
  const moisture = state.records[moistureSource].moisture;
  if (wetGrams === null || moisture === null) return;
  const dryGrams = drySubstrateGrams(wetGrams, moisture);
  const exact = efficiencyPercent(block.freshGrams, wetGrams, moisture);
  if (efficiencyVerdict(exact) === "plausible") return;
  const efficiency = Math.round(exact as number);
  const layout = state.layout;
  const column = layout.format === "wide" ? (layout.wide[0]?.weight ?? absentColumn) : layout.columns.fresh_weight;
  const wetWritten = state.records[wetSource].wetBlockAsWritten?.value ?? "";
  cellIssue(
    state.issues,
    block.firstLine,
    column,
    "efficiency_implausible",
    wetWritten,
    "warning",
    `block ${code} gave ${formatMass(block.freshGrams, "metric")} fresh in all from a wet block of "${shorten(wetWritten)}" (${formatMass(dryGrams, "metric")} of dry substrate): a biological efficiency of ${efficiency} %, above the ${highestPlausibleEfficiency} % that blocks plausibly reach. Check this block's weights, their units and its moisture.`,
  );
}
