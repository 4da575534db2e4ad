import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Activity log" };

export default async function FarmActivityPage() {
  await requirePage("audit:read-farm");
  return (
    <>
      <PageHeader title="Activity log" lead="Who did what and when, on your farm's data." />
      <NotBuiltYet what="Filter and export your farm's activity log." plannedIn="issue [6 of 6], audit" />
    </>
  );
}
