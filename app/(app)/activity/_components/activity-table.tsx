"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import type { AuditRow } from "@/lib/data/audit";

const columns: ColumnDef<AuditRow, unknown>[] = [
  { accessorKey: "occurredAt", header: "When (UTC)", cell: ({ getValue }) => String(getValue()).replace("T", " ").slice(0, 19) },
  { accessorKey: "actorLabel", header: "Who" },
  { accessorKey: "action", header: "What" },
  { accessorKey: "subject", header: "About" },
  {
    accessorKey: "details",
    header: "Details",
    cell: ({ getValue }) => <span className="break-all font-mono text-xs">{String(getValue())}</span>,
  },
  { accessorKey: "ip", header: "Network address" },
];

/** The activity log: filter by any word, sort, hide columns, download what is shown as CSV. */
export function ActivityTable({ rows, caption, csvFileName }: { rows: AuditRow[]; caption: string; csvFileName: string }) {
  return (
    <DataTable
      caption={caption}
      columns={columns}
      rows={rows}
      csvFileName={csvFileName}
      pageSize={50}
      emptyMessage="Nothing has been recorded yet."
    />
  );
}
