import type { ColumnPlan, SeasonLogIssue } from "./types";

/**
 * Every problem the importer reports has one of these codes. Codes are stable: the upload
 * page, the report download and the tests match on them, never on a message's wording, so a
 * message can be reworded freely. Add a code at the end of its group and say in DEVELOPERS.md
 * what it means.
 */
export const issueCodes = [
  // The file as a whole
  "binary_file",
  "empty_file",
  "spreadsheet_unreadable",
  "spreadsheet_too_large",
  "sheet_choice_needed",
  "unclosed_quote",
  // The header
  "header_not_found",
  "rows_above_header",
  "unknown_mapping_target",
  "required_column_missing",
  "harvest_column_missing",
  "long_and_wide_mixed",
  "flush_date_without_weight",
  "dry_weight_in_wide_form",
  "wide_form_without_dates",
  "unmatched_columns",
  "no_rows",
  // One cell
  "cell_too_long",
  "value_beyond_header",
  "block_code_missing",
  "strain_missing",
  "unknown_strain",
  "mass_blank",
  "mass_unreadable",
  "number_unreadable",
  "mass_negative",
  "mass_without_unit",
  "mass_implausible",
  "unit_unknown",
  "troy_ounce",
  "ambiguous_decimal_mark",
  "moisture_unreadable",
  "moisture_out_of_range",
  "not_yes_or_no",
  "date_unreadable",
  "date_not_in_calendar",
  "date_serial_out_of_range",
  "date_wrong_order",
  "ambiguous_date_order",
  "mixed_date_orders",
  "flush_missing",
  "flush_unreadable",
  "season_unreadable",
  "fresh_weight_missing",
  "harvest_cell_without_harvest",
  // A block across its rows
  "block_details_disagree",
  "contamination_disagrees",
  "duplicate_flush",
  "harvest_before_inoculation",
  "date_in_future",
  "contamination_date_not_contaminated",
  "flush_heavier_than_block",
  "dry_weight_implausible",
  "flush_gap",
  "efficiency_implausible",
  "mass_column_implausible",
  // One harvest on the quick form, against what is stored of its block (lib/season-logs/quick-harvest.ts)
  "harvest_on_contaminated_block",
  "flush_weighs_nothing",
  // Against the co-op's registers and what the farm has stored (lib/season-logs/plan.ts)
  "unknown_substrate",
  "unknown_fruiting_method",
  // Against the farm's own rooms (lib/import/cells.ts readRoomCell)
  "unknown_fruiting_room",
  "fruiting_room_ambiguous",
  "fruiting_room_retired",
  "trial_strain_differs",
  "trial_fruiting_method_differs",
  "trial_differs",
  "trial_arm_differs",
  "trial_block_not_listed",
] as const;

export type IssueCode = (typeof issueCodes)[number];

const longestValueInReport = 200;

export function shorten(value: string): string {
  return value.length > longestValueInReport ? `${value.slice(0, longestValueInReport)}…` : value;
}

/** A problem of the file or the header, or one of a row that names no single column. */
export function report(
  issues: SeasonLogIssue[],
  line: number,
  code: IssueCode,
  severity: SeasonLogIssue["severity"],
  message: string,
  column?: string,
  value?: string,
): void {
  const issue: SeasonLogIssue = { line, code, severity, message };
  if (column !== undefined) issue.column = column;
  if (value !== undefined) issue.value = shorten(value);
  issues.push(issue);
}

/** A problem of one cell; `what` follows "Line n, column "header": ". */
export function cellIssue(
  issues: SeasonLogIssue[],
  line: number,
  column: ColumnPlan,
  code: IssueCode,
  value: string,
  severity: SeasonLogIssue["severity"],
  what: string,
): void {
  report(issues, line, code, severity, `Line ${line}, column "${column.header}": ${what}`, column.header, value);
}

/** A date as written, with the day it was read as when that looks different: "03/21/26" (2026-03-21). */
export function writtenDate(written: string, iso: string): string {
  return written === iso ? `"${iso}"` : `"${shorten(written)}" (${iso})`;
}
