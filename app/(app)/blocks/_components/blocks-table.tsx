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
      // On a phone the state sits under the code, so the first columns fit 390 px without scrolling sideways.
      cell: ({ row }) => (
        <>
          <Link href={`/blocks/${row.original.id}`} className="inline-flex min-h-11 items-center font-semibold text-moss-700 underline">
            {row.original.code}
          </Link>
          <span
            className={`block text-xs md:hidden ${row.original.state === "contaminated" ? "font-semibold text-danger-ink" : "text-ink-soft"}`}
          >
            {row.original.state}
          </span>
        </>
      ),
    },
    // The code as farms write it, the name beside it for whoever has not learnt the codes.
    {
      accessorFn: (block) => `${block.strainCode} ${block.strainName}`,
      id: "strain",
      header: "Strain",
      cell: ({ row }) => (
        <span>
          {row.original.strainCode} <span className="block text-xs text-ink-soft md:inline md:text-sm">{row.original.strainName}</span>
        </span>
      ),
    },
    {
      accessorFn: (block) => block.biologicalEfficiency,
      id: "be",
      header: "BE %",
      // Null after a harvest when the wet mass or the moisture is missing: BE needs the dry substrate mass.
      cell: ({ row, getValue }) =>
        row.original.flushes === 0 ? (
          noHarvestYet
        ) : (
          <span className="whitespace-nowrap">{percent(getValue() as number | null) || "no dry mass"}</span>
        ),
    },
    {
      accessorFn: (block) => block.state,
      id: "state",
      header: "State",
      cell: ({ row }) => (
        <span className={row.original.state === "contaminated" ? "font-semibold text-danger-ink" : ""}>{row.original.state}</span>
      ),
    },
    {
      // Sorted and downloaded as the flush and its YYYY-MM-DD day; shown in the member's date style.
      accessorFn: (block) => (block.lastFlush ? `${block.lastFlush.flush} ${block.lastFlush.harvestedOn ?? ""}`.trim() : ""),
      id: "lastFlush",
      header: "Last flush",
      cell: ({ row }) => {
        const last = row.original.lastFlush;
        if (!last) return "none yet";
        return (
          <>
            <span className="block whitespace-nowrap">flush {last.flush}</span>
            <span className="block whitespace-nowrap text-ink-soft">
              {last.harvestedOn ? formatDate(last.harvestedOn, dateStyle) : "no date"}
            </span>
          </>
        );
      },
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
      accessorFn: (block) => block.massLoss,
      id: "massLoss",
      header: "Mass loss",
      cell: ({ getValue }) => percent(getValue() as number | null),
    },
    { accessorFn: (block) => block.trial ?? "", id: "trial", header: "Trial" },
  ];
}

/** What a grower looks for first (the state under the code), shown at every width; the other columns are one tap away on a phone. */
const firstColumns = ["code", "strain", "be", "lastFlush"] as const;

/** The farm's blocks, sortable; masses in the member's display units. The page searches them on the server. */
export function BlocksTable({
  rows,
  display,
  dateStyle,
  seasonStart,
  emptyMessage,
}: {
  rows: BlockRow[];
  display: MassDisplay;
  dateStyle: DateStyle;
  seasonStart: SeasonStart;
  emptyMessage: string;
}) {
  const columns = useMemo(() => columnsFor(display, dateStyle, seasonStart), [display, dateStyle, seasonStart]);
  return (
    <DataTable
      caption="Blocks and harvests"
      columns={columns}
      rows={rows}
      emptyMessage={emptyMessage}
      csvFileName="blocks-and-harvests.csv"
      firstColumns={firstColumns}
      filterable={false}
    />
  );
}
