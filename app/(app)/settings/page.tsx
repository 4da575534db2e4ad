import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  await requirePage("account:manage");
  return (
    <>
      <PageHeader title="Settings" lead="Your account and display preferences." />
      <NotBuiltYet what="Change password, units and notifications." plannedIn="issue [6 of 6], members" />
    </>
  );
}
