import { NextResponse } from "next/server";
import { guardedRoute } from "@/lib/auth/guard";
import { createUpload, getImportSetup, listUploads, parseStored } from "@/lib/data/season-logs";
import { collectReadingGarbage, withUploadSlot } from "@/lib/data/upload-limits";
import type { Member } from "@/lib/data/members";
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
  return NextResponse.json({ uploads: await listUploads(member) });
});

/**
 * Receives a season log as the raw request body, reads it as it streams in, keeps the file
 * whatever its state, and answers with the report and a preview of what a commit would change.
 */
export const POST = guardedRoute("season-log:upload", async (request, { member }) => {
  const declared = Number(request.headers.get("content-length") ?? "0");
  if (declared > largestUploadBytes) throw new AppError("too_large", tooLarge);
  if (!request.body) throw new AppError("invalid_input", "The upload was empty. Choose a CSV file and send it again.");
  const body = request.body;
  // At most a few files per farm at once, room to keep this one, and memory in this process to read it.
  return withUploadSlot(member, declared, () => receive(member, body, declared, fileNameOf(request)));
});

async function receive(member: Member, body: ReadableStream<Uint8Array>, declared: number, fileName: string): Promise<Response> {
  const setup = await getImportSetup(member);
  const parser = createSeasonLogParser(parserOptions(setup.remembered, setup.knownStrains));
  // The bytes go straight into one buffer of the size announced (a file held once, not as chunks and again as their join).
  let content = Buffer.allocUnsafe(declared > 0 ? declared : 1024 * 1024);
  let size = 0;
  // Decided on the first four bytes: a CSV is read as it streams in, a spreadsheet once it is whole.
  let spreadsheet: boolean | null = null;
  const reader = body.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    const limit = spreadsheet ? largestSpreadsheetBytes : largestUploadBytes;
    if (size + value.byteLength > limit) {
      await reader.cancel();
      throw new AppError("too_large", spreadsheet ? spreadsheetTooLarge : tooLarge);
    }
    if (size + value.byteLength > content.byteLength) {
      const grown = Buffer.allocUnsafe(Math.min(largestUploadBytes, Math.max(2 * content.byteLength, size + value.byteLength)));
      content.copy(grown, 0, 0, size);
      content = grown;
    }
    content.set(value, size);
    size += value.byteLength;
    if (spreadsheet === null && size >= 4) {
      spreadsheet = startsLikeZip(content);
      if (!spreadsheet) parser.write(content.subarray(0, size));
    } else if (spreadsheet === false) parser.write(value);
  }
  if (size === 0)
    throw new AppError("invalid_input", "The file is empty. Export the season log from your spreadsheet as CSV and upload that file.");
  if (spreadsheet === null) parser.write(content.subarray(0, size));
  const bytes = content.subarray(0, size);
  const result = spreadsheet ? await parseStored(bytes, setup, setup.remembered) : parser.end();
  collectReadingGarbage(size);
  const view = await createUpload(member, { fileName, content: bytes, result, choices: setup.remembered });
  return NextResponse.json(view, { status: 201 });
}
