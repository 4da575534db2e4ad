import type { Delimiter } from "./sniff";

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

/** Where the tokeniser is between chunks. */
export interface TokeniserState {
  delimiter: Delimiter;
  /** Text of a row not yet complete at the end of the last chunk. */
  pending: string;
  line: number;
  /** Line of a quote that was never closed, found at the end of the input. */
  unclosedQuoteLine: number | null;
}

export function createTokeniser(delimiter: Delimiter): TokeniserState {
  return { delimiter, pending: "", line: 1, unclosedQuoteLine: null };
}

/**
 * Stage 2: splits CSV text into rows as it arrives, chunk by chunk (RFC 4180 quoting, with
 * line feeds, CR LF or lone CR between rows). Each row comes with the physical 1-based line
 * on which it starts, so a quoted note that spans lines does not shift the line numbers a
 * grower sees in the report.
 */
export function tokenise(state: TokeniserState, text: string, final: boolean, onRow: (cells: string[], line: number) => void): void {
  const source = state.pending.length === 0 ? text : state.pending + text;
  const length = source.length;
  const delimiter = state.delimiter.charCodeAt(0);
  let position = 0;
  let line = state.line;
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
          state.unclosedQuoteLine ??= rowLine;
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
  state.pending = position < length ? source.slice(position) : "";
  state.line = line;
}
