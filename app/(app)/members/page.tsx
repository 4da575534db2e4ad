import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Members" };

export default async function MembersPage() {
  await requirePage("members:manage");
  return (
    <>
      <PageHeader title="Members" lead="Member farms and the people who use Rhizomorph." />
      <NotBuiltYet what="Admit farms, invite managers, change roles." plannedIn="issue [6 of 6], members" />
    </>
  );
}
