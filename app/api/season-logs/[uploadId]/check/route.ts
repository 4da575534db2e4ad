import { NextResponse } from "next/server";
import { farmContextOf, guardedRoute } from "@/lib/auth/guard";
import { recheckUpload } from "@/lib/data/season-logs";
import { readChoices } from "@/lib/season-logs/request";

/** Reads a stored upload again with the grower's mapping, date order and default unit. */
export const POST = guardedRoute<{ uploadId: string }>("season-log:upload", async (request, { member, params }) => {
  return NextResponse.json(await recheckUpload(farmContextOf(member), params.uploadId, await readChoices(request)));
});
