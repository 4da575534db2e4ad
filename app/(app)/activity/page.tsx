import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Activity log" };

export default async function ActivityPage() {
  await requirePage("audit:read-coop");
  return (
    <>
      <PageHeader title="Activity log" lead="Who did what and when, across the co-op." />
      <NotBuiltYet what="Filter and export the co-op's activity log." plannedIn="issue [6 of 6], audit" />
    </>
  );
}
