import { type DecimalMark, decimalEvidence, massNumberText, parseYesNo, readMass } from "../units";
import { addFlush, blockOf, compareBlock } from "./blocks";
import { type MassKind, implausibleMass, readMoistureCell } from "./cells";
import { readSeason } from "../seasons";
import { readDate } from "./dates";
import { cellIssue, report, shorten } from "./issues";
import { type ColumnDecimalEvidence, type MassValue, type ParseState, type RowValues, pendingBits } from "./state";
import type { ColumnPlan, SeasonRecord } from "./types";

const longestCell = 10_000;
const mostInternedTexts = 20_000;
const mostCachedDates = 50_000;
const flushNumber = /^(?:flush|fl|f|#)?\s*(\d{1,3})(?:\.0+)?(?:st|nd|rd|th)?$/i;

/**
 * A record as the parser makes it. A class rather than an object literal: in CPU profiles the
 * 22-field literal was the parser's most expensive line, and the constructor is not. Its
 * fields are SeasonRecord's, by declaration merging, so they are listed once.
 */
// eslint-disable-next-line @typescript-eslint/no-empty-object-type, @typescript-eslint/no-unsafe-declaration-merging -- the merge is the point: the fields are listed once, in SeasonRecord
interface ParsedRecord extends SeasonRecord {}
// eslint-disable-next-line @typescript-eslint/no-unsafe-declaration-merging -- as above
class ParsedRecord {
  constructor(row: RowValues, flush: number | null, harvestedOn: string | null, fresh: MassValue, dry: MassValue) {
    this.line = row.line;
    this.blockCode = row.blockCode;
    this.strainCode = row.strainCode;
    this.substrate = row.substrate;
    this.trialCode = row.trialCode;
    this.arm = row.arm;
    this.inoculatedOn = row.inoculatedOn;
    this.seasonYear = row.seasonYear;
    this.wetBlockGrams = row.wet === null ? null : row.wet.grams;
    this.wetBlockAsWritten = row.wet === null ? null : row.wet.written;
    this.moisture = row.moisture;
    this.fruitingMethod = row.fruitingMethod;
    this.fruitingRoom = row.fruitingRoom;
    this.flush = flush;
    this.harvestedOn = harvestedOn;
    this.freshGrams = fresh === null ? null : fresh.grams;
    this.freshAsWritten = fresh === null ? null : fresh.written;
    this.dryGrams = dry === null ? null : dry.grams;
    this.dryAsWritten = dry === null ? null : dry.written;
    this.contaminated = row.contaminated === true;
    this.contaminatedOn = row.contaminatedOn;
    this.spentGrams = row.spent === null ? null : row.spent.grams;
    this.spentAsWritten = row.spent === null ? null : row.spent.written;
    this.notes = row.notes;
  }
}

// V8 keeps a substring of 13 or more characters as a view of the text it was cut from, so
// one note kept from each chunk would keep the whole file in memory; a copy lets the chunk go.
export function ownCopy(text: string): string {
  return text.length < 13 ? text : (JSON.parse(JSON.stringify(text)) as string);
}

function cell(cells: readonly string[], index: number): string {
  return index < 0 || index >= cells.length ? "" : cells[index].trim();
}

function intern(state: ParseState, text: string): string {
  const interned = state.caches.interned;
  const known = interned.get(text);
  if (known !== undefined) return known;
  const copy = ownCopy(text);
  if (interned.size < mostInternedTexts) interned.set(copy, copy);
  return copy;
}

/** Which kind of mass each pending bit stands for, for the limits in `cells.ts`. */
export const massKindOfBit: Readonly<Record<number, MassKind>> = {
  [pendingBits.wet]: "wet",
  [pendingBits.spent]: "spent",
  [pendingBits.fresh]: "fresh",
  [pendingBits.dry]: "dry",
};

/** The decimal mark the grower chose for the column (or the file), if any. */
export function chosenMark(state: ParseState, column: ColumnPlan): DecimalMark | undefined {
  return state.options.decimalByColumn?.[column.header] ?? state.options.decimal;
}

function evidenceOf(state: ParseState, column: ColumnPlan): ColumnDecimalEvidence {
  let evidence = state.decimalEvidence.get(column.index);
  if (evidence === undefined) {
    evidence = { column, comma: 0, point: 0, firstEither: null };
    state.decimalEvidence.set(column.index, evidence);
  }
  return evidence;
}

/**
 * A mass cell. The decimal mark is never guessed: a number that reads only one way is read so;
 * one that reads two ways ("2.720") is read with the mark the grower chose, or else waits for
 * the end of the file, where the column's (or the file's) other numbers settle the mark.
 */
function mass(state: ParseState, cells: readonly string[], column: ColumnPlan, line: number, bit: number): MassValue {
  const text = cell(cells, column.index);
  if (text === "") return null;
  let masses = state.caches.masses.get(state.typedNumbers?.[column.index] === true ? -2 - column.index : column.index);
  if (masses === undefined) {
    masses = new Map();
    state.caches.masses.set(state.typedNumbers?.[column.index] === true ? -2 - column.index : column.index, masses);
  }
  const known = masses.get(text);
  if (known !== undefined) return known;
  // A spreadsheet's number cell is written with "." and no grouping: there is nothing to settle.
  const typed = state.typedNumbers?.[column.index] === true;
  const chosen = typed ? "." : chosenMark(state, column);
  const number = typed ? null : massNumberText(text);
  const evidence = number === null ? null : decimalEvidence(number);
  if (evidence !== null) {
    const counts = evidenceOf(state, column);
    if (evidence === ",") counts.comma++;
    else if (evidence === ".") counts.point++;
    else if (chosen === undefined) {
      counts.firstEither ??= { line, value: ownCopy(text) };
      state.rowPending |= bit;
      return { grams: Number.NaN, written: { value: ownCopy(text), unit: column.unit ?? "g" } };
    }
  }
  const reading = readMass(text, { defaultUnit: column.unit, decimal: chosen ?? (evidence === "," ? "," : ".") });
  if ("error" in reading) {
    cellIssue(state.issues, line, column, reading.code, text, "error", reading.error);
    return null;
  }
  const value = ownCopy(text);
  const read = { grams: reading.grams, written: { value, unit: reading.unit } };
  const implausible = implausibleMass(massKindOfBit[bit], text, reading.grams);
  // Not kept with the readings: each such cell is reported.
  if (implausible !== null) cellIssue(state.issues, line, column, "mass_implausible", text, "error", implausible);
  else if (masses.size < mostInternedTexts) masses.set(value, read);
  return read;
}

/**
 * A date cell: its text, which the record holds until the end of the file, where the file's
 * date order is known (flagged for the row). An unreadable date is reported here and is null.
 */
function date(state: ParseState, cells: readonly string[], column: ColumnPlan, line: number, bit: number): string | null {
  const text = cell(cells, column.index);
  if (text === "") return null;
  const dates = state.caches.dates;
  let entry = dates.get(text);
  if (entry === undefined) {
    entry = { reading: readDate(text), written: ownCopy(text) };
    if (entry.reading.kind !== "date" || dates.size < mostCachedDates) dates.set(entry.written, entry);
  }
  const reading = entry.reading;
  const evidence = state.dateEvidence;
  switch (reading.kind) {
    case "error":
      cellIssue(state.issues, line, column, reading.code, text, "error", reading.error);
      return null;
    case "either":
      evidence.firstEither ??= { line, column: column.header, value: entry.written };
      break;
    case "dmy-only":
      evidence.dayFirstOnly++;
      evidence.firstDayFirst ??= { line, column: column.header, value: entry.written };
      break;
    case "mdy-only":
      evidence.monthFirstOnly++;
      evidence.firstMonthFirst ??= { line, column: column.header, value: entry.written };
      break;
  }
  state.rowPending |= bit;
  return entry.written;
}

function optionalText(state: ParseState, cells: readonly string[], column: ColumnPlan): string | null {
  const text = cell(cells, column.index);
  return text === "" ? null : intern(state, text);
}

function strain(state: ParseState, text: string, line: number, column: ColumnPlan): string {
  const register = state.strains;
  if (register === null) return intern(state, text);
  const checks = state.caches.strainChecks;
  let known = checks.get(text);
  if (known === undefined) {
    // A strain written by its name is kept as its code: the rest of the import and the planner compare codes.
    known = register.find(text)?.code ?? null;
    if (checks.size < mostInternedTexts) checks.set(text, known);
  }
  if (known !== null) return known;
  const suggestion = register.suggestion(text);
  const hint = suggestion === "" ? "Check it against the co-op's strain list" : `${suggestion.trim()} Correct the cell`;
  cellIssue(
    state.issues,
    line,
    column,
    "unknown_strain",
    text,
    "error",
    `"${shorten(text)}" is neither a strain code nor a strain name of the co-op. ${hint}, or ask the coordinator to add the strain to the register.`,
  );
  return intern(state, text);
}

function moisture(state: ParseState, cells: readonly string[], line: number): number | null {
  const column = state.layout.columns.substrate_moisture;
  const text = cell(cells, column.index);
  if (text === "") return null;
  const moistures = state.caches.moistures;
  let reading = moistures.get(text);
  if (reading === undefined) {
    reading = readMoistureCell(text, state.typedNumbers?.[column.index] === true ? "." : chosenMark(state, column));
    if (moistures.size < mostInternedTexts) moistures.set(text, reading);
  }
  if ("code" in reading) {
    cellIssue(state.issues, line, column, reading.code, text, "error", reading.message);
    return null;
  }
  return reading.value;
}

function addRecord(
  state: ParseState,
  flush: number | null,
  harvestedOn: string | null,
  fresh: MassValue,
  dry: MassValue,
  harvestPending: number,
): void {
  const row = state.row;
  const record = new ParsedRecord(row, flush, harvestedOn, fresh, dry);
  const index = state.records.length;
  state.records.push(record);
  const pending = row.pending | harvestPending;
  if (pending !== 0) {
    if (index >= state.pending.length) {
      const grown = new Uint8Array(state.pending.length * 2);
      grown.set(state.pending);
      state.pending = grown;
    }
    state.pending[index] = pending;
  }
  if (row.block !== null && flush !== null) addFlush(state, row.block, record, flush, row.line);
}

function harvestRow(state: ParseState, cells: readonly string[], line: number): void {
  const columns = state.layout.columns;
  const flushColumn = columns.flush;
  const freshColumn = columns.fresh_weight;
  const flushText = cell(cells, flushColumn.index);
  const freshText = cell(cells, freshColumn.index);
  state.rowPending = 0;
  const harvestedOn = date(state, cells, columns.harvested_on, line, pendingBits.harvested);
  const dry = mass(state, cells, columns.dry_weight, line, pendingBits.dry);
  if (flushText === "" && freshText === "") {
    if (harvestedOn !== null || dry !== null) {
      const column = harvestedOn !== null ? columns.harvested_on : columns.dry_weight;
      const value = cell(cells, column.index);
      cellIssue(
        state.issues,
        line,
        column,
        "harvest_cell_without_harvest",
        value,
        "error",
        `"${shorten(value)}" belongs to a harvest, but the row has no flush number and no fresh weight. Fill in the flush and the fresh weight, or clear this cell if the row is only the block.`,
      );
    }
    addRecord(state, null, null, null, null, 0);
    return;
  }
  let flush: number | null = null;
  if (flushText === "") {
    cellIssue(
      state.issues,
      line,
      flushColumn,
      "flush_missing",
      "",
      "error",
      `the flush number is missing, but the row has a fresh weight ("${shorten(freshText)}"). Write which flush this is (1, 2, 3 …), or clear the weight if the row is only the block.`,
    );
  } else {
    const match = flushNumber.exec(flushText);
    if (match === null || Number(match[1]) < 1) {
      cellIssue(
        state.issues,
        line,
        flushColumn,
        "flush_unreadable",
        flushText,
        "error",
        `"${shorten(flushText)}" is not a flush number. Write 1 for the first flush, 2 for the second and so on.`,
      );
    } else flush = Number(match[1]);
  }
  let fresh: MassValue = null;
  if (freshText === "") {
    cellIssue(
      state.issues,
      line,
      freshColumn,
      "fresh_weight_missing",
      "",
      "error",
      `the fresh weight${flush === null ? "" : ` of flush ${flush}`} is missing. Enter what was picked, with its unit, or clear the flush number if the row is only the block.`,
    );
  } else fresh = mass(state, cells, freshColumn, line, pendingBits.fresh);
  addRecord(state, flush, harvestedOn, fresh, dry, state.rowPending);
}

/** Cells longer than a season log holds, and values beyond the header's last column. */
function checkRowShape(state: ParseState, cells: string[], line: number): void {
  const layout = state.layout;
  for (let index = 0; index < cells.length; index++) {
    if (cells[index].length > longestCell) {
      const header = index < layout.headerWidth ? layout.mapping.columns[index].header : `(column ${index + 1})`;
      report(
        state.issues,
        line,
        "cell_too_long",
        "error",
        `Line ${line}, column "${header}": the value is ${cells[index].length} characters long; a season-log cell holds at most ${longestCell}. Check that this is the season log exported as CSV, and shorten the cell.`,
        header,
        cells[index],
      );
      cells[index] = "";
    }
  }
  for (let index = layout.headerWidth; index < cells.length; index++) {
    if (cells[index].trim() !== "") {
      report(
        state.issues,
        line,
        "value_beyond_header",
        "warning",
        `Line ${line}, column ${index + 1}: the value "${shorten(cells[index].trim())}" is beyond the last column of the header, so it is not imported. Give the column a header, or delete the value.`,
        `(column ${index + 1})`,
        cells[index].trim(),
      );
      break;
    }
  }
}

function season(state: ParseState, cells: string[], line: number): number | null {
  const column = state.layout.columns.season;
  const text = cell(cells, column.index);
  const reading = readSeason(text);
  if (reading === null) return null;
  if (!reading.ok) {
    cellIssue(state.issues, line, column, reading.code, text, "error", reading.message);
    return null;
  }
  return reading.seasonYear;
}

/**
 * Stage 4, read cells: one data row becomes one record in long form, or one record per filled
 * flush column in wide form (one block record when none is filled). Cells are read and
 * checked here; the row is then compared with the block's earlier rows (stage 5).
 */
export function readDataRow(state: ParseState, cells: string[], line: number): void {
  checkRowShape(state, cells, line);
  const columns = state.layout.columns;
  const blockColumn = columns.block_id;
  const blockText = cell(cells, blockColumn.index);
  if (blockText === "")
    cellIssue(
      state.issues,
      line,
      blockColumn,
      "block_code_missing",
      "",
      "error",
      "the block code is missing. Every row needs the code of its block: fill it in, or delete the row.",
    );
  state.rowPending = 0;
  const strainColumn = columns.strain;
  const strainText = cell(cells, strainColumn.index);
  let strainCode = strainText;
  if (strainText === "")
    cellIssue(
      state.issues,
      line,
      strainColumn,
      "strain_missing",
      "",
      "error",
      "the strain is missing. Write the strain code (for example PO-03) on every row of the block.",
    );
  else strainCode = strain(state, strainText, line, strainColumn);
  const row = state.row;
  row.line = line;
  row.block = blockText === "" ? null : blockOf(state, blockText, line, ownCopy);
  row.blockCode = row.block === null ? "" : row.block.code;
  row.strainCode = strainCode;
  row.pending = 0;
  row.inoculatedOn = date(state, cells, columns.inoculated_on, line, pendingBits.inoculated);
  row.seasonYear = season(state, cells, line);
  row.wet = mass(state, cells, columns.block_wet_weight, line, pendingBits.wet);
  row.moisture = moisture(state, cells, line);
  const contaminatedColumn = columns.contaminated;
  const contaminatedText = cell(cells, contaminatedColumn.index);
  let flag = state.caches.yesNo.get(contaminatedText);
  if (flag === undefined) {
    flag = parseYesNo(contaminatedText);
    if (state.caches.yesNo.size < mostInternedTexts) state.caches.yesNo.set(ownCopy(contaminatedText), flag);
  }
  row.contaminated = null;
  if ("error" in flag) cellIssue(state.issues, line, contaminatedColumn, flag.code, contaminatedText, "error", flag.error);
  else row.contaminated = flag.value;
  row.contaminatedOn = date(state, cells, columns.contaminated_on, line, pendingBits.contaminatedOn);
  row.spent = mass(state, cells, columns.spent_weight, line, pendingBits.spent);
  row.substrate = optionalText(state, cells, columns.substrate);
  row.trialCode = optionalText(state, cells, columns.trial);
  row.arm = optionalText(state, cells, columns.arm);
  row.fruitingMethod = optionalText(state, cells, columns.fruiting_method);
  row.fruitingRoom = optionalText(state, cells, columns.fruiting_room);
  const notesText = cell(cells, columns.notes.index);
  row.notes = notesText === "" ? null : ownCopy(notesText);
  row.pending = state.rowPending;
  const first = state.records.length;
  if (state.layout.format === "wide") {
    for (const wideFlush of state.layout.wide) {
      if (cell(cells, wideFlush.weight.index) === "") continue;
      state.rowPending = 0;
      const fresh = mass(state, cells, wideFlush.weight, line, pendingBits.fresh);
      const harvestedOn = wideFlush.date === null ? null : date(state, cells, wideFlush.date, line, pendingBits.harvested);
      addRecord(state, wideFlush.flush, harvestedOn, fresh, null, state.rowPending);
    }
    if (state.records.length === first) addRecord(state, null, null, null, null, 0);
  } else {
    harvestRow(state, cells, line);
  }
  if (row.block !== null) compareBlock(state, row.block, first, line, row.contaminated, cells);
}
