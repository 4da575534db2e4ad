"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { FlushCurve } from "@/components/charts/flush-curve";
import { Card } from "@/components/ui/card";
import { DataTable } from "@/components/ui/data-table";
import { Notice } from "@/components/ui/notice";
import type { OwnStrainSummary } from "@/lib/pooled";
import { useMyFarm } from "@/lib/queries/my-farm";
import { formatMass } from "@/lib/units";
import { formatDate } from "@/lib/time/display";
import { OwnDataNotice } from "@/components/ui/own-data-notice";

type Row = Record<
  "strain" | "blocks" | "harvests" | "fresh" | "efficiency" | "percentile" | "contamination" | "massLoss" | "toCome",
  string
>;

const columns: ColumnDef<Row, unknown>[] = [
  { id: "strain", header: "Strain", accessorKey: "strain" },
  { id: "blocks", header: "Blocks (active)", accessorKey: "blocks" },
  { id: "harvests", header: "Harvests", accessorKey: "harvests" },
  { id: "fresh", header: "Fresh mushrooms picked", accessorKey: "fresh" },
  { id: "efficiency", header: "Biological efficiency, mean", accessorKey: "efficiency" },
  { id: "percentile", header: "Place in the co-op", accessorKey: "percentile" },
  { id: "contamination", header: "Contamination", accessorKey: "contamination" },
  { id: "massLoss", header: "Mass loss of spent blocks", accessorKey: "massLoss" },
  { id: "toCome", header: "Still to come from active blocks", accessorKey: "toCome" },
];

/** The farm's place as published: whole percent, and only "lowest" or "highest tenth" at the ends (see summariseOwnFarm). */
function placeInCoop(percentile: number): string {
  if (percentile <= 10) return "in the lowest tenth of co-op blocks";
  if (percentile >= 90) return "in the highest tenth of co-op blocks";
  return `above ${percentile} % of co-op blocks`;
}

function toRow(strain: OwnStrainSummary, units: "metric" | "imperial"): Row {
  return {
    strain: `${strain.strainName} (${strain.speciesName})`,
    blocks: `${strain.blocks} (${strain.activeBlocks})`,
    harvests: String(strain.harvests),
    fresh: strain.harvests === 0 ? "no harvest yet" : formatMass(strain.freshG, units),
    efficiency:
      strain.harvests === 0
        ? "no harvest yet"
        : strain.meanEfficiency === null
          ? strain.withoutDryMass > 0
            ? "none: no dry substrate mass (see above)"
            : "none yet"
          : `${strain.meanEfficiency.toFixed(1)} %`,
    percentile: strain.percentile.status === "published" ? placeInCoop(strain.percentile.value) : strain.percentile.message,
    contamination: `${strain.contaminated} of ${strain.blocks} (${strain.contaminationPercent.toFixed(0)} %)`,
    massLoss: strain.meanMassLoss === null ? "no spent blocks weighed" : `${strain.meanMassLoss.toFixed(1)} %`,
    toCome: strain.expectedRemaining
      ? `${formatMass(strain.expectedRemaining.expectedG, units)} (${formatMass(strain.expectedRemaining.lowerG, units)} to ${formatMass(strain.expectedRemaining.upperG, units)})`
      : strain.coopCumulative
        ? "nothing to forecast: no active block has fruited yet"
        : "no co-op flush profile yet",
  };
}

export function MyFarmView({ season }: { season: number | null }) {
  const query = useMyFarm(season);
  if (query.isPending)
    return (
      <p role="status" className="rounded-lg border border-oat-300 bg-white p-4 text-ink-soft">
        Loading your farm&apos;s season…
      </p>
    );
  if (query.isError) {
    return (
      <Notice tone="danger" title="Your farm's figures could not be loaded">
        <p>{query.error.message}</p>
        <button type="button" className="min-h-11 font-semibold underline" onClick={() => void query.refetch()}>
          Try again
        </button>
      </Notice>
    );
  }
  const page = query.data;
  if (page.strains.length === 0) {
    return (
      <Notice title={season === null ? "No blocks this season yet" : "No blocks in this season"}>
        <p>Upload a season log to see your blocks, harvests and biological efficiency here, beside the co-op.</p>
      </Notice>
    );
  }
  const withCurves = page.strains.filter((strain) => strain.ownCumulative || strain.coopCumulative);
  return (
    <div className="space-y-6">
      <OwnDataNotice notes={page.ownLeftOut} />
      <Card
        title={page.seasonLabel ? `${page.farmName} in season ${page.seasonLabel}, by strain` : `${page.farmName} this season, by strain`}
      >
        <DataTable
          caption="Your season by strain"
          columns={columns}
          rows={page.strains.map((strain) => toRow(strain, page.displayUnits))}
          emptyMessage="No blocks this season yet."
          csvFileName="my-farm-by-strain.csv"
        />
        <p className="mt-2 text-xs text-ink-soft">
          {page.seasonLabel
            ? `Blocks of season ${page.seasonLabel}: inoculated in it, or named in it by their season log. The co-op's figures cover every season.`
            : `Blocks inoculated since ${formatDate(page.seasonStartedOn, page.dateStyle)}.`}{" "}
          Place in the co-op compares your mean with every co-op block of the strain, shown only where at least {page.minimumFarms} farms
          grew it. Still to come: the co-op&apos;s average flush profile applied to your active blocks, with 95 % prediction bounds.
        </p>
      </Card>
      <Card title="Flush curves: share of a block's yield picked by each flush">
        {withCurves.length === 0 ? (
          <p className="text-ink-soft">Not enough finished blocks yet to draw a flush curve.</p>
        ) : (
          <div className="grid grid-cols-1 gap-6 md:grid-cols-2">
            {withCurves.map((strain) => (
              <section key={strain.strainId} aria-label={`Flush curve for ${strain.strainName}`}>
                <h3 className="mb-2 font-semibold text-moss-800">{strain.strainName}</h3>
                <FlushCurve
                  title={`Cumulative share of yield by flush for ${strain.strainName}`}
                  series={[
                    ...(strain.ownCumulative
                      ? [{ name: "Your finished blocks", cumulative: strain.ownCumulative, colour: "#7a4f2a" }]
                      : []),
                    ...(strain.coopCumulative ? [{ name: "Co-op average", cumulative: strain.coopCumulative, colour: "#2e5e4e" }] : []),
                  ]}
                />
              </section>
            ))}
          </div>
        )}
      </Card>
    </div>
  );
}
