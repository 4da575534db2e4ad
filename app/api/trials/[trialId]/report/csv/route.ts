import { guardedRoute } from "@/lib/auth/guard";
import { toCsv } from "@/lib/csv";
import { getPublishedReport } from "@/lib/data/trials";
import { trialReportColumns, trialReportRows } from "@/lib/trials/report-document";

/** The published trial report's tables as one CSV sheet, one row per figure. */
export const GET = guardedRoute<{ trialId: string }>("trial:read", async (_request, { member, params }) => {
  const trial = await getPublishedReport(member, params.trialId);
  return new Response(toCsv(trialReportRows(trial), trialReportColumns), {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${trial.code}-report.csv"`,
      "cache-control": "no-store",
    },
  });
});
