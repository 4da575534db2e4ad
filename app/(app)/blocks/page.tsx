import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Blocks & harvests" };

export default async function BlocksPage() {
  await requirePage("farm-data:read");
  return (
    <>
      <PageHeader title="Blocks & harvests" lead="Every block your farm has reported, with its flushes and biological efficiency." />
      <NotBuiltYet what="A sortable table of your farm's blocks and harvests." plannedIn="issue [2 of 6], season logs" />
    </>
  );
}
