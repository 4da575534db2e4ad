"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { DataTable } from "@/components/ui/data-table";
import { FoldedDetails } from "@/components/ui/folded-details";
import type { UploadHistoryRow } from "@/lib/data/season-logs";
import { formatDateTime, type TimeDisplay } from "@/lib/time/display";

// The stored instant sorts; the cell writes it in the member's zone and date style.
const columnsFor = (display: TimeDisplay): ColumnDef<UploadHistoryRow, unknown>[] => [
  { accessorKey: "uploadedAt", header: "Sent", cell: ({ getValue }) => formatDateTime(String(getValue()), display) },
  { accessorKey: "fileName", header: "File" },
  { accessorKey: "sentBy", header: "Sent by" },
  { accessorKey: "rowCount", header: "Rows" },
  { accessorKey: "outcomeWords", header: "Outcome" },
  {
    accessorFn: (upload) => upload.details.map((detail) => `${detail.label}: ${detail.value}`).join("; "),
    id: "checks",
    header: "Checks",
    enableSorting: false,
    cell: ({ row }) => (
      <FoldedDetails
        summary={
          <>
            What the check found<span className="sr-only"> in {row.original.fileName}</span>
          </>
        }
        details={row.original.details}
      />
    ),
  },
  {
    id: "download",
    header: "Original file",
    enableSorting: false,
    cell: ({ row }) => (
      <a
        className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline"
        href={`/api/season-logs/${row.original.id}/file`}
      >
        Download
      </a>
    ),
  },
  {
    id: "undo",
    header: "Undo",
    enableSorting: false,
    cell: ({ row }) =>
      row.original.outcome === "committed" && !row.original.undoneAt ? (
        <Link
          className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline"
          href={`/season-logs/${row.original.id}/undo`}
        >
          Undo this commit<span className="sr-only"> of {row.original.fileName}</span>
        </Link>
      ) : null,
  },
];

/** One row per upload, however often it was checked again: the checks are folded into its row. */
export function UploadHistory({ uploads, display }: { uploads: UploadHistoryRow[]; display: TimeDisplay }) {
  const columns = useMemo(() => columnsFor(display), [display]);
  return (
    <DataTable
      caption="Past uploads"
      columns={columns}
      rows={uploads}
      emptyMessage="Your farm has not uploaded a season log yet."
      pageSize={10}
    />
  );
}
