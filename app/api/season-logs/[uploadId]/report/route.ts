import { guardedRoute } from "@/lib/auth/guard";
import { getUploadView } from "@/lib/data/season-logs";
import { reportCsv } from "@/lib/season-logs/report";
import { attachment } from "@/lib/season-logs/request";

/** The upload's problems as a CSV the grower can open beside the season log. */
export const GET = guardedRoute<{ uploadId: string }>("season-log:upload", async (_request, { member, params }) => {
  const view = await getUploadView(member, params.uploadId);
  const name = `${view.upload.fileName.replace(/\.[^.]*$/, "")}-report.csv`;
  return new Response(`\ufeff${reportCsv(view.report.issues)}`, {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": attachment(name) },
  });
});
