"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { DataTable } from "@/components/ui/data-table";
import type { AuditRow } from "@/lib/data/audit";

const when = (iso: string) => iso.replace("T", " ").slice(0, 16);

/** The particulars of a row, folded: the same words the filter searches and the CSV holds. */
function detailsOf(row: AuditRow): { label: string; value: string }[] {
  const repeated =
    row.times > 1
      ? [{ label: "Happened", value: `${row.times} times in a row, from ${when(row.firstOccurredAt)} to ${when(row.occurredAt)} UTC` }]
      : [];
  return [...repeated, ...row.details];
}

const columns: ColumnDef<AuditRow, unknown>[] = [
  { accessorFn: (row) => when(row.occurredAt), id: "when", header: "When (UTC)" },
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
      detailsOf(row)
        .map((detail) => `${detail.label}: ${detail.value}`)
        .join("; "),
    id: "details",
    header: "Details",
    enableSorting: false,
    cell: ({ row }) => {
      const details = detailsOf(row.original);
      if (details.length === 0) return null;
      return (
        <details>
          <summary className="min-h-11 cursor-pointer content-center font-semibold text-moss-700">
            {details.length === 1 ? "1 detail" : `${details.length} details`}
            {row.original.times > 1 ? ` (${row.original.times} times)` : ""}
          </summary>
          <dl className="mt-1 space-y-1">
            {details.map((detail, index) => (
              <div key={index}>
                <dt className="font-semibold">{detail.label}</dt>
                <dd className="break-words">{detail.value}</dd>
              </div>
            ))}
          </dl>
        </details>
      );
    },
  },
];

/** The activity log: who did what, in words; filter by any word, sort, hide columns, download what is shown as CSV. */
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
