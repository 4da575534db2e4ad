import type { Metadata } from "next";
import Link from "next/link";
import { Caution } from "@/components/ui/caution";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { getPooledResults, toResultsQuery } from "@/lib/data/pooled-results";
import { isAppError } from "@/lib/errors";
import { readResultsAddress } from "@/lib/pooled/results-address";
import { timeDisplayFor } from "@/lib/time/member-display";
import { ResultsView } from "./_components/results-view";

export const metadata: Metadata = { title: "Co-op results" };

/** Every filter is in the address (?species=&recipe=&method=&window=&season=), so a view can be bookmarked and shared. */
export default async function ResultsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const member = await requirePage("pooled-results:read");
  const reading = readResultsAddress(await searchParams);
  return (
    <>
      <PageHeader
        title="Co-op results"
        lead="Pooled strain comparisons from every member farm, every season together and season by season, with honest intervals. No farm's own rows are ever shown here."
      />
      <div className="mb-6 grid gap-3 lg:grid-cols-2">
        <Caution which="pooledFigures" />
        <Caution which="foodAndHealth" />
      </div>
      {reading.ok ? (
        <Results member={member} selection={reading.selection} />
      ) : (
        <AddressProblem problems={reading.problems.map((problem) => problem.message)} />
      )}
    </>
  );
}

async function Results({
  member,
  selection,
}: {
  member: Awaited<ReturnType<typeof requirePage>>;
  selection: Extract<ReturnType<typeof readResultsAddress>, { ok: true }>["selection"];
}) {
  const page = await getPooledResults(member, toResultsQuery(selection)).catch((error: unknown) => {
    // A species, recipe or method the co-op does not keep (an old bookmark): say so, rather than an error page.
    if (isAppError(error) && error.code === "not_found") return error;
    throw error;
  });
  if (isAppError(page)) return <AddressProblem problems={[page.message]} />;
  return (
    <ResultsView
      page={page}
      selection={selection}
      showsOwnFarm={can(member.role, "farm-data:read")}
      display={await timeDisplayFor(member)}
    />
  );
}

function AddressProblem({ problems }: { problems: string[] }) {
  return (
    <Notice tone="danger" title="This address does not name a view of the results">
      <ul className="list-disc pl-5">
        {problems.map((problem) => (
          <li key={problem}>{problem}</li>
        ))}
      </ul>
      <p>
        <Link href="/results" className="inline-flex min-h-11 items-center font-semibold underline">
          Open the results without filters
        </Link>
      </p>
    </Notice>
  );
}
