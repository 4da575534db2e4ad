import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Co-op results" };

export default async function ResultsPage() {
  await requirePage("pooled-results:read");
  return (
    <>
      <PageHeader title="Co-op results" lead="Pooled strain comparisons from every member farm, with honest intervals. No farm's own rows are ever shown here." />
      <NotBuiltYet what="Pooled, farm-blocked strain comparisons." plannedIn="issue [4 of 6], co-op results" />
    </>
  );
}
