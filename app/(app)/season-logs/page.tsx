import type { Metadata } from "next";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Caution } from "@/components/ui/caution";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { listUploads } from "@/lib/data/season-logs";
import { timeDisplayFor } from "@/lib/time/member-display";
import { SeasonLogUpload } from "./_components/season-log-upload";
import { UploadHistory } from "./_components/upload-history";

export const metadata: Metadata = { title: "Season logs" };

export default async function SeasonLogsPage() {
  const member = await requirePage("season-log:upload");
  const [uploads, display] = await Promise.all([listUploads(member), timeDisplayFor(member)]);
  return (
    <>
      <PageHeader
        title="Season logs"
        lead="Upload your season's spreadsheet as .xlsx, .ods or CSV. We read it, show every problem by line, and change nothing until you commit."
      >
        <ButtonLink href="/season-logs/columns" variant="secondary">
          The shared columns
        </ButtonLink>
        {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a file download from a route handler, not a page */}
        <a
          href="/api/season-logs/template"
          className="inline-flex min-h-11 items-center rounded-lg border border-moss-600 bg-white px-4 text-sm font-semibold text-moss-700"
        >
          Download the template (CSV)
        </a>
        {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a file download from a route handler, not a page */}
        <a
          href="/api/season-logs/template?format=xlsx"
          className="inline-flex min-h-11 items-center rounded-lg border border-moss-600 bg-white px-4 text-sm font-semibold text-moss-700"
        >
          Download the template (.xlsx)
        </a>
      </PageHeader>
      <div className="space-y-8">
        <SeasonLogUpload display={display} />
        <Caution which="spores" />
        <Card title="Past uploads">
          <UploadHistory uploads={uploads} display={display} />
        </Card>
      </div>
    </>
  );
}
