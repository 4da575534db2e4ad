import { AppError } from "../errors";
import { type ParseChoices, parseChoicesSchema } from "./report";

/** Reads the grower's choices (mapping, date order, default unit, decimal mark) from a JSON body. */
export async function readChoices(request: Request): Promise<ParseChoices> {
  let body: unknown = {};
  const text = await request.text();
  if (text.trim() !== "") {
    try {
      body = JSON.parse(text);
    } catch {
      throw new AppError("invalid_input", "The choices sent with the request were not readable. Reload the page and try again.");
    }
  }
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
