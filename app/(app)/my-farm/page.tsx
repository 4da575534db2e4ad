import type { Metadata } from "next";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { SeasonFilter } from "@/components/ui/season-filter";
import { listFarmSeasons } from "@/lib/data/seasons";
import { Notice } from "@/components/ui/notice";
import { seasonInAddressSchema } from "@/lib/seasons";
import { MyFarmView } from "./_components/my-farm-view";

export const metadata: Metadata = { title: "My farm" };

export default async function MyFarmPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const member = await requirePage("farm-data:read");
  const reading = seasonInAddressSchema.safeParse((await searchParams).season);
  const season = reading.success ? (reading.data ?? null) : null;
  const { start, seasons } = await listFarmSeasons(member);
  return (
    <>
      <PageHeader
        title="My farm"
        lead={`${member.farmName ?? "Your farm"}'s season: blocks, harvests and biological efficiency by strain, and where you sit in the co-op.`}
      />
      <div className="mb-6">
        <Caution which="pooledFigures" />
      </div>
      <SeasonFilter path="/my-farm" seasons={seasons} start={start} current={season} everything="Last 12 months" />
      {reading.success ? (
        <MyFarmView season={season} />
      ) : (
        <Notice tone="danger" title="This address does not name a season">
          {reading.error.issues.map((issue) => (
            <p key={issue.message}>{issue.message} Choose a season above.</p>
          ))}
        </Notice>
      )}
    </>
  );
}
