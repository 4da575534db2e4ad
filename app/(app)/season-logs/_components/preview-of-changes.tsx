"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { Card } from "@/components/ui/card";
import { DataTable } from "@/components/ui/data-table";
import { seasonLogColumns } from "@/lib/import/schema";
import type { BlockRoom, ValueChange } from "@/lib/season-logs/plan";
import type { UploadPreview } from "@/lib/season-logs/report";
import { agree, count } from "@/lib/words";

const titles = new Map<string, string>(seasonLogColumns.map((column) => [column.name, column.title]));

const columns: ColumnDef<ValueChange, unknown>[] = [
  { accessorKey: "blockCode", header: "Block" },
  { accessorFn: (change) => change.flush ?? "", id: "flush", header: "Flush" },
  { accessorFn: (change) => titles.get(change.field) ?? change.field, id: "field", header: "Value" },
  { accessorFn: (change) => change.oldValue ?? "(blank)", id: "old", header: "Stored now" },
  { accessorFn: (change) => change.newValue ?? "(blank)", id: "new", header: "After commit" },
];

const roomChangeWords: Record<BlockRoom["change"], string> = {
  new: "new block",
  added: "recorded for the block",
  changed: "replaces the room recorded (kept in its history)",
  same: "as recorded already",
};

const roomColumns: ColumnDef<BlockRoom, unknown>[] = [
  { accessorKey: "blockCode", header: "Block" },
  { accessorKey: "room", header: "Fruiting room" },
  { accessorFn: (room) => roomChangeWords[room.change], id: "change", header: "On commit" },
];

/** "8 harvests recorded with the phone form and 2 from other files are not in this file." */
function notInFileWords(phoneForm: number, otherFiles: number): string {
  const parts = [
    ...(phoneForm > 0 ? [`${count(phoneForm, "harvest")} recorded with the phone form`] : []),
    ...(otherFiles > 0 ? [`${phoneForm > 0 ? otherFiles : count(otherFiles, "harvest")} from other files`] : []),
  ];
  return `${parts.join(" and ")} ${agree(phoneForm + otherFiles, "is", "are")} not in this file.`;
}

/** What a commit would do to the farm's stored blocks and harvests, and what it would leave or remove that the file does not have. */
export function PreviewOfChanges({
  preview,
  removeNotInFile,
  onRemoveNotInFile,
}: {
  preview: UploadPreview;
  removeNotInFile: boolean;
  onRemoveNotInFile: (remove: boolean) => void;
}) {
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
      {preview.rooms && preview.rooms.count > 0 ? (
        <div className="mt-4" data-testid="preview-rooms">
          <h3 className="mb-2 font-semibold">
            Fruiting rooms named in the file ({count(preview.rooms.count, "block")}; a block left blank keeps its recorded room)
          </h3>
          <DataTable caption="Fruiting room per block" columns={roomColumns} rows={preview.rooms.blocks} emptyMessage="" pageSize={10} />
        </div>
      ) : null}
      {preview.notInFile && preview.notInFile.harvests.length > 0 ? (
        <fieldset className="mt-4 space-y-2 rounded-lg border border-caution-ink/40 p-3" data-testid="not-in-file">
          <legend className="px-1 font-semibold">{notInFileWords(preview.notInFile.phoneForm, preview.notInFile.otherFiles)}</legend>
          <p className="text-sm text-ink-soft">
            Stored for blocks this file lists:{" "}
            {preview.notInFile.harvests
              .slice(0, 30)
              .map((harvest) => `${harvest.blockCode} flush ${harvest.flush}`)
              .join(", ")}
            {preview.notInFile.phoneForm + preview.notInFile.otherFiles > 30 ? " …" : ""}.
          </p>
          <label className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" name="notInFile" checked={!removeNotInFile} onChange={() => onRemoveNotInFile(false)} />
            Keep them (they stay as they are)
          </label>
          <label className="flex min-h-11 items-center gap-2 text-sm">
            <input type="radio" name="notInFile" checked={removeNotInFile} onChange={() => onRemoveNotInFile(true)} />
            Remove them: this file is the whole record of these blocks (each removal is kept in the block&apos;s history, and undoing the
            commit puts them back)
          </label>
        </fieldset>
      ) : null}
      {preview.notInFile && preview.notInFile.blocks > 0 ? (
        <p className="mt-4 text-sm text-ink-soft">
          {count(preview.notInFile.blocks, "stored block")} {preview.notInFile.blocks === 1 ? "is" : "are"} not in this file; committing
          leaves {preview.notInFile.blocks === 1 ? "it" : "them"} as {preview.notInFile.blocks === 1 ? "it is" : "they are"}.
        </p>
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
