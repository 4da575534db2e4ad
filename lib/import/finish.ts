import { blockAtFinish, blockTotals, flushHeavierThanBlock } from "./blocks";
import { type DateOrder, type DateReading, describeOrder, readDate, wrongOrderMessage } from "./dates";
import { cellIssue, report, shorten } from "./issues";
import { harvestDateColumn, type RowAboveHeader } from "./layout";
import { type DateEvidence, type ParseState, pendingBits } from "./state";
import type { ColumnPlan, SeasonLogIssue, SeasonRecord } from "./types";

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
  const reading = state.caches.dates.get(text) ?? readDate(text);
  if (reading.kind === "either") {
    record[field] = order === "dmy" || order === "mdy" ? reading[order] : null;
    return;
  }
  if (reading.kind !== "dmy-only" && reading.kind !== "mdy-only") return;
  const only = reading.kind === "dmy-only" ? "dmy" : "mdy";
  if ((order === "dmy" || order === "mdy") && only !== order) {
    if (firstReport(reported, record.line, column))
      cellIssue(state.issues, record.line, column, "date_wrong_order", text, "error", wrongOrderMessage(text, order));
    record[field] = null;
    return;
  }
  record[field] = reading.iso;
}

function futureDate(state: ParseState, reported: Reported, record: SeasonRecord, date: string, column: ColumnPlan, words: string): void {
  if (column.index === -1 || !firstReport(reported, record.line, column)) return;
  cellIssue(
    state.issues,
    record.line,
    column,
    "date_in_future",
    date,
    "warning",
    `the ${words} ${date} is in the future (today is ${state.today}). Check the date; with day-first and month-first dates, also check the date order.`,
  );
}

function futureDates(state: ParseState, reported: Reported, record: SeasonRecord): void {
  const { today, layout } = state;
  if (record.harvestedOn !== null && record.harvestedOn > today)
    futureDate(state, reported, record, record.harvestedOn, harvestDateColumn(layout, record.flush), "harvest date");
  if (record.inoculatedOn !== null && record.inoculatedOn > today)
    futureDate(state, reported, record, record.inoculatedOn, layout.columns.inoculated_on, "inoculation date");
  if (record.contaminatedOn !== null && record.contaminatedOn > today)
    futureDate(state, reported, record, record.contaminatedOn, layout.columns.contaminated_on, "contamination date");
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
 * Stage 6, the end of the file, where what needs every row is done: the date order is decided
 * and the waiting dates resolved; blank block columns are filled from the block's other rows;
 * dates in the future, harvests before inoculation, flush gaps and implausible efficiency are
 * checked; the issues are sorted by line. Returns the date order decided.
 */
export function finishRecords(state: ParseState): DateOrder | "ambiguous" | null {
  const { records, layout } = state;
  const decided = decideDateOrder(state.dateEvidence, state.options.dateOrder, (text) => state.caches.dates.get(text) ?? readDate(text));
  if (decided.issue !== undefined) state.issues.push({ ...decided.issue, severity: "error" });
  const order = decided.order;
  const reported: Reported = { line: 0, columns: new Set() };
  for (let index = 0; index < records.length; index++) {
    const record = records[index];
    const mask = index < state.pendingDates.length ? state.pendingDates[index] : 0;
    if (mask !== 0) {
      if (mask & pendingBits.inoculated) resolveDate(state, reported, order, record, "inoculatedOn", layout.columns.inoculated_on);
      if (mask & pendingBits.contaminatedOn) resolveDate(state, reported, order, record, "contaminatedOn", layout.columns.contaminated_on);
      if (mask & pendingBits.harvested) resolveDate(state, reported, order, record, "harvestedOn", harvestDateColumn(layout, record.flush));
    }
  }
  reported.line = 0;
  for (let index = 0; index < records.length; index++) {
    const record = records[index];
    const block = record.blockCode === "" ? undefined : state.blocks.get(record.blockCode);
    if (block !== undefined) blockAtFinish(state, block, record, index);
    futureDates(state, reported, record);
    if (block !== undefined) flushHeavierThanBlock(state, record);
  }
  for (const [code, block] of state.blocks) blockTotals(state, code, block);
  return order;
}
