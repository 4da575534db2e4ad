"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { useState } from "react";
import { ForestChart } from "@/components/charts/forest-chart";
import { StrainBoxplot } from "@/components/charts/strain-boxplot";
import { Card } from "@/components/ui/card";
import { DataTable } from "@/components/ui/data-table";
import { Notice } from "@/components/ui/notice";
import { WordsExplained } from "@/components/ui/words-explained";
import { flushWindowLabels, flushWindows, resultsInBrief, strainTableRow, type FlushWindow, type StrainTableRow } from "@/lib/pooled";
import type { ReleaseInfo } from "@/lib/data/pooled-releases";
import { usePooledResults, type PooledResultsSelection } from "@/lib/queries/pooled-results";
import { OwnDataNotice } from "@/components/ui/own-data-notice";
import { formatDateTime, type TimeDisplay } from "@/lib/time/display";

type StrainRow = StrainTableRow;
type PairRow = Record<"comparison" | "difference" | "interval" | "p", string>;

const one = (value: number) => value.toFixed(1);

const strainColumns: ColumnDef<StrainRow, unknown>[] = [
  { id: "strain", header: "Strain", accessorKey: "strain" },
  { id: "farms", header: "Farms", accessorKey: "farms" },
  { id: "blocks", header: "Blocks", accessorKey: "blocks" },
  { id: "efficiency", header: "Biological efficiency, mean (95 % interval)", accessorKey: "efficiency" },
  { id: "contamination", header: "Contamination (95 % interval)", accessorKey: "contamination" },
  { id: "firstHarvest", header: "Inoculation to first harvest", accessorKey: "firstHarvest" },
  { id: "flushProfile", header: "Share of yield by flush", accessorKey: "flushProfile" },
];

const pairColumns: ColumnDef<PairRow, unknown>[] = [
  { id: "comparison", header: "Comparison", accessorKey: "comparison" },
  { id: "difference", header: "Difference in farm-adjusted mean BE (points)", accessorKey: "difference" },
  { id: "interval", header: "95 % interval (Tukey)", accessorKey: "interval" },
  { id: "p", header: "p, adjusted for all pairs (Tukey)", accessorKey: "p" },
];

/** The CSV says which release its figures come from, on every row. */
const releaseColumns = (release: ReleaseInfo | null) =>
  release
    ? [
        { header: "Release", value: String(release.number) },
        { header: "Release published (UTC)", value: release.cutAt.slice(0, 16).replace("T", " ") },
      ]
    : [];

const selectClass = "block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 text-base";

export function ResultsView({ showsOwnFarm, display }: { showsOwnFarm: boolean; display: TimeDisplay }) {
  const [selection, setSelection] = useState<PooledResultsSelection>({ window: "all" });
  const query = usePooledResults(selection);
  const page = query.data;
  const choose = (key: keyof PooledResultsSelection) => (event: React.ChangeEvent<HTMLSelectElement>) =>
    setSelection((current) => ({ ...current, [key]: event.target.value || undefined }));

  return (
    <div className="space-y-6">
      <form
        className="grid grid-cols-1 gap-4 sm:grid-cols-2 lg:grid-cols-4"
        aria-label="Choose what to compare"
        onSubmit={(event) => event.preventDefault()}
      >
        <label className="text-sm font-medium">
          Species
          <select name="species" className={selectClass} value={selection.species ?? page?.speciesId ?? ""} onChange={choose("species")}>
            {(page?.options.species ?? []).map((option) => (
              <option key={option.id} value={option.id}>
                {option.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-medium">
          Substrate recipe
          <select name="recipe" className={selectClass} value={selection.recipe ?? ""} onChange={choose("recipe")}>
            <option value="">Any recipe</option>
            {(page?.options.recipes ?? []).map((option) => (
              <option key={option.id} value={option.id}>
                {option.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-medium">
          Fruiting method
          <select name="method" className={selectClass} value={selection.method ?? ""} onChange={choose("method")}>
            <option value="">Any fruiting method</option>
            {(page?.options.fruitingMethods ?? []).map((option) => (
              <option key={option.id} value={option.id}>
                {option.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-medium">
          Flushes counted
          <select
            name="window"
            className={selectClass}
            value={selection.window}
            onChange={(event) => setSelection((current) => ({ ...current, window: event.target.value as FlushWindow }))}
          >
            {flushWindows.map((window) => (
              <option key={window} value={window}>
                {flushWindowLabels[window]}
              </option>
            ))}
          </select>
        </label>
      </form>

      {page ? <OwnDataNotice notes={page.ownLeftOut} /> : null}
      {page ? (
        <ReleaseLine release={page.release} schedule={page.releaseSchedule} minimumFarms={page.results?.minimumFarms} display={display} />
      ) : null}

      {query.isPending ? (
        <p role="status" className="rounded-lg border border-oat-300 bg-white p-4 text-ink-soft">
          Loading the co-op&apos;s results…
        </p>
      ) : query.isError ? (
        <Notice tone="danger" title="The results could not be loaded">
          <p>{query.error.message}</p>
          <button type="button" className="min-h-11 font-semibold underline" onClick={() => void query.refetch()}>
            Try again
          </button>
        </Notice>
      ) : !page?.release ? (
        <Notice title="No release yet">
          <p>The co-op publishes its pooled figures as dated releases. The first one comes {page?.releaseSchedule}.</p>
        </Notice>
      ) : !page.results || page.results.strains.length === 0 ? (
        <Notice title="Not enough data">
          <p>
            No member farm has recorded blocks of this species under these filters yet. Try another species, or &ldquo;Any&rdquo; recipe and
            fruiting method.
          </p>
        </Notice>
      ) : (
        <ResultsBody page={page} showsOwnFarm={showsOwnFarm} />
      )}
    </div>
  );
}

/** Which release the page shows, and when the figures may next change. */
function ReleaseLine(props: { release: ReleaseInfo | null; schedule: string; minimumFarms?: number; display: TimeDisplay }) {
  const { release, schedule, minimumFarms, display } = props;
  if (!release) return null;
  return (
    <p className="text-sm text-ink-soft" data-testid="release-line">
      <span className="font-semibold text-ink">
        Release {release.number}, published {formatDateTime(release.cutAt, display)}.
      </span>{" "}
      These figures change only with a new release ({schedule}), and only by the data of at least {minimumFarms ?? 3} farms at a time, so no
      one can work out one farm&apos;s numbers by comparing two releases.
    </p>
  );
}

function ResultsBody({ page, showsOwnFarm }: { page: NonNullable<ReturnType<typeof usePooledResults>["data"]>; showsOwnFarm: boolean }) {
  const results = page.results!;
  const names = new Map(results.strains.map((strain) => [strain.strainId, strain.strainName]));
  const published = results.strains.filter((strain) => strain.efficiency.status === "published");
  const spreads = results.strains.flatMap((strain) =>
    strain.spread.status === "published" ? [{ strain: strain.strainName, percentiles: strain.spread.value }] : [],
  );
  const ownBlocks = page.ownBlocks.flatMap((own) =>
    names.has(own.strainId) ? [{ strain: names.get(own.strainId)!, blocks: own.blocks, efficiencies: own.efficiencies }] : [],
  );

  return (
    <>
      <section aria-labelledby="in-brief" className="rounded-xl border-2 border-moss-600 bg-white p-5" data-testid="in-brief">
        <h2 id="in-brief" className="text-lg font-semibold text-moss-800">
          In brief
        </h2>
        <div className="mt-2 space-y-2 text-base">
          {resultsInBrief(results).map((sentence) => (
            <p key={sentence}>{sentence}</p>
          ))}
        </div>
        <p className="mt-3 text-sm text-ink-soft">The tables and charts below are the evidence for it.</p>
      </section>

      <Card title="Strains side by side">
        {published.length === 0 ? (
          <Notice title="Not enough data">
            <p>No strain has been grown on at least {results.minimumFarms} farms under these filters, so no figure can be published.</p>
          </Notice>
        ) : null}
        <DataTable
          caption="Strains side by side"
          columns={strainColumns}
          rows={results.strains.map(strainTableRow)}
          emptyMessage="No strains recorded."
          csvFileName={`co-op-strains-release-${page.release?.number}.csv`}
          csvConstants={releaseColumns(page.release)}
        />
        <ul className="mt-3 list-disc space-y-1 pl-5 text-sm">
          {results.strains.map((strain) => (
            <li key={strain.strainId}>{strain.sentence}</li>
          ))}
        </ul>
        <p className="mt-2 text-xs text-ink-soft">
          Figures are published only where at least {results.minimumFarms} farms contributed; means are adjusted for farm (each farm counts
          as a block) when two or more strains can be compared.
        </p>
        <WordsExplained terms={["biological-efficiency", "interval", "farm-adjusted-mean", "withheld"]} />
      </Card>

      <Card title="Spread of block biological efficiency">
        {spreads.length ? (
          <StrainBoxplot spreads={spreads} ownBlocks={showsOwnFarm ? ownBlocks : []} />
        ) : (
          <p className="text-ink-soft">Not enough data: fewer than {results.minimumFarms} farms for every strain.</p>
        )}
      </Card>

      <Card title="Differences between strains">
        {results.pairwise.status === "published" ? (
          <>
            <DataTable
              caption="Differences between strains"
              columns={pairColumns}
              rows={results.pairwise.value.map((pair) => ({
                comparison: `${pair.strainB} − ${pair.strainA}`,
                difference: one(pair.estimate),
                interval: `${one(pair.lower)} to ${one(pair.upper)}`,
                p: pair.pAdjusted < 0.001 ? "< 0.001" : pair.pAdjusted.toFixed(3),
              }))}
              emptyMessage="No pairs to compare."
              csvFileName={`co-op-strain-differences-release-${page.release?.number}.csv`}
              csvConstants={releaseColumns(page.release)}
            />
            <ul className="mt-3 list-disc space-y-1 pl-5 text-sm">
              {results.pairwise.value.map((pair) => (
                <li key={`${pair.strainA}-${pair.strainB}`}>{pair.sentence}</li>
              ))}
            </ul>
            <p className="mt-2 text-xs text-ink-soft">
              Each difference is between two strains&apos; farm-adjusted mean BE in the table above, from the model BE ~ strain + farm (each
              farm counts as a block, so strains are compared on the farms that grew them). Intervals and p-values allow for comparing every
              pair of strains (Tukey). The farm-by-farm comparison below shows how much farms disagree.
            </p>
            <WordsExplained terms={["be-points", "farm-adjusted-mean", "tukey", "p-value"]} />
          </>
        ) : (
          <p className="text-ink-soft">Not enough data: {results.pairwise.message}.</p>
        )}
      </Card>

      <Card title="Do farms agree?">
        {results.heterogeneity.status === "published" ? (
          <div className="space-y-6">
            <p className="text-sm">
              Each farm&apos;s difference against {results.heterogeneity.value.referenceStrainName} (the strain grown on most farms), pooled
              allowing the gain to differ by farm. I² is the share of the spread that comes from real differences between farms; τ is the
              typical farm-to-farm spread of the gain in BE points.
            </p>
            <p className="text-sm text-ink-soft">
              The differences here are not the same figures as in &ldquo;Differences between strains&rdquo;: there one difference is fitted
              for all farms together; here each farm&apos;s own difference is pooled and allowed to vary from farm to farm, so the estimate
              moves a little and the interval is wider. When farms disagree, the wider interval here is the more cautious answer.
            </p>
            {results.heterogeneity.value.strains.map((strain) => (
              <section
                key={strain.strainId}
                className="space-y-2"
                aria-label={`${strain.strainName} against ${results.heterogeneity.status === "published" ? results.heterogeneity.value.referenceStrainName : ""}`}
              >
                <h3 className="font-semibold text-moss-800">
                  {strain.strainName}: I² {Math.round(strain.i2)} %, τ {one(strain.tau)} BE points, Holm-adjusted p{" "}
                  {strain.pHolm < 0.001 ? "< 0.001" : strain.pHolm.toFixed(3)}
                </h3>
                <ForestChart title={`${strain.strainName} against the reference strain, farm by farm`} rows={strain.forest} />
                <p className="text-sm">{strain.sentence}</p>
              </section>
            ))}
          </div>
        ) : (
          <p className="text-ink-soft">Not enough data: {results.heterogeneity.message}.</p>
        )}
        <WordsExplained terms={["reference-strain", "i-squared", "tau", "holm"]} />
      </Card>
    </>
  );
}
