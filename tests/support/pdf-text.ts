import { execFileSync } from "node:child_process";

/**
 * The text of each page of a PDF as poppler's pdftotext reads it (Debian's poppler-utils, which
 * scripts/test.sh installs when missing), runs of white space joined into one space.
 */
export function pdfPageTexts(data: Uint8Array): string[] {
  // pdftotext ends each page with a form feed.
  const text = execFileSync("pdftotext", ["-enc", "UTF-8", "-", "-"], { input: data, encoding: "utf8" });
  return text
    .split("\f")
    .map((page) => page.replace(/\s+/g, " ").trim())
    .filter((page, index, pages) => page !== "" || index < pages.length - 1);
}
