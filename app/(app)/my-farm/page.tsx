import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "My farm" };

export default async function MyFarmPage() {
  await requirePage("farm-data:read");
  return (
    <>
      <PageHeader title="My farm" lead="Your farm's season at a glance: biological efficiency by strain, flush curve, contamination, mass loss, and where you sit in the co-op." />
      <NotBuiltYet what="See blocks, flushes and efficiency for your own farm, compared with the co-op." plannedIn="issue [4 of 6], co-op results" />
    </>
  );
}
