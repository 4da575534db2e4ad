"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { DataTable } from "@/components/ui/data-table";
import type { UploadSummary } from "@/lib/data/season-logs";

const outcomeWords: Record<UploadSummary["outcome"], string> = {
  received: "Checked, not committed",
  rejected: "Has errors, not committed",
  committed: "Committed",
  already_imported: "Same file as an earlier one",
};

const columns: ColumnDef<UploadSummary, unknown>[] = [
  { accessorFn: (upload) => upload.uploadedAt.slice(0, 16).replace("T", " "), id: "uploadedAt", header: "Sent (UTC)" },
  { accessorKey: "fileName", header: "File" },
  { accessorKey: "rowCount", header: "Rows" },
  {
    accessorFn: (upload) => (upload.undoneAt ? `Committed, undone ${upload.undoneAt.slice(0, 10)}` : outcomeWords[upload.outcome]),
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

export function UploadHistory({ uploads }: { uploads: UploadSummary[] }) {
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
