"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { DataTable } from "@/components/ui/data-table";
import { FoldedDetails } from "@/components/ui/folded-details";
import type { AuditRow } from "@/lib/data/audit";
import { formatDateTime, type TimeDisplay } from "@/lib/time/display";

/** The particulars of a row, folded: the same words the filter searches and the CSV holds. */
function detailsOf(row: AuditRow, display: TimeDisplay): { label: string; value: string }[] {
  const repeated =
    row.times > 1
      ? [
          {
            label: "Happened",
            value: `${row.times} times in a row, from ${formatDateTime(row.firstOccurredAt, display)} to ${formatDateTime(row.occurredAt, display)}`,
          },
        ]
      : [];
  return [...repeated, ...row.details];
}

// The cell is written in the reader's zone; the CSV keeps the stored ISO 8601 instant, for machines.
const columnsFor = (display: TimeDisplay): ColumnDef<AuditRow, unknown>[] => [
  { accessorKey: "occurredAt", header: "When", cell: ({ getValue }) => formatDateTime(String(getValue()), display) },
  { accessorKey: "who", header: "Who" },
  {
    accessorFn: (row) => row.sentence,
    id: "what",
    header: "What happened",
    cell: ({ row }) => {
      const { sentence, link } = row.original;
      return (
        <div className="min-w-64 space-y-1">
          <p>{sentence}</p>
          {link ? (
            link.href.startsWith("/api/") ? (
              <a href={link.href} className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline">
                {link.label}
              </a>
            ) : (
              <Link href={link.href} className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline">
                {link.label}
              </Link>
            )
          ) : null}
        </div>
      );
    },
  },
  {
    accessorFn: (row) =>
      detailsOf(row, display)
        .map((detail) => `${detail.label}: ${detail.value}`)
        .join("; "),
    id: "details",
    header: "Details",
    enableSorting: false,
    cell: ({ row }) => {
      const details = detailsOf(row.original, display);
      if (details.length === 0) return null;
      return (
        <FoldedDetails
          summary={`${details.length === 1 ? "1 detail" : `${details.length} details`}${row.original.times > 1 ? ` (${row.original.times} times)` : ""}`}
          details={details}
        />
      );
    },
  },
];

/** The activity log: who did what, in words; filter by any word, sort, hide columns, download what is shown as CSV. */
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
