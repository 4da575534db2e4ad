import type { DecimalMark } from "../units";
import { createTokeniser, tokenise } from "./csv";

export type Delimiter = "," | ";" | "\t";

const delimiters: readonly Delimiter[] = [",", ";", "\t"];
const rowsToSniff = 50;

function isBlankRow(cells: readonly string[]): boolean {
  return cells.every((cell) => cell.trim() === "");
}

function filledLength(cells: readonly string[]): number {
  let length = cells.length;
  while (length > 0 && cells[length - 1].trim() === "") length--;
  return length;
}

/** Parses the start of a file (whole rows only) with one delimiter, for sniffing. */
export function sampleRows(sample: string, delimiter: Delimiter, final: boolean): string[][] {
  const rows: string[][] = [];
  tokenise(createTokeniser(delimiter), sample, final, (cells) => {
    if (!isBlankRow(cells) && rows.length < rowsToSniff) rows.push(cells);
  });
  return rows;
}

/**
 * Picks the delimiter that splits the header into the most columns while keeping the
 * rows below it at no more filled columns than the header has.
 */
export function sniffDelimiter(sample: string, final: boolean): Delimiter {
  let best: Delimiter = ",";
  let bestScore = 0;
  for (const delimiter of delimiters) {
    const rows = sampleRows(sample, delimiter, final);
    if (rows.length === 0) continue;
    const width = filledLength(rows[0]);
    if (width < 2) continue;
    let fitting = 0;
    for (const row of rows) if (row.length >= 2 && filledLength(row) <= width) fitting++;
    const score = (fitting / rows.length) * 1_000_000 + width;
    if (score > bestScore) {
      best = delimiter;
      bestScore = score;
    }
  }
  return best;
}

const trailingUnit = /\s*[a-z%]+\.?$/i;
const commaDecimal = /^-?\d+,(?:\d{1,2}|\d{4,})$|^\d{1,3}(?:[. \u00a0]\d{3})+,\d+$/;
const pointDecimal = /^-?\d+\.(?:\d{1,2}|\d{4,})$|^\d{1,3}(?:[, \u00a0]\d{3})+\.\d+$/;

/**
 * Decides the decimal mark from the sample's numbers that can only be read one way
 * ("2,5", "0.62", "1.234,5"); with no such number, a semicolon file (how spreadsheets in
 * comma-decimal locales export) is taken to use the comma.
 */
export function sniffDecimal(rows: readonly string[][], delimiter: Delimiter): DecimalMark {
  let commas = 0;
  let points = 0;
  for (let index = 1; index < rows.length; index++) {
    for (const cell of rows[index]) {
      const number = cell.trim().replace(trailingUnit, "");
      if (commaDecimal.test(number)) commas++;
      else if (pointDecimal.test(number)) points++;
    }
  }
  if (commas !== points) return commas > points ? "," : ".";
  return delimiter === "," ? "." : delimiter === ";" ? "," : ".";
}

// C0 controls other than tab, line feed, vertical tab, form feed and carriage return. The
// replacement character U+FFFD is not one: it is text (a program's stand-in for a character
// it could not write, or a Windows-1252 byte the table leaves undefined).
const controlCharacters = /[\u0000-\u0008\u000e-\u001f]/g;
// Old DOS and Windows programs end a text file with Ctrl-Z (0x1A).
const endOfFileMark = /\u001a+$/;
// A short file with a stray control character or two is still a text file.
const fewestControlsInBinary = 4;

/**
 * The sample holds binary data, not text: a NUL (text in UTF-8 or Windows-1252 never has
 * one; UTF-16 was decoded before this), or control characters making up more than one in a
 * hundred characters and at least `fewestControlsInBinary` of them.
 */
export function looksBinary(sample: string): boolean {
  if (sample.includes("\u0000")) return true;
  const control = sample.replace(endOfFileMark, "").match(controlCharacters)?.length ?? 0;
  return control >= fewestControlsInBinary && control > sample.length / 100;
}
