import { renderTrialReportPdf } from "@/components/pdf/trial-report-pdf";
import { guardedRoute } from "@/lib/auth/guard";
import { getPublishedReport } from "@/lib/data/trials";
import { timeDisplayFor } from "@/lib/time/member-display";
import { trialReportDocument } from "@/lib/trials/report-document";

/** The published trial report as a PDF, as the member reads it on the report page. */
export const GET = guardedRoute<{ trialId: string }>("trial:read", async (_request, { member, params }) => {
  const [trial, display] = await Promise.all([getPublishedReport(member, params.trialId), timeDisplayFor(member)]);
  const pdf = await renderTrialReportPdf(trialReportDocument(trial, display));
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `attachment; filename="${trial.code}-report.pdf"`,
      "cache-control": "no-store",
    },
  });
});
