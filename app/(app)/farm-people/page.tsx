import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Farm people" };

export default async function FarmPeoplePage() {
  await requirePage("farm-staff:manage");
  return (
    <>
      <PageHeader title="Farm people" lead="The people of your farm who record harvests." />
      <NotBuiltYet what="Invite and remove growers, hand over the manager role." plannedIn="issue [6 of 6], members" />
    </>
  );
}
