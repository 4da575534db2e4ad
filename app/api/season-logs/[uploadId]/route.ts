import { NextResponse } from "next/server";
import { guardedRoute } from "@/lib/auth/guard";
import { getUploadView } from "@/lib/data/season-logs";

/** One upload's report and preview, as last checked. */
export const GET = guardedRoute<{ uploadId: string }>("season-log:upload", async (_request, { member, params }) => {
  return NextResponse.json(await getUploadView(member, params.uploadId));
});
