import { z } from "zod";
import { AppError } from "../errors";
import { type ParseChoices, parseChoicesSchema } from "./report";

async function readBody(request: Request): Promise<unknown> {
  const text = await request.text();
  if (text.trim() === "") return {};
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError("invalid_input", "The choices sent with the request were not readable. Reload the page and try again.");
  }
}

/** Reads the grower's choices (mapping, date order, default unit, decimal mark) from a JSON body. */
export async function readChoices(request: Request): Promise<ParseChoices> {
  return choicesOf(await readBody(request));
}

/** A commit's body: the choices, and whether to remove the stored harvests the file does not have (kept unless asked). */
export async function readCommitRequest(request: Request): Promise<{ choices: ParseChoices; removeNotInFile: boolean }> {
  const body = await readBody(request);
  const remove = z.object({ removeNotInFile: z.boolean().optional() }).safeParse(body);
  return { choices: choicesOf(body), removeNotInFile: remove.success && remove.data.removeNotInFile === true };
}

function choicesOf(body: unknown): ParseChoices {
  const parsed = parseChoicesSchema.safeParse(body);
  if (!parsed.success) {
    throw new AppError(
      "invalid_input",
      "Some choices were not understood. Pick the column mapping, date order and unit again.",
      parsed.error.issues.map((issue) => ({ field: issue.path.join(".") || "choices", message: issue.message })),
    );
  }
  return parsed.data;
}

/** A Content-Disposition header that keeps any file name safe (RFC 6266 with a UTF-8 fallback). */
export function attachment(fileName: string): string {
  const plain = fileName.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return `attachment; filename="${plain}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}
