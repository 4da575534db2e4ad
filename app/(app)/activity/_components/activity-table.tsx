"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { useMemo } from "react";
import type { AuditRow } from "@/lib/data/audit";
import { formatDateTime, type TimeDisplay } from "@/lib/time/display";

// The cell is written in the reader's zone; the CSV keeps the stored ISO 8601 instant, for machines.
const columnsFor = (display: TimeDisplay): ColumnDef<AuditRow, unknown>[] => [
  { accessorKey: "occurredAt", header: "When", cell: ({ getValue }) => formatDateTime(String(getValue()), display) },
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
export function ActivityTable(props: { rows: AuditRow[]; caption: string; csvFileName: string; display: TimeDisplay }) {
  const { rows, caption, csvFileName, display } = props;
  const columns = useMemo(() => columnsFor(display), [display]);
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
