import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Trials" };

export default async function TrialsPage() {
  await requirePage("trial:read");
  return (
    <>
      <PageHeader title="Trials" lead="Strain trials run across member farms, with blocks randomised to arms on every farm." />
      <NotBuiltYet what="Design, enrol in and follow co-op trials." plannedIn="issue [5 of 6], strain trials" />
    </>
  );
}
