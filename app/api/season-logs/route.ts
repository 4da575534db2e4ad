import { NextResponse } from "next/server";
import { farmContextOf, guardedRoute } from "@/lib/auth/guard";
import { createUpload, getImportSetup, listUploads } from "@/lib/data/season-logs";
import { AppError } from "@/lib/errors";
import { createSeasonLogParser } from "@/lib/import";
import { largestUploadBytes, parserOptions } from "@/lib/season-logs/report";

const tooLarge = `The file is larger than ${largestUploadBytes / 1024 / 1024} MB. Split the season log into parts (for example one file per strain or per month) and upload each.`;

function fileNameOf(request: Request): string {
  const raw = request.headers.get("x-file-name");
  let name = "season-log.csv";
  if (raw) {
    try {
      name = decodeURIComponent(raw);
    } catch {
      name = raw;
    }
  }
  return name.replace(/[\\/\u0000-\u001f]/g, "_").slice(0, 200) || "season-log.csv";
}

/** The farm's past uploads, newest first. */
export const GET = guardedRoute("season-log:upload", async (_request, { member }) => {
  return NextResponse.json({ uploads: await listUploads(farmContextOf(member)) });
});

/**
 * Receives a season log as the raw request body, reads it as it streams in, keeps the file
 * whatever its state, and answers with the report and a preview of what a commit would change.
 */
export const POST = guardedRoute("season-log:upload", async (request, { member }) => {
  const context = farmContextOf(member);
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > largestUploadBytes) throw new AppError("too_large", tooLarge);
  if (!request.body) throw new AppError("invalid_input", "The upload was empty. Choose a CSV file and send it again.");

  const setup = await getImportSetup(context);
  const parser = createSeasonLogParser(parserOptions(setup.remembered, setup.knownStrains));
  const chunks: Uint8Array[] = [];
  let size = 0;
  const reader = request.body.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > largestUploadBytes) {
      await reader.cancel();
      throw new AppError("too_large", tooLarge);
    }
    chunks.push(value);
    parser.write(value);
  }
  if (size === 0)
    throw new AppError("invalid_input", "The file is empty. Export the season log from your spreadsheet as CSV and upload that file.");
  const content = Buffer.concat(chunks, size);
  const view = await createUpload(context, { fileName: fileNameOf(request), content, result: parser.end(), choices: setup.remembered });
  return NextResponse.json(view, { status: 201 });
});
