import { z } from "zod";
import type { SeasonLogDetected, SeasonLogIssue, SeasonLogOptions } from "../import";
import { toCsv } from "../csv";
import type { RegisterEntryText } from "../import/registers";
import type { BlockRoom, CommitPlan, PlanCounts, ValueChange } from "./plan";

/** The largest season log the upload accepts. */
export const largestUploadBytes = 50 * 1024 * 1024;
/**
 * The largest spreadsheet file (.xlsx, .ods). Compressed, a spreadsheet holds 10–20 times as
 * much: 20 MB is about 300 MB of sheet XML, read as a stream, and several times the rows a
 * 50 MB CSV holds.
 */
export const largestSpreadsheetBytes = 20 * 1024 * 1024;
/** Issues kept in a stored report; a file with more is broken throughout and the first ones say how. */
export const mostIssuesKept = 5000;
/** Changed values and new block codes shown in the preview; the counts cover all of them. */
export const mostPreviewItems = 500;

/** What the grower chose in the mapping step; every field optional (the parser detects the rest). */
export const parseChoicesSchema = z.object({
  mapping: z.record(z.string().max(500), z.string().max(100)).optional(),
  dateOrder: z.enum(["dmy", "mdy"]).optional(),
  defaultMassUnit: z.enum(["g", "kg", "lb", "oz"]).optional(),
  decimal: z.enum([".", ","]).optional(),
  /** Per column (by its header), the decimal mark the grower chose where the file's numbers read two ways. */
  decimalByColumn: z.record(z.string().max(500), z.enum([".", ","])).optional(),
  /** The sheet of a workbook that holds the season log. */
  sheet: z.string().max(300).optional(),
});
export type ParseChoices = z.infer<typeof parseChoicesSchema>;

export interface UploadPreview {
  counts: PlanCounts;
  changes: ValueChange[];
  newBlockCodes: string[];
  /**
   * What is stored but not in the file: harvests of the file's blocks, by where they came from
   * (the phone form or another file, the first few listed), and blocks the file leaves out.
   * Missing from reports stored before it existed.
   */
  notInFile?: { phoneForm: number; otherFiles: number; harvests: { blockCode: string; flush: number }[]; blocks: number };
  /** The fruiting room each block's rows name (the first few), and how many blocks name one. Missing from reports stored before the column. */
  rooms?: { blocks: BlockRoom[]; count: number };
}

/** What the review step shows and what is kept with the upload. */
export interface UploadReport {
  rowCount: number;
  errorCount: number;
  warningCount: number;
  /** The first `mostIssuesKept` issues, by line. */
  issues: SeasonLogIssue[];
  detected: SeasonLogDetected;
  preview: UploadPreview;
  choices: ParseChoices;
}

export function parserOptions(
  choices: ParseChoices,
  knownStrains: readonly (string | RegisterEntryText)[],
): SeasonLogOptions & { sheet?: string } {
  return { ...choices, knownStrains };
}

/** Joins the parser's issues with the planner's, by line, and counts them. */
export function buildReport(input: {
  rowCount: number;
  parserIssues: readonly SeasonLogIssue[];
  plan: CommitPlan;
  detected: SeasonLogDetected;
  choices: ParseChoices;
}): UploadReport {
  const issues = [...input.parserIssues, ...input.plan.issues].sort((a, b) => a.line - b.line);
  let errorCount = 0;
  for (const issue of issues) if (issue.severity === "error") errorCount++;
  return {
    rowCount: input.rowCount,
    errorCount,
    warningCount: issues.length - errorCount,
    issues: issues.slice(0, mostIssuesKept),
    detected: input.detected,
    preview: {
      counts: input.plan.counts,
      changes: input.plan.changes.slice(0, mostPreviewItems),
      newBlockCodes: input.plan.newBlockCodes.slice(0, mostPreviewItems),
      notInFile: {
        phoneForm: input.plan.notInFile.harvests.filter((harvest) => harvest.fromFile === false).length,
        otherFiles: input.plan.notInFile.harvests.filter((harvest) => harvest.fromFile !== false).length,
        harvests: input.plan.notInFile.harvests.slice(0, mostPreviewItems).map(({ blockCode, flush }) => ({ blockCode, flush })),
        blocks: input.plan.notInFile.blocks,
      },
      rooms: { blocks: input.plan.rooms.slice(0, mostPreviewItems), count: input.plan.rooms.length },
    },
    choices: input.choices,
  };
}

/** The report's issues as CSV (line, severity, column, value, message), safe to open in a spreadsheet. */
export function reportCsv(issues: readonly SeasonLogIssue[]): string {
  return toCsv(
    issues.map((issue) => ({
      line: issue.lineRanges
        ? issue.lineRanges.map(([first, last]) => (first === last ? first : `${first}-${last}`)).join(" ")
        : issue.line,
      code: issue.code,
      severity: issue.severity,
      column: issue.column ?? "",
      value: issue.value ?? "",
      message: issue.message,
    })),
    [
      { key: "line", header: "Line" },
      { key: "code", header: "Code" },
      { key: "severity", header: "Severity" },
      { key: "column", header: "Column" },
      { key: "value", header: "Value" },
      { key: "message", header: "Message" },
    ],
  );
}
