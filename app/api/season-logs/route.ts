import { NextResponse } from "next/server";
import { farmContextOf, guardedRoute } from "@/lib/auth/guard";
import { createUpload, getImportSetup, listUploads, parseStored } from "@/lib/data/season-logs";
import { AppError } from "@/lib/errors";
import { createSeasonLogParser } from "@/lib/import";
import { largestSpreadsheetBytes, largestUploadBytes, parserOptions } from "@/lib/season-logs/report";

const tooLarge = `The file is larger than ${largestUploadBytes / 1024 / 1024} MB. Split the season log into parts (for example one file per strain or per month) and upload each.`;
const spreadsheetTooLarge = `The spreadsheet is larger than ${largestSpreadsheetBytes / 1024 / 1024} MB. Save the season log's sheet as CSV (up to ${largestUploadBytes / 1024 / 1024} MB), or split it into several workbooks (for example one per strain or per month), and upload each.`;

/** A zip archive's first bytes: an .xlsx or .ods file, read whole once it has arrived. */
function startsLikeZip(bytes: Uint8Array): boolean {
  return bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04;
}

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
  // Decided on the first four bytes: a CSV is read as it streams in, a spreadsheet once it is whole.
  let spreadsheet: boolean | null = null;
  const reader = request.body.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    chunks.push(value);
    if (spreadsheet === null && size >= 4) {
      spreadsheet = startsLikeZip(Buffer.concat(chunks, size));
      if (!spreadsheet) for (const chunk of chunks) parser.write(chunk);
    } else if (spreadsheet === false) parser.write(value);
    if (size > (spreadsheet ? largestSpreadsheetBytes : largestUploadBytes)) {
      await reader.cancel();
      throw new AppError("too_large", spreadsheet ? spreadsheetTooLarge : tooLarge);
    }
  }
  if (size === 0)
    throw new AppError("invalid_input", "The file is empty. Export the season log from your spreadsheet as CSV and upload that file.");
  if (spreadsheet === null) for (const chunk of chunks) parser.write(chunk);
  const content = Buffer.concat(chunks, size);
  const result = spreadsheet ? await parseStored(content, setup, setup.remembered) : parser.end();
  const view = await createUpload(context, { fileName: fileNameOf(request), content, result, choices: setup.remembered });
  return NextResponse.json(view, { status: 201 });
});
