import type { DecimalMark } from "../units";

export type Delimiter = "," | ";" | "\t";

const quote = 34;
const lineFeed = 10;
const carriageReturn = 13;

function countLineBreaks(text: string, from: number, to: number): number {
  let breaks = 0;
  for (let index = from; index < to; index++) {
    const code = text.charCodeAt(index);
    if (code === lineFeed) breaks++;
    else if (code === carriageReturn && text.charCodeAt(index + 1) !== lineFeed) breaks++;
  }
  return breaks;
}

/**
 * Splits CSV text into rows as it arrives, chunk by chunk (RFC 4180 quoting, with
 * line feeds, CR LF or lone CR between rows). Each row comes with the physical
 * 1-based line on which it starts, so a quoted note that spans lines does not shift the
 * line numbers a grower sees in the report.
 */
export class CsvTokenizer {
  private pending = "";
  private line = 1;
  /** Line of a quote that was never closed, found at the end of the input. */
  unclosedQuoteLine: number | null = null;

  constructor(private readonly delimiter: Delimiter) {}

  push(text: string, final: boolean, onRow: (cells: string[], line: number) => void): void {
    const source = this.pending.length === 0 ? text : this.pending + text;
    const length = source.length;
    const delimiter = this.delimiter.charCodeAt(0);
    let position = 0;
    let line = this.line;
    rows: while (position < length) {
      const rowStart = position;
      const rowLine = line;
      const cells: string[] = [];
      for (;;) {
        let value: string;
        if (source.charCodeAt(position) === quote) {
          value = "";
          let segmentStart = position + 1;
          let scan = segmentStart;
          let closed = false;
          for (;;) {
            const next = source.indexOf('"', scan);
            if (next === -1) break;
            if (next + 1 >= length && !final) break;
            if (source.charCodeAt(next + 1) === quote) {
              value += source.slice(segmentStart, next + 1);
              scan = segmentStart = next + 2;
              continue;
            }
            value += source.slice(segmentStart, next);
            scan = next + 1;
            closed = true;
            break;
          }
          if (!closed) {
            if (!final) {
              position = rowStart;
              line = rowLine;
              break rows;
            }
            this.unclosedQuoteLine ??= rowLine;
            value += source.slice(segmentStart);
            scan = length;
          }
          line += countLineBreaks(source, position, scan);
          position = scan;
          let end = position;
          while (end < length) {
            const code = source.charCodeAt(end);
            if (code === delimiter || code === lineFeed || code === carriageReturn) break;
            end++;
          }
          if (end > position) value += source.slice(position, end);
          position = end;
        } else {
          let end = position;
          while (end < length) {
            const code = source.charCodeAt(end);
            if (code === delimiter || code === lineFeed || code === carriageReturn) break;
            end++;
          }
          value = source.slice(position, end);
          position = end;
        }
        cells.push(value);
        if (position >= length) {
          if (final) break;
          position = rowStart;
          line = rowLine;
          break rows;
        }
        const code = source.charCodeAt(position);
        if (code === delimiter) {
          position++;
          continue;
        }
        if (code === carriageReturn && position + 1 >= length && !final) {
          position = rowStart;
          line = rowLine;
          break rows;
        }
        position += code === carriageReturn && source.charCodeAt(position + 1) === lineFeed ? 2 : 1;
        line++;
        break;
      }
      onRow(cells, rowLine);
    }
    this.pending = position < length ? source.slice(position) : "";
    this.line = line;
  }
}

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
  const tokenizer = new CsvTokenizer(delimiter);
  tokenizer.push(sample, final, (cells) => {
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
