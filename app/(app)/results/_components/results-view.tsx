"use client";

import type { ColumnDef } from "@tanstack/react-table";
import { useRouter } from "next/navigation";
import { useTransition } from "react";
import { ForestChart } from "@/components/charts/forest-chart";
import { StrainBoxplot } from "@/components/charts/strain-boxplot";
import { Card } from "@/components/ui/card";
import { DataTable } from "@/components/ui/data-table";
import { Notice } from "@/components/ui/notice";
import { WordsExplained } from "@/components/ui/words-explained";
import {
  describeReleaseSchedule,
  dryingPercent,
  flushWindowLabels,
  flushWindows,
  resultsInBrief,
  seasonTableRow,
  strainTableRow,
  type PooledResults,
  type RegimeComparison,
  type SeasonBreakdown,
  type StrainTableRow,
} from "@/lib/pooled";
import type { PooledResultsPage } from "@/lib/data/pooled-results";
import type { ReleaseInfo } from "@/lib/data/pooled-releases";
import { resultsAddress, type ResultsSelection } from "@/lib/pooled/results-address";
import { seasonLabel, type SeasonStart } from "@/lib/seasons";
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
  { id: "drying", header: "Drying ratio, dry ÷ fresh (95 % interval)", accessorKey: "drying" },
];

type RegimeRow = Record<"regime" | "farms" | "rooms" | "contamination" | "roomRate" | "efficiency", string>;

const regimeColumns: ColumnDef<RegimeRow, unknown>[] = [
  { id: "regime", header: "Climate regime", accessorKey: "regime" },
  { id: "farms", header: "Farms", accessorKey: "farms" },
  { id: "rooms", header: "Rooms", accessorKey: "rooms" },
  { id: "roomRate", header: "Contamination, mean of the rooms' rates", accessorKey: "roomRate" },
  { id: "contamination", header: "Contamination over all its rooms (95 % interval)", accessorKey: "contamination" },
  { id: "efficiency", header: "BE of the rooms, farm-adjusted mean (95 % interval)", accessorKey: "efficiency" },
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

export function ResultsView(props: { page: PooledResultsPage; selection: ResultsSelection; showsOwnFarm: boolean; display: TimeDisplay }) {
  const { page, selection, showsOwnFarm, display } = props;
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const address = resultsAddress("/results", selection);
  const scheduleSaid = describeReleaseSchedule(page.releaseSchedule.schedule, page.releaseSchedule.at, display);
  // Each change is a new address: the server renders that view, and the back button steps back through the changes.
  const choose = (event: React.ChangeEvent<HTMLSelectElement>) => {
    const form = new FormData(event.currentTarget.form ?? undefined);
    const text = (name: string) => {
      const value = form.get(name);
      return typeof value === "string" && value !== "" ? value : undefined;
    };
    const season = text("season");
    const next: ResultsSelection = {
      species: text("species"),
      recipe: text("recipe"),
      method: text("method"),
      window: flushWindows.find((window) => window === text("window")) ?? "all",
      season: season === undefined ? undefined : Number(season),
    };
    startTransition(() => router.push(resultsAddress("/results", next), { scroll: false }));
  };
  const seasonChoices = [...(page.seasons?.seasons ?? [])];
  if (selection.season !== undefined && !seasonChoices.includes(selection.season)) seasonChoices.push(selection.season);
  seasonChoices.sort((a, b) => b - a);

  return (
    <div className="space-y-6">
      {/* Keyed by the address, so going back to an earlier address shows its choices again. */}
      <form
        key={address}
        className="grid grid-cols-1 gap-4 sm:grid-cols-2 lg:grid-cols-5"
        aria-label="Choose what to compare"
        onSubmit={(event) => event.preventDefault()}
      >
        <label className="text-sm font-medium">
          Species
          <select name="species" className={selectClass} defaultValue={selection.species ?? page.speciesId ?? ""} onChange={choose}>
            {page.options.species.map((option) => (
              <option key={option.id} value={option.id}>
                {option.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-medium">
          Substrate recipe
          <select name="recipe" className={selectClass} defaultValue={selection.recipe ?? ""} onChange={choose}>
            <option value="">Any recipe</option>
            {page.options.recipes.map((option) => (
              <option key={option.id} value={option.id}>
                {option.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-medium">
          Fruiting method
          <select name="method" className={selectClass} defaultValue={selection.method ?? ""} onChange={choose}>
            <option value="">Any fruiting method</option>
            {page.options.fruitingMethods.map((option) => (
              <option key={option.id} value={option.id}>
                {option.name}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-medium">
          Flushes counted
          <select name="window" className={selectClass} defaultValue={selection.window} onChange={choose}>
            {flushWindows.map((window) => (
              <option key={window} value={window}>
                {flushWindowLabels[window]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm font-medium">
          Season
          <select name="season" className={selectClass} defaultValue={selection.season ?? ""} onChange={choose}>
            <option value="">All seasons</option>
            {seasonChoices.map((season) => (
              <option key={season} value={season}>
                {seasonLabel(season, page.seasonStart)}
              </option>
            ))}
          </select>
        </label>
      </form>

      <OwnDataNotice notes={page.ownLeftOut} />
      {pending ? (
        <p role="status" className="rounded-lg border border-oat-300 bg-white p-4 text-ink-soft">
          Loading the co-op&apos;s results…
        </p>
      ) : null}

      <ReleaseLine release={page.release} schedule={scheduleSaid} minimumFarms={page.results?.minimumFarms} display={display} />

      <div aria-busy={pending} className={pending ? "space-y-6 opacity-60" : "space-y-6"}>
        {!page.release ? (
          <Notice title="No release yet">
            <p>The co-op publishes its pooled figures as dated releases. The first one comes {scheduleSaid}.</p>
          </Notice>
        ) : !page.results || page.results.strains.length === 0 ? (
          <Notice title="Not enough data">
            <p>
              No member farm has recorded blocks of this species under these filters yet. Try another species, or &ldquo;Any&rdquo; recipe
              and fruiting method.
            </p>
          </Notice>
        ) : (
          <ResultsBody page={page} results={page.results} showsOwnFarm={showsOwnFarm} />
        )}
      </div>
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

function ResultsBody({ page, results, showsOwnFarm }: { page: PooledResultsPage; results: PooledResults; showsOwnFarm: boolean }) {
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

      {page.season !== null && page.seasons ? (
        <SeasonsCard breakdown={page.seasons} start={page.seasonStart} only={page.season} release={page.release} />
      ) : null}

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

      {page.season === null && page.seasons ? (
        <SeasonsCard breakdown={page.seasons} start={page.seasonStart} only={null} release={page.release} />
      ) : null}

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

      <DryingCard results={results} />

      <RegimesCard regimes={page.regimes} release={page.release} />
    </>
  );
}

/**
 * Each strain's BE season by season (or in the chosen season), every recipe and fruiting method
 * together. A strain whose seasons are withheld says why once, in its first cell.
 */
function SeasonsCard(props: { breakdown: SeasonBreakdown; start: SeasonStart; only: number | null; release: ReleaseInfo | null }) {
  const { breakdown, start, only, release } = props;
  const seasons = only === null ? breakdown.seasons : [only];
  const title = only === null ? "BE season by season" : `BE in season ${seasonLabel(only, start)}`;
  const columns: ColumnDef<Record<string, string>, unknown>[] = [
    { id: "strain", header: "Strain", accessorKey: "strain" },
    ...seasons.map((season) => ({
      id: `season-${season}`,
      header: `Season ${seasonLabel(season, start)}: mean BE (95 % interval), farms`,
      accessorFn: (row: Record<string, string>) => row[`season-${season}`] ?? "no blocks with a BE",
    })),
  ];
  const rows = breakdown.strains
    .map((strain) => ({
      ...strain,
      // A season no strain has published (one chosen in the address) still reads "withheld" on a withheld strain's row.
      seasons: seasons.map(
        (seasonYear) =>
          strain.seasons.find((entry) => entry.seasonYear === seasonYear) ?? {
            seasonYear,
            efficiency: strain.withheld ? { status: "suppressed" as const, message: "withheld" } : null,
          },
      ),
    }))
    .filter((strain) => strain.withheld !== null || strain.seasons.some((entry) => entry.efficiency !== null))
    .map(seasonTableRow);
  return (
    <Card title={title}>
      {only !== null && !breakdown.seasons.includes(only) ? (
        <Notice title="No figure for this season">
          <p>
            No strain of this species has a published BE in season {seasonLabel(only, start)}: fewer than {breakdown.minimumFarms} farms had
            a BE in it, or a strain&apos;s seasons are withheld. Choose another season, or all seasons.
          </p>
        </Notice>
      ) : null}
      <DataTable
        caption={title}
        columns={columns}
        rows={rows}
        emptyMessage={`No strain has a BE published season by season yet: each needs at least ${breakdown.minimumFarms} farms in every season it was grown.`}
        csvFileName={`co-op-be-by-season-release-${release?.number}.csv`}
        csvConstants={releaseColumns(release)}
      />
      <p className="mt-2 text-xs text-ink-soft">
        Mean BE of the season&apos;s blocks under the flushes counted above, every substrate recipe and fruiting method together, not
        adjusted for farm. A block&apos;s season is the one its season log names, else the season of its inoculation date. A strain&apos;s
        seasons are shown only when every one of its seasons (and each recipe and fruiting method within a season) had at least{" "}
        {breakdown.minimumFarms} farms with a BE, so no season can be worked out from the others and the all-seasons figure.
        {only !== null ? " The other figures on this page cover every season together." : ""}
      </p>
      <WordsExplained terms={["biological-efficiency", "interval", "withheld"]} />
    </Card>
  );
}

function DryingCard({ results }: { results: PooledResults }) {
  const dried = results.strains.flatMap((strain) =>
    strain.drying.status === "published" ? [{ name: strain.strainName, ...strain.drying.value }] : [],
  );
  return (
    <Card title="Drying ratio">
      <p className="text-sm">
        For farms that dry their harvests and weigh them again: dried mushrooms as a share of their fresh weight, averaged over blocks. A
        ratio of 9 % means 1 kg picked fresh gives about 90 g dried, so a farm can plan how much to pick for a dried order.
      </p>
      {dried.length ? (
        <ul className="mt-3 list-disc space-y-1 pl-5 text-sm" data-testid="drying-ratios">
          {dried.map((strain) => (
            <li key={strain.name}>
              {strain.name}: dried mushrooms weigh {dryingPercent(strain.estimate)} % of their fresh weight (95 % interval{" "}
              {dryingPercent(strain.lower)} to {dryingPercent(strain.upper)}), from {strain.farms} farms and {strain.blocks} blocks.
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-3 text-ink-soft">
          Not enough data: fewer than {results.minimumFarms} farms dried harvests of any strain under these filters.
        </p>
      )}
      <p className="mt-2 text-xs text-ink-soft">
        Each block counts once (its dried harvests&apos; dry weight over their fresh weight); published only where at least{" "}
        {results.minimumFarms} farms dried harvests of the strain, and to a tenth of a percent.
      </p>
      <WordsExplained terms={["drying-ratio", "interval", "withheld"]} />
    </Card>
  );
}

function RegimesCard({ regimes, release }: { regimes: RegimeComparison | null; release: ReleaseInfo | null }) {
  return (
    <Card title="Climate regimes: contamination and BE, room by room">
      <Notice tone="caution" title="An observational comparison, not a trial">
        <p>
          These figures compare how farms chose to run their rooms. Rooms were not assigned to regimes at random, so other differences
          between the farms and rooms (cleaning, strains, substrate, the grower&apos;s hand) may explain some or all of a difference here.
          To find out whether a regime itself matters, run a room-level trial.
        </p>
      </Notice>
      {regimes === null || regimes.regimes.length === 0 ? (
        <p className="mt-3 text-ink-soft">
          Not enough data: no member farm has recorded its blocks&apos; rooms and the rooms&apos; climate regimes for this species yet.
        </p>
      ) : (
        <div className="mt-3 space-y-3">
          <DataTable
            caption="Climate regimes, with the room as the unit"
            columns={regimeColumns}
            rows={regimes.regimes.map((regime) => {
              let reasonGiven = false;
              const show = <T,>(
                figure: { status: "published"; value: T } | { status: "suppressed"; message: string },
                format: (value: T) => string,
              ) => {
                if (figure.status === "published") return format(figure.value);
                if (reasonGiven) return "withheld";
                reasonGiven = true;
                return figure.message;
              };
              return {
                regime: regime.regimeName,
                farms: show(regime.farms, String),
                rooms: show(regime.rooms, String),
                roomRate: show(regime.contamination, (v) => `${v.meanRoomRate} %`),
                contamination: show(regime.contamination, (v) => `${v.estimate} % (${v.lower} to ${v.upper})`),
                efficiency: show(
                  regime.efficiency,
                  (v) => `${one(v.estimate)} % (${one(v.lower)} to ${one(v.upper)})${v.adjustedForFarm ? "" : " not adjusted for farm"}`,
                ),
              };
            })}
            emptyMessage="No climate regimes recorded."
            csvFileName={`co-op-climate-regimes-release-${release?.number}.csv`}
            csvConstants={releaseColumns(release)}
          />
          {regimes.model.status === "published" ? (
            <div className="space-y-2 text-sm" data-testid="regime-model">
              <p>
                Room-mean BE ~ regime + farm: F = {regimes.model.value.f.toFixed(2)} on {regimes.model.value.dfRegime} and{" "}
                {regimes.model.value.dfResidual} degrees of freedom, p{" "}
                {regimes.model.value.p < 0.001 ? "< 0.001" : `= ${regimes.model.value.p.toFixed(3)}`}.
              </p>
              <ul className="list-disc space-y-1 pl-5">
                {regimes.model.value.differences.map((difference) => (
                  <li key={`${difference.regimeA}-${difference.regimeB}`}>
                    {difference.regimeB} − {difference.regimeA}: {one(difference.estimate)} BE points (95 % interval {one(difference.lower)}{" "}
                    to {one(difference.upper)}, Tukey; p {difference.pAdjusted < 0.001 ? "< 0.001" : difference.pAdjusted.toFixed(3)}).
                  </li>
                ))}
              </ul>
            </div>
          ) : (
            <p className="text-sm text-ink-soft">No comparison of BE between regimes: {regimes.model.message}.</p>
          )}
        </div>
      )}
      <p className="mt-2 text-xs text-ink-soft">
        Each block is placed in the room it fruited in (on its first harvest; a block that never fruited on the day it was found
        contaminated), and the room in the regime it ran that day. Each room&apos;s contamination rate and mean BE over all flushes come
        first; the regimes are then compared on room means with each farm as a block, so rooms count, not blocks. Contamination over all of
        a regime&apos;s rooms has a Wilson interval. No room and no farm is shown on its own: only counts of farms and rooms, means and
        intervals, each published where at least {regimes?.minimumFarms ?? 3} farms contributed. The recipe, fruiting-method and flush
        filters above do not apply here.
      </p>
      <WordsExplained terms={["climate-regime", "room-as-unit", "observational", "farm-adjusted-mean", "tukey", "withheld"]} />
    </Card>
  );
}
