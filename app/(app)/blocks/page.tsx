import type { Metadata } from "next";
import { ButtonLink } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { SeasonFilter } from "@/components/ui/season-filter";
import { listBlocks } from "@/lib/data/blocks";
import { listFarmSeasons } from "@/lib/data/seasons";
import { blockSearchFromSearchParam, longestBlockSearch } from "@/lib/season-logs/block-search";
import { seasonInAddressSchema, seasonLabel } from "@/lib/seasons";
import { count } from "@/lib/words";
import { BlocksTable } from "./_components/blocks-table";

export const metadata: Metadata = { title: "Blocks & harvests" };

export default async function BlocksPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const member = await requirePage("farm-data:read");
  const query = await searchParams;
  // A season that is not one is said, not silently read as every season (the table would look complete).
  const reading = seasonInAddressSchema.safeParse(query.season);
  const season = reading.success ? (reading.data ?? null) : null;
  const search = blockSearchFromSearchParam(query.q);
  const [rows, { start, seasons }] = await Promise.all([listBlocks(member, { season, search }), listFarmSeasons(member)]);
  const inSeason = season === null ? "" : ` in ${seasonLabel(season, start)}`;
  return (
    <>
      <PageHeader
        title="Blocks & harvests"
        lead="Every block your farm has reported, with its flushes, biological efficiency (BE) and mass loss. Only your farm's people see these rows."
      >
        {can(member.role, "harvest:record") ? <ButtonLink href="/blocks/harvest">Record a harvest</ButtonLink> : null}
        {can(member.role, "season-log:upload") ? (
          <ButtonLink href="/season-logs" variant="secondary">
            Upload a season log
          </ButtonLink>
        ) : null}
        {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a file download from a route handler, not a page */}
        <a
          href="/api/season-logs/export"
          className="inline-flex min-h-11 items-center rounded-lg border border-moss-600 bg-white px-4 text-sm font-semibold text-moss-700"
          title="Your blocks and harvests in the season-log format: correct or add rows and upload the file again."
        >
          Download as a season log (CSV)
        </a>
      </PageHeader>
      <SeasonFilter
        path="/blocks"
        seasons={seasons}
        start={start}
        current={season}
        everything="All seasons"
        params={{ q: search ?? undefined }}
      />
      {/* A plain GET form: the search lives in the address beside the season, so a view can be bookmarked.
          The example is one of the farm's own codes, so it reads like what the grower writes. */}
      <form method="get" action="/blocks" role="search" aria-label="Search blocks" className="mb-4 flex flex-wrap items-end gap-2 text-sm">
        {season !== null ? <input type="hidden" name="season" value={season} /> : null}
        <label className="grow sm:grow-0">
          <span className="block font-medium">Block code or note</span>
          <input
            type="search"
            name="q"
            defaultValue={search ?? ""}
            maxLength={longestBlockSearch}
            placeholder={`e.g. ${rows[0]?.code ?? "B-001"} or shelf 2`}
            className="min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 text-base sm:w-72"
          />
        </label>
        <button type="submit" className="min-h-11 rounded-lg bg-moss-600 px-4 font-semibold text-white">
          Search
        </button>
        {search !== null ? (
          <ButtonLink href={season === null ? "/blocks" : `/blocks?season=${season}`} variant="secondary">
            Clear the search
          </ButtonLink>
        ) : null}
      </form>
      {search !== null ? (
        <p role="status" className="mb-3 text-sm text-ink-soft">
          {count(rows.length, "block")}
          {inSeason} with “{search}” in the code or the note.
        </p>
      ) : null}
      {reading.success ? null : (
        <Notice tone="danger" title="This address does not name a season">
          {reading.error.issues.map((issue) => (
            <p key={issue.message}>{issue.message} Choose a season above; the table shows every season until then.</p>
          ))}
        </Notice>
      )}
      <BlocksTable
        rows={rows}
        display={member.displayUnits}
        dateStyle={member.dateStyle}
        seasonStart={start}
        emptyMessage={
          search !== null
            ? `No block${inSeason} has “${search}” in its code or note. Try part of the code, or another word from the note.`
            : "No blocks here yet. Upload your season log, or ask the farm manager to; or choose another season."
        }
      />
    </>
  );
}
