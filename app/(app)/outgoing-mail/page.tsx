import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Outgoing mail" };

export default async function OutgoingMailPage() {
  await requirePage("mail:read-outgoing");
  return (
    <>
      <PageHeader title="Outgoing mail" lead="What Rhizomorph would have e-mailed, caught by the local mail catcher." />
      <NotBuiltYet what="Read caught messages." plannedIn="issue [5 of 6], e-mail" />
    </>
  );
}
