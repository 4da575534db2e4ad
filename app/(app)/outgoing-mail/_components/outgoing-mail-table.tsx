"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { useMemo } from "react";
import { DataTable } from "@/components/ui/data-table";
import { formatDateTime, type TimeDisplay } from "@/lib/time/display";

export interface OutgoingMailRow {
  queuedAt: string;
  recipient: string;
  kind: string;
  subject: string;
  outcome: string;
  attempts: number;
  lastAttemptAt: string;
  problem: string;
}

// Cells in the reader's zone; the CSV keeps the stored ISO 8601 instants, for machines.
const columnsFor = (display: TimeDisplay): ColumnDef<OutgoingMailRow, unknown>[] => [
  { accessorKey: "queuedAt", header: "Queued", cell: ({ getValue }) => formatDateTime(String(getValue()), display) },
  { accessorKey: "recipient", header: "To" },
  { accessorKey: "kind", header: "Kind" },
  { accessorKey: "subject", header: "Subject" },
  { accessorKey: "outcome", header: "Outcome" },
  { accessorKey: "attempts", header: "Attempts" },
  {
    accessorKey: "lastAttemptAt",
    header: "Last attempt",
    cell: ({ getValue }) => (getValue() ? formatDateTime(String(getValue()), display) : ""),
  },
  { accessorKey: "problem", header: "Problem" },
];

/** The record of what went out, one row per message: filter, sort, download as CSV. */
export function OutgoingMailTable({ rows, display }: { rows: OutgoingMailRow[]; display: TimeDisplay }) {
  const columns = useMemo(() => columnsFor(display), [display]);
  return (
    <DataTable
      caption="Outgoing mail"
      columns={columns}
      rows={rows}
      csvFileName="outgoing-mail.csv"
      pageSize={50}
      emptyMessage="No mail has been sent yet. Inviting someone sends the first."
    />
  );
}
