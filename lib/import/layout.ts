import type { MassUnit } from "../units";
import { mapHeaders, withoutBadTargets } from "./headers";
import { report, shorten } from "./issues";
import { type SeasonLogColumnName, seasonLogColumnNames } from "./schema";
import { type ColumnPlan, type Layout, type SeasonLogIssue, type WideFlush, absentColumn } from "./types";

/** Rows above the header (a title, the farm's name) that are skipped before giving up on finding one. */
export const mostRowsAboveHeader = 9;

export interface RowAboveHeader {
  line: number;
  text: string;
}

export type HeaderOutcome =
  /** The row names no season-log column: a title row, look at the next one. */
  { kind: "title"; row: RowAboveHeader } | { kind: "header"; layout: Layout; issues: SeasonLogIssue[] };

function columnsFrom(plan: ReadonlyMap<SeasonLogColumnName, ColumnPlan>): Record<SeasonLogColumnName, ColumnPlan> {
  const columns = {} as Record<SeasonLogColumnName, ColumnPlan>;
  for (const name of seasonLogColumnNames) columns[name] = plan.get(name) ?? absentColumn;
  return columns;
}

/**
 * Stage 3, the header: the first row that names any schema column. Maps its cells to schema
 * columns (the grower's mapping first, see `mapHeaders`), decides long or wide form and
 * reports what makes the header unusable.
 */
export function readHeaderRow(
  cells: readonly string[],
  line: number,
  rowsAboveHeader: readonly RowAboveHeader[],
  options: { mapping?: Record<string, string>; defaultMassUnit?: MassUnit },
): HeaderOutcome {
  const issues: SeasonLogIssue[] = [];
  let width = cells.length;
  while (width > 0 && cells[width - 1].trim() === "") width--;
  const headers = cells.slice(0, width).map((cell) => cell.trim());
  const { badTargets, ...mapping } = mapHeaders(headers, options.mapping);
  const matchesNothing = mapping.columns.every((column) => column.target === null || column.target === "ignore");
  // Sheets often carry a title or a farm name above the header: look a few rows further down.
  if (matchesNothing && rowsAboveHeader.length < mostRowsAboveHeader) return { kind: "title", row: { line, text: headers.join(" ") } };
  const plan = new Map<SeasonLogColumnName, ColumnPlan>();
  const layout: Layout = {
    headerLine: line,
    headerWidth: width,
    mapping,
    format: "long",
    readRows: true,
    columns: columnsFrom(plan),
    wide: [],
  };
  if (matchesNothing) {
    const first = rowsAboveHeader[0];
    Object.assign(layout, { headerLine: first.line, headerWidth: 0, mapping: withoutBadTargets(mapHeaders([])), readRows: false });
    report(
      issues,
      first.line,
      "header_not_found",
      "error",
      `Line ${first.line} should name the columns, but none of the first ${mostRowsAboveHeader + 1} rows names a season-log column (the first starts "${shorten(first.text)}"). Put the column names in the first row (block_id, strain, flush, fresh_weight …; download the template to see them), or choose the columns in the mapping step.`,
    );
    return { kind: "header", layout, issues };
  }
  if (rowsAboveHeader.length > 0) {
    const lines = rowsAboveHeader.map((row) => row.line).join(", ");
    report(
      issues,
      rowsAboveHeader[0].line,
      "rows_above_header",
      "warning",
      `Line${rowsAboveHeader.length > 1 ? "s" : ""} ${lines} above the header on line ${line} name no season-log columns and were skipped (the first says "${shorten(rowsAboveHeader[0].text)}"). If they hold data, move the header to the top.`,
    );
  }
  for (const target of badTargets) {
    report(
      issues,
      line,
      "unknown_mapping_target",
      "error",
      `The column mapping names "${shorten(target)}", which is not a column of the season-log schema. Choose one of the schema's columns (such as block_id or fresh_weight), or "ignore".`,
    );
  }
  const wideByFlush = new Map<number, WideFlush>();
  const dateColumns = new Map<number, ColumnPlan>();
  for (const column of mapping.columns) {
    if (column.target === null || column.target === "ignore") continue;
    const columnPlan: ColumnPlan = { index: column.position - 1, header: column.header, unit: column.unit ?? options.defaultMassUnit };
    const flush = /^flush_(\d+)(_date)?$/.exec(column.target);
    if (flush === null) plan.set(column.target as SeasonLogColumnName, columnPlan);
    else if (flush[2] === undefined) wideByFlush.set(Number(flush[1]), { flush: Number(flush[1]), weight: columnPlan, date: null });
    else dateColumns.set(Number(flush[1]), columnPlan);
  }
  for (const [flush, date] of dateColumns) {
    const weight = wideByFlush.get(flush);
    if (weight === undefined)
      report(
        issues,
        line,
        "flush_date_without_weight",
        "warning",
        `Line ${line}, column "${date.header}": a harvest-date column for flush ${flush}, but no weight column for that flush, so its dates are ignored. Add a "Flush ${flush}" weight column, or map this column to "ignore".`,
        date.header,
      );
    else weight.date = date;
  }
  const wide = [...wideByFlush.values()].sort((a, b) => a.flush - b.flush);
  layout.wide = wide;
  for (const missing of mapping.missingRequired) {
    layout.readRows = false;
    const words = missing === "block_id" ? "the block code" : "the strain";
    report(
      issues,
      line,
      "required_column_missing",
      "error",
      `No column holds ${words}. Name a column "${missing}" (or ${missing === "block_id" ? '"Block"' : '"Strain"'}) in the header on line ${line}, or choose the column in the mapping step.`,
    );
  }
  if (wide.length > 0) {
    layout.format = "wide";
    const longColumns = (["flush", "fresh_weight", "harvested_on"] as const).filter((name) => plan.has(name));
    if (longColumns.length > 0) {
      layout.readRows = false;
      report(
        issues,
        line,
        "long_and_wide_mixed",
        "error",
        `The header on line ${line} has both one column per flush (such as "${wide[0].weight.header}") and the column "${plan.get(longColumns[0])?.header}". Use one layout: either one row per harvest with flush and fresh_weight, or one column per flush. Map the extra columns to "ignore" if they are not needed.`,
      );
    }
    const dry = plan.get("dry_weight");
    if (dry !== undefined) {
      report(
        issues,
        line,
        "dry_weight_in_wide_form",
        "warning",
        `Line ${line}, column "${dry.header}": with one column per flush, a single dry weight cannot be given to a flush, so the column is ignored. Upload dry weights as one row per harvest.`,
        dry.header,
      );
      plan.delete("dry_weight");
    }
    if (wide.every((flush) => flush.date === null)) {
      report(
        issues,
        line,
        "wide_form_without_dates",
        "warning",
        `The file has one column per flush and no harvest dates, so its flushes are stored without dates. If you have the dates, add a column per flush such as "Flush 1 date".`,
      );
    }
  } else if (plan.has("flush") !== plan.has("fresh_weight")) {
    layout.readRows = false;
    const has = plan.has("flush") ? "flush" : "fresh_weight";
    const lacks = has === "flush" ? "fresh_weight" : "flush";
    report(
      issues,
      line,
      "harvest_column_missing",
      "error",
      `The header on line ${line} has a "${has}" column but no "${lacks}" column, and a harvest needs both. Add the "${lacks}" column, or choose it in the mapping step.`,
    );
  }
  if (mapping.unmatched.length > 0) {
    const listed = mapping.unmatched
      .slice(0, 10)
      .map((header) => `"${shorten(header)}"`)
      .join(", ");
    const more = mapping.unmatched.length > 10 ? ` and ${mapping.unmatched.length - 10} more` : "";
    report(
      issues,
      line,
      "unmatched_columns",
      "warning",
      `Line ${line}: the columns ${listed}${more} match no season-log column, so their values are not imported. If one of them holds a schema column, choose it in the mapping step.`,
    );
  }
  layout.columns = columnsFrom(plan);
  return { kind: "header", layout, issues };
}

/** The weight column of a wide-form flush, or the long form's column. */
export function flushWeightColumn(layout: Layout, flush: number | null, long: SeasonLogColumnName): ColumnPlan {
  if (layout.format === "long") return layout.columns[long];
  return layout.wide.find((wide) => wide.flush === flush)?.weight ?? absentColumn;
}

/** The harvest-date column of a record's flush. */
export function harvestDateColumn(layout: Layout, flush: number | null): ColumnPlan {
  if (layout.format === "long") return layout.columns.harvested_on;
  return layout.wide.find((wide) => wide.flush === flush)?.date ?? absentColumn;
}
