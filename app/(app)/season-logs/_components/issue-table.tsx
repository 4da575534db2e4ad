"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import type { SeasonLogIssue } from "@/lib/import";

const columns: ColumnDef<SeasonLogIssue, unknown>[] = [
  { accessorKey: "line", header: "Line" },
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
  { accessorKey: "message", header: "Message" },
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
