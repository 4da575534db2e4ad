import { NextResponse } from "next/server";
import { guardedRoute } from "@/lib/auth/guard";
import { commitUpload } from "@/lib/data/season-logs";
import { readCommitRequest } from "@/lib/season-logs/request";

/** Commits a checked upload: all of it in one transaction, or nothing. */
export const POST = guardedRoute<{ uploadId: string }>("season-log:upload", async (request, { member, params }) => {
  const { choices, removeNotInFile } = await readCommitRequest(request);
  return NextResponse.json(await commitUpload(member, params.uploadId, choices, { removeNotInFile }));
});
