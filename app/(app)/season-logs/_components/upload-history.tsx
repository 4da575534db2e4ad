"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { DataTable } from "@/components/ui/data-table";
import { useMemo } from "react";
import type { UploadSummary } from "@/lib/data/season-logs";
import { formatDateTime, formatDay, type TimeDisplay } from "@/lib/time/display";

const outcomeWords: Record<UploadSummary["outcome"], string> = {
  received: "Checked, not committed",
  rejected: "Has errors, not committed",
  committed: "Committed",
  already_imported: "Same file as an earlier one",
};

// The stored instant sorts; the cell writes it in the member's zone and date style.
const columnsFor = (display: TimeDisplay): ColumnDef<UploadSummary, unknown>[] => [
  { accessorKey: "uploadedAt", header: "Sent", cell: ({ getValue }) => formatDateTime(String(getValue()), display) },
  { accessorKey: "fileName", header: "File" },
  { accessorKey: "rowCount", header: "Rows" },
  {
    accessorFn: (upload) => (upload.undoneAt ? `Committed, undone ${formatDay(upload.undoneAt, display)}` : outcomeWords[upload.outcome]),
    id: "outcome",
    header: "Outcome",
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

export function UploadHistory({ uploads, display }: { uploads: UploadSummary[]; display: TimeDisplay }) {
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
