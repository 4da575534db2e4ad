import type { Metadata } from "next";
import { NotBuiltYet } from "@/components/ui/not-built-yet";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "Season logs" };

export default async function SeasonLogsPage() {
  await requirePage("season-log:upload");
  return (
    <>
      <PageHeader title="Season logs" lead="Upload your season's spreadsheet as CSV under the co-op's shared columns." />
      <NotBuiltYet what="Upload, review and commit season logs." plannedIn="issue [2 of 6], season logs" />
    </>
  );
}
