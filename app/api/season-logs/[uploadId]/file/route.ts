import { guardedRoute } from "@/lib/auth/guard";
import { getUploadFile } from "@/lib/data/season-logs";
import { workbookKind } from "@/lib/import";
import { attachment } from "@/lib/season-logs/request";

/** The original file exactly as the farm sent it. */
export const GET = guardedRoute<{ uploadId: string }>("season-log:upload", async (_request, { member, params }) => {
  const file = await getUploadFile(member, params.uploadId);
  const content = new Uint8Array(file.content);
  const kind = workbookKind(content);
  const type =
    kind === "xlsx"
      ? "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
      : kind === "ods"
        ? "application/vnd.oasis.opendocument.spreadsheet"
        : "text/csv";
  return new Response(content, { headers: { "content-type": type, "content-disposition": attachment(file.fileName) } });
});
