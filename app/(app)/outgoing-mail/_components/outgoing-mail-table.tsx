"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";

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

const when = (value: unknown) => String(value).replace("T", " ").slice(0, 16);

const columns: ColumnDef<OutgoingMailRow, unknown>[] = [
  { accessorKey: "queuedAt", header: "Queued (UTC)", cell: ({ getValue }) => when(getValue()) },
  { accessorKey: "recipient", header: "To" },
  { accessorKey: "kind", header: "Kind" },
  { accessorKey: "subject", header: "Subject" },
  { accessorKey: "outcome", header: "Outcome" },
  { accessorKey: "attempts", header: "Attempts" },
  { accessorKey: "lastAttemptAt", header: "Last attempt (UTC)", cell: ({ getValue }) => (getValue() ? when(getValue()) : "") },
  { accessorKey: "problem", header: "Problem" },
];

/** The record of what went out, one row per message: filter, sort, download as CSV. */
export function OutgoingMailTable({ rows }: { rows: OutgoingMailRow[] }) {
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
