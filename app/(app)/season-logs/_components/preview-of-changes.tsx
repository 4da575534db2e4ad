"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { Card } from "@/components/ui/card";
import { DataTable } from "@/components/ui/data-table";
import { seasonLogColumns } from "@/lib/import/schema";
import type { ValueChange } from "@/lib/season-logs/plan";
import type { UploadPreview } from "@/lib/season-logs/report";

const titles = new Map<string, string>(seasonLogColumns.map((column) => [column.name, column.title]));

const columns: ColumnDef<ValueChange, unknown>[] = [
  { accessorKey: "blockCode", header: "Block" },
  { accessorFn: (change) => change.flush ?? "", id: "flush", header: "Flush" },
  { accessorFn: (change) => titles.get(change.field) ?? change.field, id: "field", header: "Value" },
  { accessorFn: (change) => change.oldValue ?? "(blank)", id: "old", header: "Stored now" },
  { accessorFn: (change) => change.newValue ?? "(blank)", id: "new", header: "After commit" },
];

/** What a commit would do to the farm's stored blocks and harvests. */
export function PreviewOfChanges({ preview }: { preview: UploadPreview }) {
  const { counts } = preview;
  const figures = [
    { label: "New blocks", value: counts.newBlocks },
    { label: "Blocks changed", value: counts.changedBlocks },
    { label: "Blocks untouched", value: counts.untouchedBlocks },
    { label: "New harvests", value: counts.newHarvests },
    { label: "Harvests changed", value: counts.changedHarvests },
    { label: "Harvests untouched", value: counts.untouchedHarvests },
  ];
  return (
    <Card title="What committing would change">
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-3" data-testid="preview-counts">
        {figures.map((figure) => (
          <div key={figure.label} className="rounded-lg bg-oat-50 p-3">
            <dt className="text-xs text-ink-soft">{figure.label}</dt>
            <dd className="text-xl font-semibold text-moss-800">{figure.value}</dd>
          </div>
        ))}
      </dl>
      {preview.changes.length > 0 ? (
        <div className="mt-4">
          <h3 className="mb-2 font-semibold">Values that would be replaced (the old ones are kept in each block’s history)</h3>
          <DataTable caption="Values that would be replaced" columns={columns} rows={preview.changes} emptyMessage="" pageSize={10} />
        </div>
      ) : null}
      {preview.newBlockCodes.length > 0 ? (
        <p className="mt-4 text-sm text-ink-soft">
          New blocks: {preview.newBlockCodes.slice(0, 30).join(", ")}
          {counts.newBlocks > 30 ? ` and ${counts.newBlocks - 30} more` : ""}.
        </p>
      ) : null}
    </Card>
  );
}
