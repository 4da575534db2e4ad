"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { DataTable } from "@/components/ui/data-table";
import type { BlockRow } from "@/lib/data/blocks";
import { seasonLabel, type SeasonStart } from "@/lib/seasons";
import { formatMass, type MassDisplay } from "@/lib/units";
import { formatDate, type DateStyle } from "@/lib/time/display";

const noHarvestYet = "no harvest yet";

function percent(value: number | null): string {
  return value === null ? "" : `${value.toFixed(1)} %`;
}

function columnsFor(display: MassDisplay, dateStyle: DateStyle, seasonStart: SeasonStart): ColumnDef<BlockRow, unknown>[] {
  return [
    {
      accessorKey: "code",
      header: "Block",
      cell: ({ row }) => (
        <Link href={`/blocks/${row.original.id}`} className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline">
          {row.original.code}
        </Link>
      ),
    },
    // The code as farms write it, the name beside it for whoever has not learnt the codes.
    {
      accessorFn: (block) => `${block.strainCode} ${block.strainName}`,
      id: "strain",
      header: "Strain",
      cell: ({ row }) => (
        <span>
          {row.original.strainCode} <span className="text-ink-soft">{row.original.strainName}</span>
        </span>
      ),
    },
    { accessorFn: (block) => block.recipeCode ?? "", id: "recipe", header: "Recipe" },
    {
      // Sorted and downloaded as YYYY-MM-DD; shown in the member's date style.
      accessorFn: (block) => block.inoculatedOn ?? "",
      id: "inoculated",
      header: "Inoculated",
      cell: ({ getValue }) => (getValue() ? formatDate(String(getValue()), dateStyle) : ""),
    },
    { accessorFn: (block) => (block.season === null ? "" : seasonLabel(block.season, seasonStart)), id: "season", header: "Season" },
    {
      accessorFn: (block) => block.wetMassG,
      id: "wet",
      header: "Wet block",
      cell: ({ getValue }) => (getValue() === null ? "" : formatMass(getValue() as number, display)),
    },
    {
      accessorFn: (block) => (block.moisture === null ? null : block.moisture * 100),
      id: "moisture",
      header: "Moisture",
      cell: ({ getValue }) => percent(getValue() as number | null),
    },
    { accessorKey: "flushes", header: "Flushes" },
    {
      accessorKey: "totalFreshG",
      header: "Total fresh",
      cell: ({ row, getValue }) => (row.original.flushes === 0 ? noHarvestYet : formatMass(getValue() as number, display)),
    },
    {
      accessorFn: (block) => block.biologicalEfficiency,
      id: "be",
      header: "BE %",
      cell: ({ row, getValue }) => (row.original.flushes === 0 ? noHarvestYet : percent(getValue() as number | null)),
    },
    { accessorFn: (block) => (block.contaminated ? "yes" : "no"), id: "contaminated", header: "Contaminated" },
    {
      accessorFn: (block) => block.massLoss,
      id: "massLoss",
      header: "Mass loss",
      cell: ({ getValue }) => percent(getValue() as number | null),
    },
    { accessorFn: (block) => block.trial ?? "", id: "trial", header: "Trial" },
  ];
}

/** The farm's blocks, sortable and filterable; masses in the member's display units. */
export function BlocksTable({
  rows,
  display,
  dateStyle,
  seasonStart,
}: {
  rows: BlockRow[];
  display: MassDisplay;
  dateStyle: DateStyle;
  seasonStart: SeasonStart;
}) {
  const columns = useMemo(() => columnsFor(display, dateStyle, seasonStart), [display, dateStyle, seasonStart]);
  return (
    <DataTable
      caption="Blocks and harvests"
      columns={columns}
      rows={rows}
      emptyMessage="No blocks here yet. Upload your season log, or ask the farm manager to; or choose another season."
      csvFileName="blocks-and-harvests.csv"
    />
  );
}
