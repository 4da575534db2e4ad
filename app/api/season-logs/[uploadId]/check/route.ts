import { NextResponse } from "next/server";
import { guardedRoute } from "@/lib/auth/guard";
import { recheckUpload } from "@/lib/data/season-logs";
import { withUploadSlot } from "@/lib/data/upload-limits";
import { readChoices } from "@/lib/season-logs/request";

/** Reads a stored upload again with the grower's mapping, date order and default unit. */
export const POST = guardedRoute<{ uploadId: string }>("season-log:upload", async (request, { member, params }) => {
  const choices = await readChoices(request);
  // Reading a stored file again costs what receiving it did: it takes one of the farm's upload slots.
  return withUploadSlot(member, 0, async () => NextResponse.json(await recheckUpload(member, params.uploadId, choices)));
});
