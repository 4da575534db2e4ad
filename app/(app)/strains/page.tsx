import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Strains" };

export default async function StrainsPage() {
  await requirePage("registry:read");
  return (
    <>
      <PageHeader title="Strains" lead="The co-op's registry of species, strains, substrate recipes and fruiting methods." />
      <NotBuiltYet what="Browse and keep the co-op's registries." plannedIn="issue [6 of 6], registries" />
    </>
  );
}
