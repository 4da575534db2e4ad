"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import type { SeasonLogIssue } from "@/lib/import";

/** "4–19, 22": the runs of lines a grouped problem covers. */
function linesOf(issue: SeasonLogIssue): string {
  if (!issue.lineRanges) return String(issue.line);
  return issue.lineRanges.map(([first, last]) => (first === last ? String(first) : `${first}–${last}`)).join(", ");
}

const columns: ColumnDef<SeasonLogIssue, unknown>[] = [
  { accessorKey: "line", header: "Line", cell: ({ row }) => linesOf(row.original) },
  {
    accessorKey: "severity",
    header: "Severity",
    cell: ({ getValue }) =>
      getValue() === "error" ? (
        <span className="font-semibold text-danger-ink">Error</span>
      ) : (
        <span className="font-semibold text-caution-ink">Warning</span>
      ),
  },
  { accessorFn: (issue) => issue.column ?? "", id: "column", header: "Column" },
  { accessorFn: (issue) => issue.value ?? "", id: "value", header: "Value" },
  {
    accessorKey: "message",
    header: "Message",
    // The code is what tests and the page's own logic match on; the wording may change.
    cell: ({ row }) => <span data-issue-code={row.original.code}>{row.original.message}</span>,
  },
];

/** Errors and warnings by line, column and value. */
export function IssueTable({ issues }: { issues: SeasonLogIssue[] }) {
  return (
    <DataTable
      caption="Problems found in the file"
      columns={columns}
      rows={issues}
      emptyMessage="No errors and no warnings: every row reads cleanly."
      pageSize={20}
    />
  );
}
