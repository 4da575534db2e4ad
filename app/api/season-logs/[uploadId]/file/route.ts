import { farmContextOf, guardedRoute } from "@/lib/auth/guard";
import { getUploadFile } from "@/lib/data/season-logs";
import { attachment } from "@/lib/season-logs/request";

/** The original file exactly as the farm sent it. */
export const GET = guardedRoute<{ uploadId: string }>("season-log:upload", async (_request, { member, params }) => {
  const file = await getUploadFile(farmContextOf(member), params.uploadId);
  return new Response(new Uint8Array(file.content), {
    headers: { "content-type": "text/csv", "content-disposition": attachment(file.fileName) },
  });
});
