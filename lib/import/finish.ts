import { type DecimalMark, drySubstrateGrams, massNumberText, parseDecimalNumber, readMass } from "../units";
import {
  type BlockState,
  type WrittenDates,
  blockAtFinish,
  blockEfficiency,
  blockTotals,
  compareSettledMass,
  dryAgainstFresh,
  flushHeavierThanBlock,
  slot,
} from "./blocks";
import { type DateOrder, type DateReading, describeOrder, readDate, wrongOrderMessage } from "./dates";
import { cellIssue, report, shorten, writtenDate } from "./issues";
import { implausibleMass } from "./cells";
import { highestPossibleEfficiency, lowestColumnEfficiency } from "./harvest-checks";
import { massKindOfBit } from "./rows";
import { flushWeightColumn, harvestDateColumn, type RowAboveHeader } from "./layout";
import { type DateEvidence, type ParseState, pendingBits, pendingMassBits } from "./state";
import { type ColumnPlan, type SeasonLogIssue, type SeasonRecord, absentColumn } from "./types";

/**
 * The file's date order: the grower's choice, else what the dates that read only one way say
 * (the majority, unless as many say each). With only dates that read both ways, it is not
 * guessed: an error asks the grower to choose.
 */
export function decideDateOrder(
  evidence: DateEvidence,
  given: DateOrder | undefined,
  readingOf: (text: string) => DateReading,
): { order: DateOrder | "ambiguous" | null; issue?: Omit<SeasonLogIssue, "severity"> } {
  if (given !== undefined) return { order: given };
  const { dayFirstOnly, monthFirstOnly } = evidence;
  if (dayFirstOnly > 0 && monthFirstOnly > 0) {
    if (dayFirstOnly !== monthFirstOnly) return { order: dayFirstOnly > monthFirstOnly ? "dmy" : "mdy" };
    const dayFirst = evidence.firstDayFirst as NonNullable<DateEvidence["firstDayFirst"]>;
    const monthFirst = evidence.firstMonthFirst as NonNullable<DateEvidence["firstMonthFirst"]>;
    return {
      order: "ambiguous",
      issue: {
        line: dayFirst.line,
        code: "mixed_date_orders",
        column: dayFirst.column,
        value: dayFirst.value,
        message: `The file mixes day-first dates (such as "${dayFirst.value}" on line ${dayFirst.line}) and as many month-first dates (such as "${monthFirst.value}" on line ${monthFirst.line}). Choose the date order for the file, then correct the dates that do not fit it.`,
      },
    };
  }
  if (dayFirstOnly > 0) return { order: "dmy" };
  if (monthFirstOnly > 0) return { order: "mdy" };
  const either = evidence.firstEither;
  if (either === null) return { order: null };
  const reading = readingOf(either.value) as { kind: "either"; dmy: string; mdy: string };
  return {
    order: "ambiguous",
    issue: {
      line: either.line,
      code: "ambiguous_date_order",
      column: either.column,
      value: either.value,
      message: `Line ${either.line}, column "${either.column}": dates such as "${either.value}" can be read day-first (${reading.dmy}) or month-first (${reading.mdy}), and no date in the file settles which. Choose the date order, ${describeOrder("dmy")} or ${describeOrder("mdy")}, and read the file again.`,
    },
  };
}

/** True the first time a cell is named in a row; the records of one wide-form row share their block cells. */
interface Reported {
  line: number;
  columns: Set<string>;
}

function firstReport(reported: Reported, line: number, column: ColumnPlan): boolean {
  if (line !== reported.line) {
    reported.line = line;
    reported.columns.clear();
  }
  if (reported.columns.has(column.header)) return false;
  reported.columns.add(column.header);
  return true;
}

/** A date's reading by its text; the cache holds every date that waited (and most others). */
function readingOf(state: ParseState, text: string): DateReading {
  return state.caches.dates.get(text)?.reading ?? readDate(text);
}

function resolveDate(
  state: ParseState,
  reported: Reported,
  order: DateOrder | "ambiguous" | null,
  record: SeasonRecord,
  field: "inoculatedOn" | "harvestedOn" | "contaminatedOn",
  column: ColumnPlan,
): void {
  const text = record[field];
  if (text === null) return;
  const reading = readingOf(state, text);
  switch (reading.kind) {
    case "date":
      record[field] = reading.iso;
      return;
    case "either":
      record[field] = order === "dmy" || order === "mdy" ? reading[order] : null;
      return;
    case "error":
      record[field] = null;
      return;
    case "dmy-only":
    case "mdy-only": {
      const only = reading.kind === "dmy-only" ? "dmy" : "mdy";
      if ((order === "dmy" || order === "mdy") && only !== order) {
        if (firstReport(reported, record.line, column))
          cellIssue(state.issues, record.line, column, "date_wrong_order", text, "error", wrongOrderMessage(text, order));
        record[field] = null;
        return;
      }
      record[field] = reading.iso;
    }
  }
}

function futureDate(
  state: ParseState,
  reported: Reported,
  record: SeasonRecord,
  date: string,
  written: string | null,
  column: ColumnPlan,
  words: string,
): void {
  if (column.index === -1 || !firstReport(reported, record.line, column)) return;
  const value = written ?? date;
  cellIssue(
    state.issues,
    record.line,
    column,
    "date_in_future",
    value,
    "warning",
    `the ${words} ${writtenDate(value, date)} is in the future (today is ${state.today}). Check the date; with day-first and month-first dates, also check the date order.`,
  );
}

function futureDates(state: ParseState, reported: Reported, record: SeasonRecord, written: WrittenDates): void {
  const { today, layout } = state;
  if (record.harvestedOn !== null && record.harvestedOn > today)
    futureDate(state, reported, record, record.harvestedOn, written.harvestedOn, harvestDateColumn(layout, record.flush), "harvest date");
  if (record.inoculatedOn !== null && record.inoculatedOn > today)
    futureDate(state, reported, record, record.inoculatedOn, written.inoculatedOn, layout.columns.inoculated_on, "inoculation date");
  if (record.contaminatedOn !== null && record.contaminatedOn > today)
    futureDate(
      state,
      reported,
      record,
      record.contaminatedOn,
      written.contaminatedOn,
      layout.columns.contaminated_on,
      "contamination date",
    );
}

/** What the file's end says about how it was read: the header never found, no rows, a quote never closed. */
export function fileLevelIssues(
  issues: SeasonLogIssue[],
  input: { unclosedQuoteLine: number | null; headerLine: number; rowsAboveHeader: readonly RowAboveHeader[]; rows: number },
): void {
  if (input.unclosedQuoteLine !== null) {
    const line = input.unclosedQuoteLine;
    report(
      issues,
      line,
      "unclosed_quote",
      "error",
      `Line ${line}: a quotation mark opened on this line is never closed, so the rest of the file was read as one value. Close the quote, or remove the stray quotation mark.`,
    );
  }
  if (input.headerLine === 0 && input.rowsAboveHeader.length > 0) {
    const first = input.rowsAboveHeader[0];
    report(
      issues,
      first.line,
      "header_not_found",
      "error",
      `Line ${first.line} should name the columns, but no row of the file names a season-log column (the first starts "${shorten(first.text)}"). Put the column names in the first row (block_id, strain, flush, fresh_weight …; download the template to see them), or choose the columns in the mapping step.`,
    );
  }
  if (input.headerLine === 0) {
    if (issues.length === 0)
      report(
        issues,
        1,
        "empty_file",
        "error",
        "The file is empty. Export the season log from your spreadsheet as CSV (with the column names in the first row) and upload that file.",
      );
    return;
  }
  if (input.rows === 0) {
    report(
      issues,
      input.headerLine,
      "no_rows",
      "error",
      `The file has a header on line ${input.headerLine} but no rows below it. Add a row for each block or harvest, or check that you exported the right sheet.`,
    );
  }
}

/**
 * The decimal mark of each mass column that has numbers reading two ways: the grower's
 * choice, else what the column's other numbers settle, else (the column's numbers settle
 * nothing) what the file's numbers settle. When nothing settles it, an error asks the grower
 * to choose, and the column's ambiguous cells stay empty. Returns the columns left ambiguous.
 */
function settleDecimalMarks(state: ParseState): {
  marks: Map<number, DecimalMark | null>;
  ambiguous: string[];
  fileMark: DecimalMark | null;
} {
  let comma = 0;
  let point = 0;
  for (const evidence of state.decimalEvidence.values()) {
    comma += evidence.comma;
    point += evidence.point;
  }
  const fileMark: DecimalMark | null = comma > 0 && point === 0 ? "," : point > 0 && comma === 0 ? "." : null;
  const marks = new Map<number, DecimalMark | null>();
  const ambiguous: string[] = [];
  for (const [index, evidence] of state.decimalEvidence) {
    if (evidence.firstEither === null) continue;
    let mark: DecimalMark | null = null;
    if (evidence.comma > 0 && evidence.point === 0) mark = ",";
    else if (evidence.point > 0 && evidence.comma === 0) mark = ".";
    else if (evidence.comma === 0 && evidence.point === 0) mark = fileMark;
    marks.set(index, mark);
    if (mark !== null) continue;
    const { line, value } = evidence.firstEither;
    const number = massNumberText(value) ?? value;
    const at = Math.max(number.indexOf(","), number.indexOf("."));
    const asFraction = parseDecimalNumber(number, number[at] === "," ? "," : ".");
    const asThousands = parseDecimalNumber(number, number[at] === "," ? "." : ",");
    ambiguous.push(evidence.column.header);
    cellIssue(
      state.issues,
      line,
      evidence.column,
      "ambiguous_decimal_mark",
      value,
      "error",
      `numbers such as "${shorten(value)}" read as ${asFraction} with "${number[at]}" as the decimal mark, or as ${asThousands} with "${number[at]}" grouping thousands, and ${evidence.comma > 0 && evidence.point > 0 ? "the column uses both marks" : "no number in the file settles which"}. Choose the decimal mark of this column in the mapping step, and read the file again.`,
    );
  }
  return { marks, ambiguous, fileMark };
}

const massFields = [
  { bit: pendingBits.wet, grams: "wetBlockGrams", written: "wetBlockAsWritten" },
  { bit: pendingBits.fresh, grams: "freshGrams", written: "freshAsWritten" },
  { bit: pendingBits.dry, grams: "dryGrams", written: "dryAsWritten" },
  { bit: pendingBits.spent, grams: "spentGrams", written: "spentAsWritten" },
] as const;

function massColumn(state: ParseState, record: SeasonRecord, bit: number): ColumnPlan {
  const { layout } = state;
  if (bit === pendingBits.wet) return layout.columns.block_wet_weight;
  if (bit === pendingBits.dry) return layout.columns.dry_weight;
  if (bit === pendingBits.spent) return layout.columns.spent_weight;
  return flushWeightColumn(layout, record.flush, "fresh_weight");
}

/** Reads the masses that waited for their column's decimal mark, and compares a block's settled masses. */
function settleMasses(state: ParseState, marks: ReadonlyMap<number, DecimalMark | null>): void {
  const { records, pending } = state;
  const readings = new Map<string, ReturnType<typeof readMass>>();
  for (let index = 0; index < records.length; index++) {
    const mask = index < pending.length ? pending[index] : 0;
    if ((mask & pendingMassBits) === 0) continue;
    const record = records[index];
    for (const field of massFields) {
      if ((mask & field.bit) === 0) continue;
      const written = record[field.written] as NonNullable<SeasonRecord["freshAsWritten"]>;
      const column = massColumn(state, record, field.bit);
      const mark = marks.get(column.index) ?? null;
      if (mark === null) {
        record[field.grams] = null;
        continue;
      }
      const key = `${column.index}\u0000${written.value}`;
      let reading = readings.get(key);
      if (reading === undefined) {
        reading = readMass(written.value, { defaultUnit: column.unit, decimal: mark });
        readings.set(key, reading);
      }
      if ("error" in reading) {
        cellIssue(state.issues, record.line, column, reading.code, written.value, "error", reading.error);
        record[field.grams] = null;
        record[field.written] = null;
        continue;
      }
      record[field.grams] = reading.grams;
      record[field.written] = { value: written.value, unit: reading.unit };
      if (field.bit === pendingBits.fresh && record.flush !== null && record.blockCode !== "")
        (state.blocks.get(record.blockCode) as NonNullable<ReturnType<typeof state.blocks.get>>).freshGrams += reading.grams;
      const implausible = implausibleMass(massKindOfBit[field.bit], written.value, reading.grams);
      if (implausible !== null) cellIssue(state.issues, record.line, column, "mass_implausible", written.value, "error", implausible);
    }
    const block = record.blockCode === "" ? undefined : state.blocks.get(record.blockCode);
    if (block === undefined) continue;
    if (mask & pendingBits.wet) compareSettledMass(state, block, index, "wetBlockGrams");
    if (mask & pendingBits.spent) compareSettledMass(state, block, index, "spentGrams");
  }
}

// When the file's typical block is outside 5–400 % (harvest-checks.ts), a unit or decimal mark is read wrong.
/** Blocks with a biological efficiency needed before a column is judged as a whole. */
const fewestBlocksForColumnCheck = 3;

function median(values: number[]): number {
  // A typed array sorts numbers as numbers, without a comparison function: many times faster for the blocks of a large file.
  const sorted = Float64Array.from(values).sort();
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

/**
 * The fresh weights against the wet blocks, column as a whole: when the blocks' median
 * biological efficiency is far outside what blocks reach, the weights (or the wet block
 * weights) are read in the wrong unit or with the wrong decimal mark, and that is an error on
 * the column, not a warning. Returns false when it reported, so the per-block warnings are not repeated.
 */
function checkMassColumns(state: ParseState): boolean {
  const efficiencies: number[] = [];
  let example: SeasonRecord | null = null;
  for (const block of state.blocks.values()) {
    const efficiency = blockEfficiency(state, block);
    if (efficiency === null) continue;
    efficiencies.push(efficiency);
    if (example === null) {
      const source = block.source[slot.wetBlockGrams];
      example =
        state.records.find((record, index) => index >= source && record.blockCode === block.code && record.freshAsWritten !== null) ?? null;
    }
  }
  if (efficiencies.length < fewestBlocksForColumnCheck || example === null) return true;
  const typical = median(efficiencies);
  if (typical >= lowestColumnEfficiency && typical <= highestPossibleEfficiency) return true;
  const { layout } = state;
  const freshColumn = layout.format === "wide" ? (layout.wide[0]?.weight ?? absentColumn) : layout.columns.fresh_weight;
  const wetColumn = layout.columns.block_wet_weight;
  const fresh = example.freshAsWritten?.value ?? "";
  const wet = example.wetBlockAsWritten?.value ?? "";
  const read = `read as they are written (such as "${shorten(fresh)}" in column "${freshColumn.header}" on line ${example.line}, against a wet block of "${shorten(wet)}" in column "${wetColumn.header}"), the blocks' biological efficiency is ${Math.round(typical)} % (the median of ${efficiencies.length} blocks), far ${typical > highestPossibleEfficiency ? "above" : "below"} what blocks reach (about 50–150 %).`;
  const check = "check the units in the headers and cells, and the decimal mark in the mapping step.";
  // Either column can be the one read wrong: both are named, each on its own column.
  cellIssue(
    state.issues,
    layout.headerLine,
    freshColumn,
    "mass_column_implausible",
    fresh,
    "error",
    `${read} This column's weights or the wet block weights are read in the wrong unit or with the wrong decimal mark: ${check}`,
  );
  cellIssue(
    state.issues,
    layout.headerLine,
    wetColumn,
    "mass_column_implausible",
    wet,
    "error",
    `${read} These wet block weights or the fresh weights are read in the wrong unit or with the wrong decimal mark: ${check}`,
  );
  return false;
}

/**
 * The dry weights against the fresh weights, column as a whole (as `checkMassColumns` does for
 * efficiency): a typical dry-to-fresh ratio outside 1–100 % means one of the columns is read in
 * the wrong unit, even where no single row shows it.
 */
function checkDryColumn(state: ParseState): void {
  const ratios: number[] = [];
  let example: SeasonRecord | null = null;
  for (const record of state.records) {
    if (record.dryGrams === null || record.freshGrams === null || record.dryGrams === 0 || record.freshGrams === 0) continue;
    ratios.push(record.dryGrams / record.freshGrams);
    example ??= record;
  }
  if (ratios.length < fewestBlocksForColumnCheck || example === null) return;
  const typical = median(ratios);
  if (typical >= 0.01 && typical <= 1) return;
  const { layout } = state;
  const freshColumn = flushWeightColumn(layout, example.flush, "fresh_weight");
  const dry = example.dryAsWritten?.value ?? "";
  const fresh = example.freshAsWritten?.value ?? "";
  const what = `read as they are written (such as "${shorten(dry)}" dry against "${shorten(fresh)}" fresh on line ${example.line}), the dry weights are typically ${Math.round(typical * 1000) / 10} % of the fresh weights (the median of ${ratios.length} harvests); dried mushrooms keep about a tenth. One of the columns "${layout.columns.dry_weight.header}" and "${freshColumn.header}" is read in the wrong unit: check the units in the headers and cells.`;
  cellIssue(state.issues, layout.headerLine, layout.columns.dry_weight, "mass_column_implausible", dry, "error", what);
  cellIssue(state.issues, layout.headerLine, freshColumn, "mass_column_implausible", fresh, "error", what);
}

// Dried, a block's mushrooms weigh about a tenth of their fresh weight (common practice): a typical
// block's dry harvest outside 0.5–40 % of its dry substrate is the fresh range above, dried.
const lowestDryEfficiency = 0.5;
const highestDryEfficiency = 40;

/**
 * The dry weights against the wet blocks, column as a whole: catches a dry column read in the
 * wrong unit along with the fresh one (their ratio then looks right). `dryByBlock` holds each
 * block's dried harvest in grams.
 */
function checkDryEfficiency(state: ParseState, dryByBlock: ReadonlyMap<string, number>): void {
  const efficiencies: number[] = [];
  let example: BlockState | null = null;
  for (const [code, dry] of dryByBlock) {
    const block = state.blocks.get(code);
    const wetSource = block?.source[slot.wetBlockGrams] ?? -1;
    const moistureSource = block?.source[slot.moisture] ?? -1;
    if (block === undefined || wetSource === -1 || moistureSource === -1 || dry === 0) continue;
    const wet = state.records[wetSource].wetBlockGrams;
    const moisture = state.records[moistureSource].moisture;
    if (wet === null || moisture === null || drySubstrateGrams(wet, moisture) <= 0) continue;
    efficiencies.push((dry / drySubstrateGrams(wet, moisture)) * 100);
    example ??= block;
  }
  if (efficiencies.length < fewestBlocksForColumnCheck || example === null) return;
  const typical = median(efficiencies);
  if (typical >= lowestDryEfficiency && typical <= highestDryEfficiency) return;
  const { layout } = state;
  const dryColumn = layout.columns.dry_weight;
  const wetColumn = layout.columns.block_wet_weight;
  const first = example;
  const record = state.records.find((candidate) => candidate.blockCode === first.code && candidate.dryAsWritten !== null);
  const dry = record?.dryAsWritten?.value ?? "";
  const wet = state.records[first.source[slot.wetBlockGrams]].wetBlockAsWritten?.value ?? "";
  const what = `read as they are written (such as "${shorten(dry)}" against a wet block of "${shorten(wet)}"), the blocks' dried harvest is typically ${Math.round(typical * 10) / 10} % of their dry substrate (the median of ${efficiencies.length} blocks), where dried mushrooms come to about 5–15 %. The dry weights (and perhaps the fresh weights) or the wet block weights are read in the wrong unit: check the units in the headers and cells.`;
  cellIssue(state.issues, layout.headerLine, dryColumn, "mass_column_implausible", dry, "error", what);
  cellIssue(state.issues, layout.headerLine, wetColumn, "mass_column_implausible", wet, "error", what);
}

/**
 * Stage 6, the end of the file, where what needs every row is done: each column's decimal mark
 * and the file's date order are decided and the cells that waited are read; blank block
 * columns are filled from the block's other rows; dates in the future, harvests before
 * inoculation, flush gaps and implausible efficiency are checked. Returns what was decided.
 */
export function finishRecords(state: ParseState): {
  dateOrder: DateOrder | "ambiguous" | null;
  ambiguousDecimalColumns: string[];
  fileMark: DecimalMark | null;
} {
  const { records, layout } = state;
  const settled = settleDecimalMarks(state);
  settleMasses(state, settled.marks);
  const decided = decideDateOrder(state.dateEvidence, state.options.dateOrder, (text) => readingOf(state, text));
  if (decided.issue !== undefined) state.issues.push({ ...decided.issue, severity: "error" });
  const order = decided.order;
  const resolving: Reported = { line: 0, columns: new Set() };
  const future: Reported = { line: 0, columns: new Set() };
  // One object reused for every record's dates as written, rather than one per record.
  const written: WrittenDates = { inoculatedOn: null, harvestedOn: null, contaminatedOn: null };
  const dryByBlock = new Map<string, number>();
  for (let index = 0; index < records.length; index++) {
    const record = records[index];
    written.inoculatedOn = record.inoculatedOn;
    written.harvestedOn = record.harvestedOn;
    written.contaminatedOn = record.contaminatedOn;
    const mask = index < state.pending.length ? state.pending[index] : 0;
    if (mask & pendingBits.inoculated) resolveDate(state, resolving, order, record, "inoculatedOn", layout.columns.inoculated_on);
    if (mask & pendingBits.contaminatedOn) resolveDate(state, resolving, order, record, "contaminatedOn", layout.columns.contaminated_on);
    if (mask & pendingBits.harvested) resolveDate(state, resolving, order, record, "harvestedOn", harvestDateColumn(layout, record.flush));
    const block = record.blockCode === "" ? undefined : state.blocks.get(record.blockCode);
    if (block !== undefined) blockAtFinish(state, block, record, index, written);
    futureDates(state, future, record, written);
    if (block !== undefined) flushHeavierThanBlock(state, record);
    dryAgainstFresh(state, record);
    if (block !== undefined && record.dryGrams !== null) dryByBlock.set(block.code, (dryByBlock.get(block.code) ?? 0) + record.dryGrams);
  }
  const efficiencyChecked = checkMassColumns(state);
  checkDryColumn(state);
  checkDryEfficiency(state, dryByBlock);
  for (const [code, block] of state.blocks) blockTotals(state, code, block, efficiencyChecked);
  return { dateOrder: order, ambiguousDecimalColumns: settled.ambiguous, fileMark: settled.fileMark };
}

/** "4–19, 22 and 30" from runs of lines. */
function describeRuns(runs: readonly [number, number][]): string {
  const parts = runs.map(([first, last]) => (first === last ? String(first) : `${first}–${last}`));
  return parts.length === 1 ? parts[0] : `${parts.slice(0, -1).join(", ")} and ${parts[parts.length - 1]}`;
}

const linePrefix = /^Line \d+/;
/** Runs of lines named in one grouped issue; past this, the message says how many more. */
const mostRunsNamed = 12;

/**
 * The same problem on many rows ("nein" in a yes/no column on lines 4 to 19) becomes one issue:
 * same code, column, value and wording apart from the line. Issues must be sorted by line.
 */
export function groupRepeatedIssues(issues: readonly SeasonLogIssue[]): SeasonLogIssue[] {
  const grouped: SeasonLogIssue[] = [];
  const byKey = new Map<string, { issue: SeasonLogIssue; rest: string; runs: [number, number][]; count: number }>();
  for (const issue of issues) {
    const prefix = linePrefix.exec(issue.message);
    if (prefix === null) {
      grouped.push(issue);
      continue;
    }
    const rest = issue.message.slice(prefix[0].length);
    const key = `${issue.code}\u0000${issue.severity}\u0000${issue.column ?? ""}\u0000${issue.value ?? ""}\u0000${rest}`;
    const known = byKey.get(key);
    if (known === undefined) {
      const entry = { issue: { ...issue }, rest, runs: [[issue.line, issue.line]] as [number, number][], count: 1 };
      byKey.set(key, entry);
      grouped.push(entry.issue);
      continue;
    }
    const last = known.runs[known.runs.length - 1];
    if (issue.line === last[1]) continue;
    if (issue.line === last[1] + 1) last[1] = issue.line;
    else known.runs.push([issue.line, issue.line]);
    known.count++;
  }
  for (const { issue, rest, runs, count } of byKey.values()) {
    if (count === 1) continue;
    issue.count = count;
    issue.lineRanges = runs;
    const named =
      runs.length > mostRunsNamed
        ? `${describeRuns(runs.slice(0, mostRunsNamed))} and ${runs.length - mostRunsNamed} more runs`
        : describeRuns(runs);
    issue.message = `Lines ${named} (${count} rows)${rest}`;
  }
  return grouped;
}
