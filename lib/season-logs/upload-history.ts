/**
 * One row per upload in the farm's list of past uploads, with what its checks found folded into
 * it: however often the file was checked again, the row says the last check, what it would change
 * or changed, and whether the commit stands.
 */
import type { AuditDetail } from "@/lib/audit/sentences";
import { count, listInWords } from "@/lib/words";
import type { UploadOutcome } from "./outcomes";
import type { PlanCounts } from "./plan";

export type { UploadOutcome } from "./outcomes";

export interface UploadCheck {
  rowCount: number;
  errorCount: number;
  warningCount: number;
  /** What committing the file changes, as the last check planned it; null in reports without a preview. */
  counts: PlanCounts | null;
  /** The first few problems, by line, as the check worded them. */
  firstIssues: { line: number; severity: "error" | "warning"; message: string }[];
}

export interface UploadHistoryFacts {
  outcome: UploadOutcome;
  committedAt: string | null;
  undoneAt: string | null;
  undoneBy: string;
  check: UploadCheck;
}

const outcomeWords: Record<UploadOutcome, string> = {
  received: "Checked, not committed",
  rejected: "Has errors, not committed",
  committed: "Committed",
  already_imported: "Same file as an earlier one",
};

const when = (iso: string) => `${iso.slice(0, 16).replace("T", " ")} UTC`;

export function uploadOutcomeWords(upload: Pick<UploadHistoryFacts, "outcome" | "undoneAt">): string {
  return upload.undoneAt ? `Committed, undone ${upload.undoneAt.slice(0, 10)}` : outcomeWords[upload.outcome];
}

/** "40 new blocks and 3 changed harvests", or null when the file changes nothing. */
export function changesInWords(counts: PlanCounts): string | null {
  const parts = [
    count(counts.newBlocks, "new block"),
    count(counts.changedBlocks, "changed block"),
    count(counts.newHarvests, "new harvest"),
    count(counts.changedHarvests, "changed harvest"),
  ].filter((part) => !part.startsWith("0 "));
  return parts.length ? listInWords(parts) : null;
}

/** The particulars folded into an upload's row. */
export function uploadHistoryDetails(upload: UploadHistoryFacts): AuditDetail[] {
  const { check } = upload;
  const details: AuditDetail[] = [
    {
      label: "Last check",
      value: listInWords([count(check.rowCount, "row"), count(check.errorCount, "error"), count(check.warningCount, "warning")]),
    },
  ];
  for (const issue of check.firstIssues) details.push({ label: issue.severity === "error" ? "Error" : "Warning", value: issue.message });
  const more = check.errorCount + check.warningCount - check.firstIssues.length;
  if (check.firstIssues.length > 0 && more > 0)
    details.push({ label: "Not listed here", value: `${count(more, "more problem")}; check the file again to see them all` });
  if (check.counts && check.errorCount === 0 && upload.outcome !== "already_imported") {
    details.push({
      label: upload.outcome === "committed" ? "The commit changed" : "Committing it would change",
      value: changesInWords(check.counts) ?? "nothing",
    });
  }
  if (upload.committedAt) details.push({ label: "Committed", value: when(upload.committedAt) });
  if (upload.undoneAt)
    details.push({ label: "Undone", value: upload.undoneBy ? `${when(upload.undoneAt)} by ${upload.undoneBy}` : when(upload.undoneAt) });
  return details;
}
