import { createRequire } from "node:module";
import path from "node:path";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";

// pdfjs reads the metrics of the PDF's built-in fonts from files it ships; nothing is fetched.
const standardFontDataUrl = `${path.dirname(createRequire(import.meta.url).resolve("pdfjs-dist/package.json"))}/standard_fonts/`;

/** The text of each page of a PDF as Mozilla's pdf.js reads it, lines joined by spaces. */
export async function pdfPageTexts(data: Uint8Array): Promise<string[]> {
  const document = await getDocument({ data, standardFontDataUrl, isEvalSupported: false, useSystemFonts: false }).promise;
  try {
    const pages: string[] = [];
    for (let number = 1; number <= document.numPages; number++) {
      const content = await (await document.getPage(number)).getTextContent();
      const text = content.items.map((item) => ("str" in item ? `${item.str}${item.hasEOL ? " " : ""}` : "")).join("");
      pages.push(text.replace(/\s+/g, " ").trim());
    }
    return pages;
  } finally {
    await document.destroy();
  }
}
