import type { Metadata } from "next";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/permissions";
import { timeDisplayFor } from "@/lib/time/member-display";
import { ResultsView } from "./_components/results-view";

export const metadata: Metadata = { title: "Co-op results" };

export default async function ResultsPage() {
  const member = await requirePage("pooled-results:read");
  return (
    <>
      <PageHeader
        title="Co-op results"
        lead="Pooled strain comparisons from every member farm and every season together, with honest intervals. No farm's own rows are ever shown here."
      />
      <div className="mb-6 grid gap-3 lg:grid-cols-2">
        <Caution which="pooledFigures" />
        <Caution which="foodAndHealth" />
      </div>
      <ResultsView showsOwnFarm={can(member.role, "farm-data:read")} display={await timeDisplayFor(member)} />
    </>
  );
}
