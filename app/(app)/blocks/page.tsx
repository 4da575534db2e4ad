import type { Metadata } from "next";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { SeasonFilter } from "@/components/ui/season-filter";
import { listBlocks } from "@/lib/data/blocks";
import { listFarmSeasons } from "@/lib/data/seasons";
import { seasonFromSearchParam } from "@/lib/seasons";
import { BlocksTable } from "./_components/blocks-table";

export const metadata: Metadata = { title: "Blocks & harvests" };

export default async function BlocksPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const member = await requirePage("farm-data:read");
  const season = seasonFromSearchParam((await searchParams).season);
  const [rows, { start, seasons }] = await Promise.all([listBlocks(member, { season }), listFarmSeasons(member)]);
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
      <SeasonFilter path="/blocks" seasons={seasons} start={start} current={season} everything="All seasons" />
      <BlocksTable rows={rows} display={member.displayUnits} dateStyle={member.dateStyle} seasonStart={start} />
    </>
  );
}
